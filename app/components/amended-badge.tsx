import { type CellRef, cellKey, sameCell } from "~/lib/review/cells";
import { Badge } from "./ui";

/** Marks a cell whose values the lab amended while a correction query on it was open. */
export function AmendedAfterQueryBadge({
  cell,
  amended,
}: {
  cell: CellRef;
  amended: readonly CellRef[];
}) {
  if (!amended.some((c) => sameCell(c, cell))) return null;
  return <Badge tone="ochre">amended after query</Badge>;
}

/** The cells amended after a correction query, listed for readers of the figures (the committee). */
export function AmendedCellsNote({ amended }: { amended: readonly CellRef[] }) {
  if (amended.length === 0) return <p>No cell was amended after a correction query.</p>;
  return (
    <ul className="flex flex-wrap gap-3">
      {amended.map((c) => (
        <li key={cellKey(c)}>
          Lab {c.lab} · {c.material} · {c.response} <AmendedAfterQueryBadge cell={c} amended={amended} />
        </li>
      ))}
    </ul>
  );
}
