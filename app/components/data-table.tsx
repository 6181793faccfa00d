/**
 * A sortable, filterable table for lists. Pages describe each column by a
 * plain value (what it sorts and filters on) and, if they want, how a cell
 * renders; the table machinery stays inside this file.
 */
import {
  type ColumnDef,
  columnFilteringFeature,
  createFilteredRowModel,
  createSortedRowModel,
  filterFn_includesString,
  globalFilteringFeature,
  rowSortingFeature,
  type RowData,
  sortFn_alphanumeric,
  tableFeatures,
  useTable,
} from "@tanstack/react-table";
import { type ReactNode, useId, useMemo, useRef } from "react";
import { oneWordCell } from "~/components/ui";

const features = tableFeatures({
  rowSortingFeature,
  columnFilteringFeature,
  globalFilteringFeature,
  sortedRowModel: createSortedRowModel(),
  filteredRowModel: createFilteredRowModel(),
  sortFns: { alphanumeric: sortFn_alphanumeric },
  filterFns: { includesString: filterFn_includesString },
});

export type DataColumn<T extends RowData> = {
  id: string;
  header: string;
  /** What the column sorts and filters on. */
  value: (row: T) => string | number | null;
  /** How the cell shows; the value as text when omitted. */
  cell?: (row: T) => ReactNode;
  /** Columns of buttons or links only should not sort. */
  sortable?: boolean;
};

const ARIA_SORT = { asc: "ascending", desc: "descending" } as const;

export function DataTable<T extends RowData>({
  caption,
  columns,
  data,
  filterLabel = "Filter the list",
  empty = "Nothing to show.",
}: {
  caption: string;
  columns: DataColumn<T>[];
  data: T[];
  filterLabel?: string;
  empty?: string;
}) {
  const filterId = useId();
  // Pages pass their columns inline, so each render brings new functions. The table's column
  // definitions stay the same objects (reading the latest columns through a ref): a new cell
  // function would remount its cell, closing an open disclosure and dropping what was typed in it.
  const latestColumns = useRef(columns);
  latestColumns.current = columns;
  const columnIds = columns.map((c) => c.id).join("\n");
  const tableColumns = useMemo(
    () =>
      latestColumns.current.map(
        (c, i): ColumnDef<typeof features, T> => ({
          id: c.id,
          header: c.header,
          accessorFn: (row: T) => latestColumns.current[i]!.value(row),
          cell: ({ row }) => {
            const column = latestColumns.current[i]!;
            return column.cell ? column.cell(row.original) : (column.value(row.original) ?? "—");
          },
          enableSorting: c.sortable ?? true,
          sortFn: "alphanumeric",
          sortUndefined: "last",
        }),
      ),
    [columnIds],
  );
  const table = useTable({
    features,
    columns: tableColumns,
    data,
    globalFilterFn: "includesString",
    getColumnCanGlobalFilter: () => true,
  });
  const rows = table.getRowModel().rows;
  return (
    <div className="flex flex-col gap-3">
      {/* The search box is for the screen; paper gets the whole table. */}
      <div className="no-print flex max-w-sm flex-col gap-1">
        <label htmlFor={filterId} className="text-sm font-semibold text-basalt-800">
          {filterLabel}
        </label>
        <input
          id={filterId}
          type="search"
          value={String(table.state.globalFilter ?? "")}
          onChange={(e) => table.setGlobalFilter(e.target.value)}
          className="min-h-11 rounded-md border border-basalt-200 bg-white px-3 py-2"
        />
      </div>
      <div className="relative overflow-x-auto" role="region" aria-label={caption} tabIndex={0}>
        <table className="w-full border-collapse text-left">
          <caption className="sr-only">{caption}</caption>
          <thead>
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id} className="border-b-2 border-basalt-200">
                {group.headers.map((header) => {
                  const sorted = header.column.getIsSorted();
                  const label = String(header.column.columnDef.header ?? "");
                  return (
                    <th key={header.id} scope="col" aria-sort={sorted ? ARIA_SORT[sorted] : undefined} className="px-3 py-2 font-semibold text-basalt-800">
                      {header.column.getCanSort() ? (
                        <button
                          type="button"
                          onClick={header.column.getToggleSortingHandler()}
                          className="inline-flex items-center gap-1 rounded font-semibold underline-offset-2 hover:underline"
                        >
                          {label}
                          <span aria-hidden="true">{sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : "↕"}</span>
                          <span className="sr-only">, sort</span>
                        </button>
                      ) : (
                        label
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {rows.length === 0 ? (
              <tr>
                <td colSpan={columns.length} className="px-3 py-3 text-basalt-700">
                  {empty}
                </td>
              </tr>
            ) : (
              rows.map((row) => (
                <tr key={row.id} className="border-b border-basalt-100">
                  {row.getAllCells().map((cell) => (
                    <td key={cell.id} className={`px-3 py-2 align-top ${oneWordCell(cell.getValue() as ReactNode) ? "keep-whole" : ""}`}>
                      <table.FlexRender cell={cell} />
                    </td>
                  ))}
                </tr>
              ))
            )}
          </tbody>
        </table>
      </div>
    </div>
  );
}
