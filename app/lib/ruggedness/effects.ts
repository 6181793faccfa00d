import type { Level } from "./designs";

/** The average of each run's results (one or two replicates per run). */
export function runAverages(results: readonly (readonly number[])[]): number[] {
  return results.map((values) => {
    if (values.length === 0) throw new RangeError("every run needs at least one result");
    return values.reduce((a, b) => a + b, 0) / values.length;
  });
}

/**
 * ASTM E1169, Plackett–Burman calculations: the effect of a column is the
 * average of the runs at its high setting minus the average of the runs at
 * its low setting, Σ(sign·ȳ)/(N/2). Returns one effect per design column.
 */
export function columnEffects(design: readonly (readonly Level[])[], averages: readonly number[]): number[] {
  if (design.length !== averages.length) throw new RangeError(`the design has ${design.length} runs, got ${averages.length} averages`);
  const columns = design[0]!.length;
  const half = design.length / 2;
  return Array.from({ length: columns }, (_, column) => design.reduce((sum, row, run) => sum + row[column]! * averages[run]!, 0) / half);
}
