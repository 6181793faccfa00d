/** The status of one lab × material pair, in the order the overview counts them. */
export const CELL_STATUS_ORDER = ["not_started", "draft", "submitted", "amended", "queried"] as const;
export type CellStatus = (typeof CELL_STATUS_ORDER)[number];
