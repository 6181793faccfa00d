/**
 * Fresh properties recorded with every batch, in SI units as stored. The
 * bounds catch typing and unit slips (common practice, not a specification):
 * an impossible reading is refused, an unusual one is kept with a warning,
 * and a reading outside the study's target ± tolerance is kept and marked.
 */
import { checkTolerance, type ToleranceCheck } from "~/lib/batching/tolerance";
import { parsePlainNumber } from "./values";

export const FRESH_FIELDS = {
  slump: {
    label: "Slump",
    unit: "mm",
    column: "slumpMm",
    // A slump cannot exceed the 300 mm height of the cone (common practice).
    impossible: [0, 300],
    plausible: [0, 250],
  },
  air_content: { label: "Air content", unit: "%", column: "airContentPercent", impossible: [0, 30], plausible: [1, 12] },
  unit_weight: { label: "Unit weight", unit: "kg/m³", column: "unitWeightKgPerM3", impossible: [500, 4000], plausible: [1800, 2600] },
  concrete_temperature: { label: "Concrete temperature", unit: "°C", column: "concreteTemperatureC", impossible: [-10, 80], plausible: [5, 35] },
  ambient_temperature: { label: "Ambient temperature", unit: "°C", column: "ambientTemperatureC", impossible: [-40, 60], plausible: [-5, 40] },
} as const;

export type FreshProperty = keyof typeof FRESH_FIELDS;
export const FRESH_PROPERTY_NAMES = Object.keys(FRESH_FIELDS) as FreshProperty[];

export type FreshReadingCheck =
  | { status: "empty" }
  | { status: "refused"; message: string }
  | { status: "ok"; value: number; warning?: string; tolerance?: ToleranceCheck };

/** One fresh-property reading, checked for sense and against the study's target, if it has one. */
export function checkFreshReading(
  property: FreshProperty,
  text: string | null | undefined,
  target?: { target: number; tolerance: number },
): FreshReadingCheck {
  if (text === null || text === undefined || text.trim() === "") return { status: "empty" };
  const field = FRESH_FIELDS[property];
  const value = parsePlainNumber(text);
  if (value === null) return { status: "refused", message: "Enter a number." };
  const [low, high] = field.impossible;
  if (value < low || value > high) return { status: "refused", message: `${field.label} must be between ${low} and ${high} ${field.unit}.` };
  const tolerance = target ? checkTolerance(target.target, value, target.tolerance) : undefined;
  const [plausibleLow, plausibleHigh] = field.plausible;
  const warning =
    value < plausibleLow || value > plausibleHigh
      ? `Unusual ${field.label.toLowerCase()}; check the reading and its unit (${field.unit}).`
      : undefined;
  return { status: "ok", value, ...(warning ? { warning } : {}), ...(tolerance ? { tolerance } : {}) };
}
