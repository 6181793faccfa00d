import { Badge } from "./ui";

export type CellStatusName = "not_started" | "draft" | "submitted" | "amended";

const STATUS_VIEW: Record<CellStatusName, { label: string; tone: "neutral" | "ochre" | "leaf" | "signal" }> = {
  not_started: { label: "Not started", tone: "neutral" },
  draft: { label: "Draft", tone: "ochre" },
  submitted: { label: "Submitted", tone: "leaf" },
  amended: { label: "Amended", tone: "signal" },
};

/** A cell's (or a material's) status as the lab and the coordinator see it. */
export function CellStatusBadge({ status }: { status: CellStatusName }) {
  return <Badge tone={STATUS_VIEW[status].tone}>{STATUS_VIEW[status].label}</Badge>;
}
