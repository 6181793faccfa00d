export type {
  Admixture,
  Aggregate,
  Air,
  BatchingWarning,
  Constituent,
  ConstituentKind,
  Fiber,
  MixtureDesign,
  PowderOrWater,
} from "./types";
export * from "./units";
export {
  ABSOLUTE_VOLUME_TOLERANCE,
  WATER_DENSITY_KG_PER_M3,
  absoluteVolume,
  checkMixtureDesign,
  constituentAbsoluteVolumeM3,
  designWaterKgPerM3,
  isAggregate,
  isMassConstituent,
  scmReplacementPercent,
  totalCementitiousKgPerM3,
  waterCementitiousRatio,
} from "./design";
export type { AbsoluteVolume, AbsoluteVolumeRow, MixtureDesignCheck } from "./design";
export {
  admixtureVolumeMl,
  batchSheet,
  fiberMassKg,
  freeWaterKg,
  ovenDryMassKg,
  wetBatchMassKg,
} from "./batch";
export type {
  AggregateCorrection,
  BatchSheet,
  BatchSheetInput,
  BatchSheetRow,
  WaterCorrection,
} from "./batch";
export {
  DEFAULT_FRESH_TEST_ALLOWANCE_M3,
  DEFAULT_WASTE_FRACTION,
  FLOAT_FINISHING_SPECIMEN_M3,
  suggestBatchVolume,
} from "./batch-volume";
export type { BatchVolumeInput, BatchVolumeStep, BatchVolumeSuggestion } from "./batch-volume";
export {
  AIR_CONTENT_TOLERANCE_POINTS,
  checkAirContent,
  checkFreshProperties,
  checkSlump,
  checkTolerance,
  slumpTolerance,
} from "./tolerance";
export type {
  FreshPropertyCheck,
  FreshPropertyInput,
  SlumpUnit,
  ToleranceCheck,
} from "./tolerance";
export { constituentSchema, mixtureDesignSchema } from "./schema";
export { mixingSequence, splitIntoMixes } from "./mixes";
export type { MixSplit } from "./mixes";
