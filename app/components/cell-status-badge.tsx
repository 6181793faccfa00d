import type { CellStatus } from "~/lib/cell-status";
import { Badge } from "./ui";

/** How each cell status reads, and its badge's tone: the label always says it, the tone only helps. */
export const CELL_STATUS_VIEW: Record<CellStatus, { label: string; tone: "neutral" | "ochre" | "leaf" | "signal" }> = {
  not_started: { label: "Not started", tone: "neutral" },
  draft: { label: "Draft", tone: "ochre" },
  submitted: { label: "Submitted", tone: "leaf" },
  amended: { label: "Amended", tone: "leaf" },
  queried: { label: "Queried", tone: "signal" },
};

/** A cell's (or a material's) status as the lab and the coordinator see it. */
export function CellStatusBadge({ status }: { status: CellStatus }) {
  return <Badge tone={CELL_STATUS_VIEW[status].tone}>{CELL_STATUS_VIEW[status].label}</Badge>;
}
