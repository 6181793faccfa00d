import { plackettBurmanDesign, type RunCount } from "./designs";
import { columnEffects, runAverages } from "./effects";
import { factorConclusion, type FactorSettings } from "./conclusions";
import { halfNormalPoints, type HalfNormalPoint } from "./half-normal";
import { dummyColumnScatter, replicateScatter, testEffect, type EffectScatter, type EffectTest } from "./significance";

export type RuggednessFactor = FactorSettings & {
  /** 1-based design column */
  column: number;
};

export interface ColumnResult {
  column: number;
  /** the factor's name, or "Dummy n" */
  label: string;
  factor: RuggednessFactor | null;
  effect: number;
  test: EffectTest | null;
  conclusion: string | null;
}

export type RuggednessAnalysis =
  | { status: "incomplete"; missingRuns: number[] }
  | {
      status: "computed";
      runAverages: number[];
      columns: ColumnResult[];
      scatter: EffectScatter | null;
      halfNormal: HalfNormalPoint[];
    };

/**
 * A ruggedness test of one response (ASTM E1169): effects of every design
 * column, their significance against the replicate scatter when runs were
 * repeated, else against the dummy columns' effects, half-normal plot points
 * and a conclusion per factor. `results[i]` holds the results of design row i + 1.
 */
export function analyzeRuggedness(
  runs: RunCount,
  factors: readonly RuggednessFactor[],
  results: readonly (readonly number[])[],
  response: { name: string; unit: string },
  alpha = 0.05,
): RuggednessAnalysis {
  const missingRuns = Array.from({ length: runs }, (_, i) => i + 1).filter((run) => (results[run - 1]?.length ?? 0) === 0);
  if (missingRuns.length > 0) return { status: "incomplete", missingRuns };
  const design = plackettBurmanDesign(runs);
  const averages = runAverages(results);
  const effects = columnEffects(design, averages);
  const factorByColumn = new Map(factors.map((f) => [f.column, f]));
  const dummyEffects = effects.filter((_, i) => !factorByColumn.has(i + 1));
  const scatter = replicateScatter(results) ?? dummyColumnScatter(dummyEffects);
  let dummyCount = 0;
  const columns: ColumnResult[] = effects.map((effect, i) => {
    const factor = factorByColumn.get(i + 1) ?? null;
    const test = scatter ? testEffect(effect, scatter, alpha) : null;
    return {
      column: i + 1,
      label: factor ? factor.name : `Dummy ${++dummyCount}`,
      factor,
      effect,
      test,
      conclusion: factor ? factorConclusion(factor, effect, test, response) : null,
    };
  });
  return { status: "computed", runAverages: averages, columns, scatter, halfNormal: halfNormalPoints(columns.map((c) => ({ label: c.label, effect: c.effect }))) };
}
