/**
 * The one grammar for a number written as text, wherever results arrive: a
 * typed field, a lab's results file, a file for the precision command line.
 * A plain decimal with an optional sign and point: no exponent, hexadecimal,
 * "Infinity", thousands separator or decimal comma, any of which in a result
 * is far more often a slip than meant.
 */
const PLAIN_DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)$/;

/** The text (surrounding spaces aside) as a number, or null when it is not a plain decimal. */
export function parsePlainNumber(text: string): number | null {
  const trimmed = text.trim();
  return PLAIN_DECIMAL.test(trimmed) ? Number(trimmed) : null;
}
