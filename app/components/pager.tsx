import { Link, useLocation } from "react-router";

/** "Page 2 of 12" with links to the neighbouring pages, keeping the rest of the query string. */
export function Pager({ page, pageCount, label, name = "page" }: { page: number; pageCount: number; label: string; name?: string }) {
  const { search } = useLocation();
  if (pageCount <= 1) return null;
  const linkTo = (target: number) => {
    const params = new URLSearchParams(search);
    params.set(name, String(target));
    return `?${params}`;
  };
  return (
    <nav aria-label={label} className="mt-3 flex flex-wrap items-center gap-4">
      <span>
        Page {page} of {pageCount}
      </span>
      {page > 1 && (
        <Link to={linkTo(page - 1)} className="inline-flex min-h-11 items-center font-semibold text-basalt-700 underline">
          Previous page
        </Link>
      )}
      {page < pageCount && (
        <Link to={linkTo(page + 1)} className="inline-flex min-h-11 items-center font-semibold text-basalt-700 underline">
          Next page
        </Link>
      )}
    </nav>
  );
}
