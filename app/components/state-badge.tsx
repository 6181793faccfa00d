import type { StateView } from "~/lib/state-labels";
import { Badge } from "./ui";

/** A state's badge, from its entry in `~/lib/state-labels` (e.g. `<StateBadge view={QUERY_STATE[q.state]} />`). */
export function StateBadge({ view }: { view: StateView }) {
  return <Badge tone={view.tone}>{view.label}</Badge>;
}
