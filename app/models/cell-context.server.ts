/**
 * The joins that take a query from a cell to what names it: the lab's
 * enrollment, the material and the response. Queries over results, decisions,
 * queries or cells start from their own table, join the cell, then call
 * `withCellContext` on the `$dynamic()` builder; `cellNames` selects what
 * names the cell.
 */
import { eq } from "drizzle-orm";
import type { SQLiteSelect } from "drizzle-orm/sqlite-core";
import { cells, enrollments, materials, responses } from "~/db/schema";

/** What names a cell to people: the lab's code, the material's code and the response's key. */
export const cellNames = { lab: enrollments.labCode, material: materials.code, response: responses.key };

export function withCellContext<T extends SQLiteSelect>(query: T) {
  return query
    .innerJoin(enrollments, eq(enrollments.id, cells.enrollmentId))
    .innerJoin(materials, eq(materials.id, cells.materialId))
    .innerJoin(responses, eq(responses.id, cells.responseId));
}
