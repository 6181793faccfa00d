// Comparing two mixtures against a published precision statement (ISO 5725-6): pure and browser-safe.
export { normalRangeQuantile, criticalRangeFactor } from "./critical-range";
export { withinLabCriticalDifference, betweenLabCriticalDifference } from "./critical-difference";
export { acceptabilityCheck, type AcceptabilityCheck } from "./acceptability";
export { precisionAtLevel, type PrecisionAtLevel } from "./precision-at-level";
export { compareMixtures, type ComparisonSetting, type MixtureComparison, type MixtureResults } from "./compare-mixtures";
export { comparisonVerdict, acceptabilityVerdict } from "./verdict";
