/**
 * Checks of one typed result value against its response. The same function
 * runs beside the field in the browser and again on the server, so both
 * refuse the same values with the same words.
 */
import { parsePlainNumber } from "~/lib/plain-number";
import { countOf } from "~/lib/format";

export type ResponseRule = {
  name: string;
  unit: string;
  kind: "count" | "continuous";
  decimals: number;
  plausibleMin: number | null;
  plausibleMax: number | null;
};

export type ValueCheck =
  | { status: "empty" }
  | { status: "refused"; message: string }
  | { status: "ok"; value: number; warning?: string };

// The number grammar has its own home, shared with the results files' readers.
export { parsePlainNumber };

function plausibleRange(rule: ResponseRule) {
  const unit = rule.unit ? ` ${rule.unit}` : "";
  return `${rule.plausibleMin ?? "…"} to ${rule.plausibleMax ?? "…"}${unit}`;
}

/** Whether a value lies outside the response's plausible range: submitting it asks for a second look. */
export function outsidePlausibleRange(rule: Pick<ResponseRule, "plausibleMin" | "plausibleMax">, value: number) {
  return (rule.plausibleMin !== null && value < rule.plausibleMin) || (rule.plausibleMax !== null && value > rule.plausibleMax);
}

/**
 * Counts are whole numbers of at least 0; anything else is refused. A value
 * outside the study's plausible range is kept with a warning, since a true
 * but unusual reading must reach the coordinator.
 */
export function checkResultValue(rule: ResponseRule, input: string | number | null | undefined): ValueCheck {
  if (input === null || input === undefined || (typeof input === "string" && input.trim() === "")) return { status: "empty" };
  const value = typeof input === "number" ? input : parsePlainNumber(input);
  if (value === null || !Number.isFinite(value)) return { status: "refused", message: "Enter a number, such as 12 or 4.5." };
  if (rule.kind === "count") {
    if (!Number.isInteger(value)) return { status: "refused", message: "A count is a whole number, such as 12." };
    if (value < 0) return { status: "refused", message: "A count cannot be negative." };
  }
  if (outsidePlausibleRange(rule, value)) return { status: "ok", value, warning: `Unusual: outside the plausible ${plausibleRange(rule)}. Check it; submitting asks you to confirm it.` };
  if (rule.kind === "continuous" && decimalsOf(input) > rule.decimals) {
    return { status: "ok", value, warning: `The study reports ${rule.name.toLowerCase()} to ${countOf(rule.decimals, "decimal place")}.` };
  }
  return { status: "ok", value };
}

function decimalsOf(input: string | number) {
  const text = String(input).trim();
  const point = text.indexOf(".");
  return point < 0 ? 0 : text.length - point - 1;
}

const ISO_DATE = /^\d{4}-\d{2}-\d{2}$/;

/** No test of a study run through this product predates it by decades: earlier dates are typing slips (common practice of data checks). */
export const EARLIEST_TEST_DATE = "1990-01-01";

/** A test date as YYYY-MM-DD that exists on the calendar, from 1990 to today and not after the study's end, or a message. */
export function checkTestDate(
  text: string | null | undefined,
  today = new Date(),
  { studyEnd = null }: { studyEnd?: string | null } = {},
): { ok: true; value: string | null } | { ok: false; message: string } {
  const trimmed = (text ?? "").trim();
  if (trimmed === "") return { ok: true, value: null };
  const date = new Date(`${trimmed}T00:00:00Z`);
  if (!ISO_DATE.test(trimmed) || Number.isNaN(date.getTime()) || date.toISOString().slice(0, 10) !== trimmed) {
    return { ok: false, message: "Enter the test date as YYYY-MM-DD." };
  }
  if (trimmed < EARLIEST_TEST_DATE) return { ok: false, message: `The test date is before ${EARLIEST_TEST_DATE}; check the year.` };
  // A day of slack for time zones: a lab ahead of the server may already be on tomorrow.
  if (date.getTime() > today.getTime() + 36 * 3600 * 1000) return { ok: false, message: "The test date is in the future." };
  if (studyEnd && trimmed > studyEnd) return { ok: false, message: `The test date is after the study's end (${studyEnd}).` };
  return { ok: true, value: trimmed };
}
