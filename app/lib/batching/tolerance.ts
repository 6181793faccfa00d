/**
 * Fresh-concrete tolerances for conformance checks (ASTM C94, from memory).
 * The mm values are the standard's own metric column, not conversions of
 * the inch values, so each unit is looked up in its own table.
 */

export type SlumpUnit = "in" | "mm";

/** Air content tolerance: specified value ± 1.5 percentage points (ASTM C94, from memory). */
export const AIR_CONTENT_TOLERANCE_POINTS = 1.5;

// [specified slump up to and including, tolerance ±] in ascending order; the last row has no upper bound.
const SLUMP_TOLERANCES: Record<SlumpUnit, readonly [number, number][]> = {
  in: [
    [2, 0.5],
    [4, 1],
    [Infinity, 1.5],
  ],
  mm: [
    [50, 15],
    [100, 25],
    [Infinity, 40],
  ],
};

/**
 * Slump tolerance for a specified slump (ASTM C94, from memory): 2 in
 * (50 mm) and less ± 1/2 in (15 mm); over 2 through 4 in (50–100 mm) ± 1 in
 * (25 mm); over 4 in (100 mm) ± 1 1/2 in (40 mm).
 */
export function slumpTolerance(specifiedSlump: number, unit: SlumpUnit): number {
  if (!(Number.isFinite(specifiedSlump) && specifiedSlump >= 0)) {
    throw new RangeError("Specified slump must be a number of at least 0");
  }
  const row = SLUMP_TOLERANCES[unit].find(([upTo]) => specifiedSlump <= upTo);
  // The last row is unbounded, so a finite slump always finds one.
  return row![1];
}

export interface ToleranceCheck {
  target: number;
  measured: number;
  tolerance: number;
  lower: number;
  upper: number;
  /** measured − target */
  deviation: number;
  withinTolerance: boolean;
}

// Readings sit on a decimal grid (0.1 %, 1/4 in, 5 mm); a reading exactly on a
// limit must not fall out through binary rounding of the subtraction.
const ROUNDING_ALLOWANCE = 1e-9;

/** Whether a measured value is within target ± tolerance, limits included. */
export function checkTolerance(
  target: number,
  measured: number,
  tolerance: number,
): ToleranceCheck {
  const deviation = measured - target;
  return {
    target,
    measured,
    tolerance,
    lower: target - tolerance,
    upper: target + tolerance,
    deviation,
    withinTolerance: Math.abs(deviation) <= tolerance + ROUNDING_ALLOWANCE,
  };
}

/** Slump check against the specified slump with its C94 tolerance (from memory). */
export function checkSlump(target: number, measured: number, unit: SlumpUnit): ToleranceCheck {
  return checkTolerance(target, measured, slumpTolerance(target, unit));
}

/** Air content check, % of volume, ± 1.5 percentage points (ASTM C94, from memory). */
export function checkAirContent(targetPercent: number, measuredPercent: number): ToleranceCheck {
  return checkTolerance(targetPercent, measuredPercent, AIR_CONTENT_TOLERANCE_POINTS);
}

export interface FreshPropertyInput {
  slump?: { target: number; measured: number; unit: SlumpUnit };
  airContent?: { targetPercent: number; measuredPercent: number };
}

export interface FreshPropertyCheck extends ToleranceCheck {
  property: "slump" | "air_content";
  unit: SlumpUnit | "%";
  /** e.g. "Slump 5.5 in is outside 3 ± 1 in" */
  message: string;
}

function describe(label: string, unit: string, check: ToleranceCheck): string {
  const u = unit === "%" ? " %" : ` ${unit}`;
  const verdict = check.withinTolerance ? "within" : "outside";
  return `${label} ${check.measured}${u} is ${verdict} ${check.target} ± ${check.tolerance}${u}`;
}

/**
 * Checks every fresh property that has both a target and a reading. A batch
 * out of tolerance keeps its result: the check marks it for the coordinator.
 */
export function checkFreshProperties(input: FreshPropertyInput): FreshPropertyCheck[] {
  const checks: FreshPropertyCheck[] = [];
  if (input.slump) {
    const { target, measured, unit } = input.slump;
    const check = checkSlump(target, measured, unit);
    checks.push({ ...check, property: "slump", unit, message: describe("Slump", unit, check) });
  }
  if (input.airContent) {
    const check = checkAirContent(input.airContent.targetPercent, input.airContent.measuredPercent);
    checks.push({
      ...check,
      property: "air_content",
      unit: "%",
      message: describe("Air content", "%", check),
    });
  }
  return checks;
}
