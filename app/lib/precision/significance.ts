/** The significance levels the practices tabulate: E691's 0.5 %, ISO 5725-2's 1 % and 5 %. */
export const SIGNIFICANCE_LEVELS = [0.005, 0.01, 0.05] as const;
export type SignificanceLevel = (typeof SIGNIFICANCE_LEVELS)[number];

export function isSignificanceLevel(alpha: unknown): alpha is SignificanceLevel {
  return SIGNIFICANCE_LEVELS.includes(alpha as SignificanceLevel);
}

export function assertSignificanceLevel(alpha: number): SignificanceLevel {
  if (!isSignificanceLevel(alpha)) {
    throw new RangeError(
      `significance level must be one of ${SIGNIFICANCE_LEVELS.join(", ")}, got ${alpha}`,
    );
  }
  return alpha;
}

/**
 * Upper-tail probabilities behind the h and k critical values.
 * The practices read α differently: ASTM E691's 0.5 % level puts 0.5 % in the
 * upper tail of t (h is checked on both sides against the same bound) and of F
 * (k); ISO 5725-2 reads α as two-sided for h (α/2 per tail) and one-sided for k.
 * So E691 0.5 % and ISO 1 % share their h values, as both published tables show.
 */
export function consistencyTails(alpha: SignificanceLevel): { h: number; k: number } {
  if (alpha === 0.005) return { h: 0.005, k: 0.005 };
  return { h: alpha / 2, k: alpha };
}
