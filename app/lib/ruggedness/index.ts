// Ruggedness screening of a test method (ASTM E1169): pure and browser-safe.
export { RUN_COUNTS, plackettBurmanDesign, maxFactors, designFor, type RunCount, type Level } from "./designs";
export { randomRunOrder } from "./run-order";
export { runAverages, columnEffects } from "./effects";
export { replicateScatter, dummyColumnScatter, testEffect, type EffectScatter, type EffectTest } from "./significance";
export { halfNormalPoints, type HalfNormalPoint } from "./half-normal";
export { factorConclusion, settingText, type FactorSettings } from "./conclusions";
export { analyzeRuggedness, type RuggednessAnalysis, type RuggednessFactor, type ColumnResult } from "./analyze";
