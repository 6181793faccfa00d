/**
 * Numeric query parameters: a whole number written in plain digits and
 * within range, or null (the page then uses its default). `1e20`, `-1`,
 * `2.5`, `0x10` and numbers past `max` are all ignored, never passed on.
 */
export function wholeNumberParam(search: URLSearchParams, name: string, { min = 1, max = 1_000_000 }: { min?: number; max?: number } = {}) {
  const raw = search.get(name)?.trim();
  if (!raw || !/^\d{1,9}$/.test(raw)) return null;
  const value = Number(raw);
  return value >= min && value <= max ? value : null;
}
