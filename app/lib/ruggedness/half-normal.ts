import { standardNormalQuantile } from "~/lib/normal-distribution";

export interface HalfNormalPoint {
  label: string;
  effect: number;
  absoluteEffect: number;
  /** half-normal quantile Φ⁻¹(0.5 + 0.5·(i − 0.5)/m) of the i-th smallest |effect| */
  quantile: number;
}

/**
 * Half-normal plot of effects (Daniel 1959, "Use of half-normal plots in
 * interpreting factorial two-level experiments", Technometrics 1; common
 * practice): the absolute effects in increasing order against half-normal
 * quantiles at plotting positions (i − 0.5)/m. Effects of factors that do
 * not matter fall on a line through the origin; those that matter stand off it.
 */
export function halfNormalPoints(effects: readonly { label: string; effect: number }[]): HalfNormalPoint[] {
  const m = effects.length;
  return [...effects]
    .map((e) => ({ ...e, absoluteEffect: Math.abs(e.effect) }))
    .sort((a, b) => a.absoluteEffect - b.absoluteEffect)
    .map((e, i) => ({ ...e, quantile: standardNormalQuantile(0.5 + (0.5 * (i + 0.5)) / m) }));
}
