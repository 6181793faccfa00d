// Precision engine: pure functions, no React, router or database, shared by pages, API routes, the CLI and tests.
export { analyzeStudy } from "./analyze-study";
export { MIN_LABS, MIN_REPLICATES } from "./analyze-group";
export { parseResultsCsv, RESULT_COLUMNS, type ParsedResults } from "./csv";
export { isInputError } from "./problems";
export { SIGNIFICANCE_LEVELS, isSignificanceLevel, assertSignificanceLevel, consistencyTails, type SignificanceLevel } from "./significance";
export { studentTQuantile, fQuantile, chiSquareQuantile } from "./distributions";
export { logGamma, regularizedBeta, regularizedGamma } from "./special-functions";
export { significanceDescription } from "./significance-text";
export { MAX_MAGNITUDE } from "./group-rows";
export { workingUnits } from "./working-units";
export { screenCells, screenCochran, screenGrubbsSingle, screenGrubbsDouble, type ScreeningInput, type ScreeningOutcome } from "./screening";
export { standardDeviationInterval, satterthwaiteDegreesOfFreedom, repeatabilityInterval, reproducibilityInterval } from "./confidence-intervals";
export { repeatabilityUncertainty, reproducibilityUncertainty } from "./iso-uncertainty";
export { c670Form, relativeSpread, type C670Form, type C670FormPoint } from "./c670-form";
export {
  studyWarnings,
  RECOMMENDED_LABS,
  ISO_RECOMMENDED_LABS,
  RECOMMENDED_MATERIALS,
  RECOMMENDED_REPLICATES,
} from "./study-warnings";
export { roundSignificant, formatSignificant, STATEMENT_SIGNIFICANT_DIGITS } from "./significant-digits";
export { cellStatistics, type CellStatistics } from "./cell-statistics";
export {
  averageOfCellAverages,
  standardDeviationOfCellAverages,
  replicateWeightedMean,
  averageReplicates,
  mostFrequentReplicates,
} from "./cell-averages";
export { repeatabilityStandardDeviation, pooledRepeatabilityStandardDeviation } from "./repeatability";
export {
  betweenLabVariance,
  betweenCellVariance,
  generalBetweenLabVariance,
  betweenLabStandardDeviation,
  reproducibilityStandardDeviation,
} from "./reproducibility";
export { precisionLimit, coefficientOfVariation, c670Limits, type C670Limits } from "./limits";
export { hStatistic, kStatistic, hCritical, kCritical } from "./consistency";
export { cochranC, cochranCritical } from "./cochran";
export { grubbsSingle, grubbsSingleCritical, grubbsDouble, type GrubbsSingleStatistic, type GrubbsDoubleStatistic } from "./grubbs";
export {
  grubbsDoubleCritical,
  GRUBBS_DOUBLE_MIN_LABS,
  GRUBBS_DOUBLE_MAX_LABS,
  GRUBBS_DOUBLE_PUBLISHED_MAX_LABS,
} from "./grubbs-double-critical";
export { outlierClass, type OutlierClass } from "./outlier-class";
export {
  levelFit,
  weightedLinearFit,
  predictLevelModel,
  LEVEL_FIT_MIN_MATERIALS,
  type LevelFitCandidate,
  type LevelFitResult,
  type LevelModel,
  type LevelPoint,
  type LevelRelation,
} from "./level-fit";
export type * from "./types";
