import { describe, expect, it } from "vitest";
import { isInputError } from "./problems";

describe("isInputError", () => {
  it("separates damaged input from groups that are only too thin", () => {
    expect(isInputError({ code: "non-finite-value", message: "" })).toBe(true);
    expect(isInputError({ code: "missing-column", message: "" })).toBe(true);
    expect(isInputError({ code: "duplicate-replicate", message: "" })).toBe(true);
    expect(isInputError({ code: "too-few-labs", message: "" })).toBe(false);
    expect(isInputError({ code: "too-few-replicates", message: "" })).toBe(false);
    expect(isInputError({ code: "excluded-cell-not-found", message: "" })).toBe(false);
  });
});
