/** How figures read on pages and in statement texts. */
import { formatFixed } from "~/lib/format";

/** A number with fixed decimals, or a dash when there is none. */
export function formatFigure(value: number | null | undefined, decimals: number) {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  return formatFixed(value, decimals);
}

/**
 * Decimals for each kind of figure, from the decimals the response is
 * recorded with: averages one more, standard deviations and h/k two more.
 */
export function figureDecimals(responseDecimals: number) {
  return { mean: responseDecimals + 1, sd: responseDecimals + 2, limit: responseDecimals + 1, ratio: 2 };
}

export const ALPHA_LABEL: Record<number, string> = { 0.005: "0.5 %", 0.01: "1 %", 0.05: "5 %" };
