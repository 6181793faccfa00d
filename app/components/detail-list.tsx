import type { ReactNode } from "react";

/** Read-only facts of a record as a grid of term and value pairs. */
export function DetailList({ items, className = "grid gap-2 md:grid-cols-2" }: { items: [term: string, value: ReactNode][]; className?: string }) {
  return (
    <dl className={className}>
      {items.map(([term, value]) => (
        <div key={term}>
          <dt className="font-semibold">{term}</dt>
          <dd>{value}</dd>
        </div>
      ))}
    </dl>
  );
}
