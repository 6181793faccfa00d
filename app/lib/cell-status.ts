/** The status of one lab × material pair, in the order the overview counts them. */
export const CELL_STATUS_ORDER = ["not_started", "draft", "submitted", "amended", "queried"] as const;
export type CellStatus = (typeof CELL_STATUS_ORDER)[number];

/** The status of one stored cell (or of none yet), before any query is considered. */
export function cellStatusOf(cell: { status: "draft" | "submitted"; amended: boolean } | undefined): CellStatus {
  if (!cell) return "not_started";
  if (cell.status === "draft") return "draft";
  return cell.amended ? "amended" : "submitted";
}
