import type { ResultRow } from "./types";

/** Replicate results by lab code, for one material and response. */
export type Cells = Record<string, number[]>;

/** Invented: 8 labs × 3 replicates around 100 with lab spreads of about 0.3; no lab stands out. */
export const CLEAN_CELLS: Cells = {
  L01: [100.1, 99.8, 100.3],
  L02: [99.9, 100.2, 99.6],
  L03: [100.4, 100.0, 100.2],
  L04: [99.7, 100.1, 99.9],
  L05: [100.3, 100.0, 100.5],
  L06: [100.0, 99.6, 100.3],
  L07: [100.2, 100.5, 99.9],
  L08: [99.8, 100.0, 100.4],
};

/** Invented: lab L05 planted about 5 units high (between-lab outlier). */
export const L05_HIGH = { L05: [105.2, 104.9, 105.4] };
/** Invented: lab L03 planted with a spread of about 3 (within-lab outlier), same average. */
export const L03_WIDE = { L03: [97.0, 100.4, 103.1] };

/** The cells as long-form result rows, replicates numbered from 1. */
export function toRows(cells: Cells, material = "M1", response = "slump"): ResultRow[] {
  return Object.entries(cells).flatMap(([lab, values]) => values.map((value, index) => ({ lab, material, response, replicate: index + 1, value })));
}
