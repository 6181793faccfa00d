/** A cell named by what the analysis knows: blind lab code, material code and response key. */
export type CellRef = { lab: string; material: string; response: string };

const PART = /^[A-Za-z0-9_.-]{1,40}$/;

export const cellKey = (cell: CellRef) => `${cell.lab}:${cell.material}:${cell.response}`;

export const sameCell = (a: CellRef, b: CellRef) => a.lab === b.lab && a.material === b.material && a.response === b.response;

/**
 * Reads a list such as `L01:M3:holes,L08:M2:surface` (the what-if query
 * parameter). An empty or missing list is no exclusion at all.
 */
export function parseCellList(param: string | null): { cells: CellRef[] } | { error: string } {
  if (param === null || param.trim() === "") return { cells: [] };
  const cells: CellRef[] = [];
  for (const item of param.split(",")) {
    const parts = item.trim().split(":");
    if (parts.length !== 3 || !parts.every((part) => PART.test(part))) {
      return { error: `"${item.trim()}" is not a cell; write lab:material:response, e.g. L01:M3:holes.` };
    }
    const [lab, material, response] = parts as [string, string, string];
    if (!cells.some((c) => sameCell(c, { lab, material, response }))) cells.push({ lab, material, response });
  }
  return { cells };
}
