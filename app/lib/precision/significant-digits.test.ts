import { describe, expect, it } from "vitest";
import { formatSignificant, roundSignificant, STATEMENT_SIGNIFICANT_DIGITS } from "./significant-digits";

// ASTM E691: precision statements give two or three significant digits; the statement uses three.
describe("the statement's rounding rule", () => {
  it("is three significant digits", () => {
    expect(STATEMENT_SIGNIFICANT_DIGITS).toBe(3);
  });

  it("rounds to significant digits whatever the magnitude", () => {
    expect(roundSignificant(0.0123456)).toBe(0.0123);
    expect(roundSignificant(1.23456)).toBe(1.23);
    expect(roundSignificant(12345.6)).toBe(12300);
    expect(roundSignificant(2.345, 2)).toBe(2.3);
    expect(roundSignificant(0)).toBe(0);
  });

  it("writes trailing zeros that are significant", () => {
    expect(formatSignificant(1.2)).toBe("1.20");
    expect(formatSignificant(0.5)).toBe("0.500");
    expect(formatSignificant(1234)).toBe("1230");
    expect(formatSignificant(0.0098765)).toBe("0.00988");
    expect(formatSignificant(99.96)).toBe("100");
    expect(formatSignificant(null)).toBe("—");
  });
});
