import { describe, expect, it } from "vitest";
import { asSentence, countOf, formatDate, formatDateTime, formatFixed, formatSigned, readsAsOneWord, todayIso } from "./format";

// ISO 8601 calendar dates (YYYY-MM-DD) and 24-hour times: the reference is the standard's own notation.
describe("dates on screen", () => {
  it("writes a date as ISO 8601 in UTC, whatever the input form", () => {
    expect(formatDate(new Date("2026-09-04T23:30:00Z"))).toBe("2026-09-04");
    expect(formatDate("2026-09-04")).toBe("2026-09-04");
    expect(formatDate(Date.UTC(2026, 0, 5, 1, 2))).toBe("2026-01-05");
  });

  it("writes a time in UTC with the zone named", () => {
    expect(formatDateTime(new Date("2026-09-04T14:05:59Z"))).toBe("2026-09-04 14:05 UTC");
    expect(formatDateTime("2026-12-31T00:00:00Z")).toBe("2026-12-31 00:00 UTC");
  });

  it("shows a dash for nothing or an unreadable value", () => {
    expect(formatDate(null)).toBe("—");
    expect(formatDateTime("not a date")).toBe("—");
  });

  it("knows today's UTC date", () => {
    expect(todayIso(new Date("2026-02-28T23:59:59Z"))).toBe("2026-02-28");
  });
});

describe("numbers and counts", () => {
  it("never writes a negative zero (IEEE 754 keeps the sign of zero; a reader should not see it)", () => {
    expect(formatFixed(-0.04, 1)).toBe("0.0");
    expect(formatFixed(-0, 2)).toBe("0.00");
    expect(formatFixed(-0.4, 0)).toBe("0");
    expect(formatFixed(-0.05, 1)).toBe("-0.1");
    expect(formatFixed(-1.25, 2)).toBe("-1.25");
    expect(formatFixed(0.04, 1)).toBe("0.0");
  });

  it("puts the noun in the plural unless the count is one", () => {
    expect(countOf(1, "row")).toBe("1 row");
    expect(countOf(0, "row")).toBe("0 rows");
    expect(countOf(3, "decimal place")).toBe("3 decimal places");
    expect(countOf(1, "decimal place")).toBe("1 decimal place");
    expect(countOf(2, "analysis", "analyses")).toBe("2 analyses");
  });
});

describe("signed figures", () => {
  it("writes the sign, with a true minus (U+2212), and none for a zero", () => {
    expect(formatSigned(1.254, 2)).toBe("+1.25");
    expect(formatSigned(-0.4, 2)).toBe("−0.40");
    expect(formatSigned(-0.001, 2)).toBe("0.00");
    expect(formatSigned(0, 1)).toBe("0.0");
  });
});

describe("cells that read as one word", () => {
  it("keeps codes, ISO dates and date-times whole, and lets sentences wrap", () => {
    expect(readsAsOneWord("FF-2026-A")).toBe(true);
    expect(readsAsOneWord("2026-09-04")).toBe(true);
    expect(readsAsOneWord("2026-09-04 14:05 UTC")).toBe(true);
    expect(readsAsOneWord("L07")).toBe(true);
    expect(readsAsOneWord("Finishability of bridge-deck mixtures")).toBe(false);
  });
});

describe("sentences", () => {
  it("adds a full stop only where the text has none", () => {
    expect(asSentence("What prompted it: h = 2.5")).toBe("What prompted it: h = 2.5.");
    expect(asSentence("What prompted it: h = 2.5. ")).toBe("What prompted it: h = 2.5.");
    expect(asSentence("Is it right?")).toBe("Is it right?");
    expect(asSentence("She said “yes.”")).toBe("She said “yes.”");
  });
});
