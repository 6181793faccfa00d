/**
 * ASTM E691 asks for precision figures with two or three significant digits
 * (no more: the study cannot support them). The statement rounds standard
 * deviations, limits and coefficients of variation to three.
 */
export const STATEMENT_SIGNIFICANT_DIGITS = 3;

/** x rounded to `digits` significant digits (half away from zero on the decimal string). 0 stays 0. */
export function roundSignificant(x: number, digits: number = STATEMENT_SIGNIFICANT_DIGITS): number {
  if (!Number.isInteger(digits) || digits < 1 || digits > 21) throw new RangeError(`significant digits must be 1 to 21, got ${digits}`);
  if (x === 0 || !Number.isFinite(x)) return x;
  return Number(x.toPrecision(digits));
}

/**
 * x as text with `digits` significant digits, in plain notation between 1e-6
 * and 1e21 (e.g. 0.0123, 1.20, 1230 — trailing zeros after the point kept, they are significant).
 */
export function formatSignificant(x: number | null | undefined, digits: number = STATEMENT_SIGNIFICANT_DIGITS): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return "—";
  if (x === 0) return "0";
  const rounded = Number(x.toPrecision(digits));
  const exponent = Math.floor(Math.log10(Math.abs(rounded)));
  if (exponent < -6 || exponent >= 21) return x.toPrecision(digits);
  return rounded.toFixed(Math.max(0, digits - 1 - exponent));
}
