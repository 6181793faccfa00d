/**
 * Dates and times on every page read the same way: ISO dates (2026-09-04),
 * and times in UTC with the zone said (2026-09-04 14:05 UTC), so a lab in any
 * time zone and a committee reading later see the same record.
 */
const dateParts = new Intl.DateTimeFormat("en-CA", { timeZone: "UTC", year: "numeric", month: "2-digit", day: "2-digit" });
const timeParts = new Intl.DateTimeFormat("en-GB", { timeZone: "UTC", hour: "2-digit", minute: "2-digit", hourCycle: "h23" });

type When = Date | string | number;

const toDate = (when: When) => (when instanceof Date ? when : new Date(when));

/** 2026-09-04 (a stored ISO date string passes through unchanged). */
export function formatDate(when: When | null | undefined): string {
  if (when === null || when === undefined || when === "") return "—";
  if (typeof when === "string" && /^\d{4}-\d{2}-\d{2}$/.test(when)) return when;
  const date = toDate(when);
  return Number.isNaN(date.getTime()) ? "—" : dateParts.format(date);
}

/** 2026-09-04 14:05 UTC */
export function formatDateTime(when: When | null | undefined): string {
  if (when === null || when === undefined || when === "") return "—";
  const date = toDate(when);
  return Number.isNaN(date.getTime()) ? "—" : `${dateParts.format(date)} ${timeParts.format(date)} UTC`;
}

/** Today's date in UTC, as the date inputs and the date rules compare it. */
export function todayIso(now: Date = new Date()): string {
  return dateParts.format(now);
}

/**
 * A number with fixed decimals that never reads "-0.0": a value that rounds
 * to zero is zero, whatever its sign.
 */
export function formatFixed(value: number, decimals: number): string {
  const text = value.toFixed(decimals);
  return /^-0(\.0*)?$/.test(text) ? text.slice(1) : text;
}

/** "1 row", "3 rows": a count with its noun, plural when the count is not one (irregular plurals passed in). */
export function countOf(count: number, singular: string, plural = `${singular}s`): string {
  return `${count} ${count === 1 ? singular : plural}`;
}

/**
 * Whether a table cell's text is one word that must not split: a code
 * ("FF-2026-A", "L07"), an ISO date or a date and time. Longer text wraps as usual.
 */
export function readsAsOneWord(text: string): boolean {
  return /^\d{4}-\d{2}-\d{2}( \d{2}:\d{2} UTC)?$/.test(text) || (!/\s/.test(text) && text.length <= 24);
}

/** A signed figure, "+1.25" or "−0.40" (a true minus sign), and "0.00" without a sign when it rounds to zero. */
export function formatSigned(value: number, decimals: number): string {
  const text = formatFixed(Math.abs(value), decimals);
  if (Number(text) === 0) return text;
  return `${value > 0 ? "+" : "−"}${text}`;
}

/** Text as a sentence: its own closing stop kept, one added only when it has none (never a doubled full stop). */
export function asSentence(text: string): string {
  const trimmed = text.trim();
  return /[.!?…]["”’)]*$/.test(trimmed) ? trimmed : `${trimmed}.`;
}
