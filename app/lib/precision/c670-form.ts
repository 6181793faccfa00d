/** One material's figures for choosing the C670 form. */
export interface C670FormPoint {
  level: number;
  sr: number;
  sR: number;
}

export interface C670Form {
  /** "percent": 1s % and d2s % for both precisions; "absolute": 1s and d2s in the response's units */
  form: "percent" | "absolute";
  reason: string;
}

/** Relative spread (standard deviation / |mean|) of positive figures across levels; Infinity when undefined. */
export function relativeSpread(values: readonly number[]): number {
  if (values.length < 2) return Number.POSITIVE_INFINITY;
  const mean = values.reduce((a, b) => a + b, 0) / values.length;
  if (mean === 0) return Number.POSITIVE_INFINITY;
  const sd = Math.sqrt(values.reduce((a, v) => a + (v - mean) ** 2, 0) / (values.length - 1));
  return sd / Math.abs(mean);
}

const pct = (x: number) => `${(100 * x).toFixed(1)} %`;

/**
 * ASTM C670 lets a statement give precision as 1s and d2s or, when the
 * coefficient of variation is the steadier figure across levels, as 1s % and
 * d2s %. One rule, one form per response for both single-operator and
 * multilaboratory figures: percent when the relative spread across materials
 * of the coefficients of variation (of s_r and of s_R, summed) is smaller than
 * that of the standard deviations themselves. Needs at least 2 materials, all
 * on one side of zero; otherwise the absolute form.
 */
export function c670Form(points: readonly C670FormPoint[]): C670Form {
  if (points.length < 2) return { form: "absolute", reason: "one material: no change with level can be seen, so the figures are given in the response's units" };
  if (!(points.every((p) => p.level > 0) || points.every((p) => p.level < 0))) {
    return { form: "absolute", reason: "the levels include zero or both signs, so a coefficient of variation is not meaningful" };
  }
  const cvr = points.map((p) => p.sr / Math.abs(p.level));
  const cvR = points.map((p) => p.sR / Math.abs(p.level));
  const sdSpread = relativeSpread(points.map((p) => p.sr)) + relativeSpread(points.map((p) => p.sR));
  const cvSpread = relativeSpread(cvr) + relativeSpread(cvR);
  const detail = `relative spread across the ${points.length} materials: standard deviations ${pct(sdSpread / 2)}, coefficients of variation ${pct(cvSpread / 2)} (average of s_r and s_R)`;
  return cvSpread < sdSpread
    ? { form: "percent", reason: `the coefficient of variation is steadier across levels than the standard deviation (${detail}), so both precisions are given in percent` }
    : { form: "absolute", reason: `the standard deviation is at least as steady across levels as the coefficient of variation (${detail}), so both precisions are given in the response's units` };
}
