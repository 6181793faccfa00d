/** ISO 5725-2 wording: a straggler passes the 5 % critical value, an outlier the 1 % one. */
export type OutlierClass = "straggler" | "outlier" | null;

/**
 * ISO 5725-2, classification of a test statistic against its 5 % and 1 %
 * critical values. `"above"` for tests where large values are suspect
 * (Cochran, single Grubbs), `"below"` where small values are (double Grubbs).
 */
export function outlierClass(
  statistic: number | null,
  critical5: number | null,
  critical1: number | null,
  suspect: "above" | "below",
): OutlierClass {
  if (statistic === null || critical5 === null || critical1 === null) return null;
  const beyond = (critical: number) => (suspect === "above" ? statistic > critical : statistic < critical);
  if (beyond(critical1)) return "outlier";
  if (beyond(critical5)) return "straggler";
  return null;
}
