import type { CellStatus } from "~/lib/cell-status";
import { CELL_STATUS } from "~/lib/state-labels";
import { StateBadge } from "./state-badge";

/** A cell's (or a material's) status as the lab and the coordinator see it. */
export function CellStatusBadge({ status }: { status: CellStatus }) {
  return <StateBadge view={CELL_STATUS[status]} />;
}
