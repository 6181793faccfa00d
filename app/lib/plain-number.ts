/**
 * The one grammar for a number written as text, wherever results arrive: a
 * typed field, a lab's results file, a file for the precision command line.
 * A plain decimal with an optional sign and point: no exponent, hexadecimal,
 * "Infinity" or thousands separator, any of which in a result is far more
 * often a slip than meant. A decimal comma is read only from a file that is
 * read as using decimal commas throughout (see `decimalCommaAsPoint`).
 */
const PLAIN_DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)$/;
const COMMA_DECIMAL = /^[+-]?(?:\d+,\d+|,\d+)$/;

/** The text (surrounding spaces aside) as a number, or null when it is not a plain decimal. */
export function parsePlainNumber(text: string): number | null {
  const trimmed = text.trim();
  return PLAIN_DECIMAL.test(trimmed) ? Number(trimmed) : null;
}

/** Whether the text is a decimal written with a comma ("9,5"), as spreadsheets save numbers in many locales. */
export function hasDecimalComma(text: string): boolean {
  return COMMA_DECIMAL.test(text.trim());
}

/** "9,5" as "9.5"; any other text as it is, for the plain grammar to judge. */
export function decimalCommaAsPoint(text: string): string {
  const trimmed = text.trim();
  return COMMA_DECIMAL.test(trimmed) ? trimmed.replace(",", ".") : text;
}
