import { Link, useLocation } from "react-router";

/**
 * One link per material; the page shows the chosen one (`?material=`), so a
 * large study's tables arrive one material at a time. The rest of the query
 * string is kept, except what only made sense for the previous material.
 */
export function MaterialPicker({ materials, shown, drop = [] }: { materials: { code: string; description?: string }[]; shown: string | null; drop?: string[] }) {
  const { search } = useLocation();
  if (materials.length <= 1) return null;
  const linkTo = (code: string) => {
    const params = new URLSearchParams(search);
    for (const name of drop) params.delete(name);
    params.set("material", code);
    return `?${params}`;
  };
  return (
    <nav aria-label="Materials" className="flex flex-wrap items-center gap-2">
      <span className="font-semibold text-basalt-800">Material:</span>
      {materials.map((m) =>
        m.code === shown ? (
          <span key={m.code} aria-current="page" className="inline-flex min-h-11 min-w-11 items-center justify-center rounded bg-basalt-700 px-3 font-semibold text-white">
            {m.code}
          </span>
        ) : (
          <Link
            key={m.code}
            to={linkTo(m.code)}
            title={m.description}
            className="inline-flex min-h-11 min-w-11 items-center justify-center rounded border border-basalt-300 px-3 font-semibold text-basalt-700 underline"
          >
            {m.code}
          </Link>
        ),
      )}
    </nav>
  );
}
