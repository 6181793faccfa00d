/** ASTM E691, 95 % limits: repeatability r = 2.8 s_r, reproducibility R = 2.8 s_R. */
export function precisionLimit(s: number): number {
  return 2.8 * s;
}

/**
 * Coefficient of variation in percent, 100·s/|x̿| (common practice; the
 * absolute level keeps it positive for negative responses). Null at level 0.
 */
export function coefficientOfVariation(s: number, level: number): number | null {
  return level === 0 ? null : (100 * s) / Math.abs(level);
}

export interface C670Limits {
  oneS: number;
  d2s: number;
  oneSPercent: number | null;
  d2sPercent: number | null;
}

/**
 * ASTM C670, precision statements: the 1s limit (the standard deviation) and the
 * d2s limit 2√2·s, the acceptable range of two results; the % forms use the
 * coefficient of variation instead of s.
 */
export function c670Limits(s: number, level: number): C670Limits {
  const oneSPercent = coefficientOfVariation(s, level);
  return {
    oneS: s,
    d2s: 2 * Math.SQRT2 * s,
    oneSPercent,
    d2sPercent: oneSPercent === null ? null : 2 * Math.SQRT2 * oneSPercent,
  };
}
