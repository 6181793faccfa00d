/** Ready test-method templates a new study can start from. */
import { AIR_CONTENT_TOLERANCE_POINTS, DEFAULT_WASTE_FRACTION, FLOAT_FINISHING_SPECIMEN_M3, slumpTolerance } from "~/lib/batching";

const SLUMP_TARGET_MM = 75;
const AIR_TARGET_PERCENT = 6;

/** Float finishing test of fresh concrete: two pass counts per specimen (see the product design). */
export const FLOAT_FINISHING_TEMPLATE = {
  testMethod: "Float finishing test of fresh concrete",
  replicatesPerCell: 3,
  targetSurfaceRating: 2,
  // The 3 ft × 2 ft × 3 in form (common practice) and our usual waste allowance.
  specimenVolumeM3: FLOAT_FINISHING_SPECIMEN_M3,
  wastePercent: DEFAULT_WASTE_FRACTION * 100,
  responses: [
    { key: "holes", name: "Passes to close the preformed holes", unit: "passes", kind: "count", decimals: 0, plausibleMin: 1, plausibleMax: 40 },
    { key: "surface", name: "Passes to reach the target surface", unit: "passes", kind: "count", decimals: 0, plausibleMin: 1, plausibleMax: 40 },
  ],
  // Tolerances as ASTM C94 gives them (reference/critical-values.md, from memory).
  freshTargets: [
    { property: "slump", target: SLUMP_TARGET_MM, tolerance: slumpTolerance(SLUMP_TARGET_MM, "mm") },
    { property: "air_content", target: AIR_TARGET_PERCENT, tolerance: AIR_CONTENT_TOLERANCE_POINTS },
  ],
} as const;
