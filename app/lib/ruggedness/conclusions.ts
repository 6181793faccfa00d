import { formatSigned } from "~/lib/format";
import type { EffectTest } from "./significance";

export interface FactorSettings {
  name: string;
  unit: string;
  low: string;
  high: string;
}

const signed = (x: number) => formatSigned(x, 2);
/** A setting with its unit, as the trade writes it: "20 min", "10°", "Operator A". */
export function settingText(value: string, unit: string): string {
  if (!unit) return value;
  return /^[°%′″]/.test(unit) ? `${value}${unit}` : `${value} ${unit}`;
}

/**
 * The plain conclusion for one factor (ASTM E1169, interpretation of results):
 * a factor whose effect is significant must be held more tightly than the
 * tested range; one whose effect is not may vary within the tested range;
 * without a test (single results, no dummy column) the half-normal plot decides.
 */
export function factorConclusion(factor: FactorSettings, effect: number, test: EffectTest | null, response: { name: string; unit: string }): string {
  const range = `${settingText(factor.low, factor.unit)} to ${settingText(factor.high, factor.unit)}`;
  const change = `going from ${settingText(factor.low, factor.unit)} to ${settingText(factor.high, factor.unit)} changed ${response.name.toLowerCase()} by ${signed(effect)} ${response.unit}`;
  if (!test) {
    return `${factor.name}: ${change}. With single results and no dummy column this effect cannot be tested; judge it on the half-normal plot.`;
  }
  if (test.significant) {
    return `${factor.name} matters: ${change}. Specify it more tightly than the tested range (${range}) and check again before the interlaboratory study.`;
  }
  return `Hold ${factor.name.toLowerCase()} within the tested range (${range}): inside it the effect (${signed(effect)} ${response.unit}) is within the test's own scatter.`;
}
