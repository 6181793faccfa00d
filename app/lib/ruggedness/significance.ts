import { studentTQuantile } from "~/lib/precision";

export interface EffectScatter {
  /** standard error of one effect */
  standardError: number;
  degreesOfFreedom: number;
  basis: "replicates" | "dummy-columns";
}

/**
 * ASTM E1169, testing effects from repeated runs: the pooled within-run
 * standard deviation s = √(Σ(nᵢ − 1)sᵢ² / Σ(nᵢ − 1)), and the standard error
 * of an effect 2·s/√(N·n) (each effect is the difference of two averages of
 * N·n/2 results). Null when no run is repeated.
 */
export function replicateScatter(results: readonly (readonly number[])[]): EffectScatter | null {
  let sumSquares = 0;
  let degreesOfFreedom = 0;
  let total = 0;
  for (const values of results) {
    const mean = values.reduce((a, b) => a + b, 0) / values.length;
    for (const value of values) sumSquares += (value - mean) ** 2;
    degreesOfFreedom += values.length - 1;
    total += values.length;
  }
  if (degreesOfFreedom === 0) return null;
  const s = Math.sqrt(sumSquares / degreesOfFreedom);
  // total = N·n with equal replicates; with unequal ones it is the effective count the formula generalises to
  return { standardError: (2 * s) / Math.sqrt(total), degreesOfFreedom, basis: "replicates" };
}

/**
 * ASTM E1169, single results: the dummy columns carry no factor, so their
 * effects show the scatter alone; the standard error of an effect is
 * √(Σ e_dummy² / d) with d degrees of freedom. Null without dummy columns.
 */
export function dummyColumnScatter(dummyEffects: readonly number[]): EffectScatter | null {
  if (dummyEffects.length === 0) return null;
  const meanSquare = dummyEffects.reduce((sum, e) => sum + e * e, 0) / dummyEffects.length;
  return { standardError: Math.sqrt(meanSquare), degreesOfFreedom: dummyEffects.length, basis: "dummy-columns" };
}

export interface EffectTest {
  t: number | null;
  critical: number;
  significant: boolean;
}

/** Two-sided t test of one effect at level α (5 % unless given): significant when |effect|/SE > t(1 − α/2, df). */
export function testEffect(effect: number, scatter: EffectScatter, alpha = 0.05): EffectTest {
  const critical = studentTQuantile(1 - alpha / 2, scatter.degreesOfFreedom);
  if (scatter.standardError === 0) return { t: null, critical, significant: effect !== 0 };
  const t = Math.abs(effect) / scatter.standardError;
  return { t, critical, significant: t > critical };
}
