import { describe, expect, it } from "vitest";
import { memoize } from "./memoize";

describe("memoize", () => {
  it("computes once per distinct arguments, null results included", () => {
    let calls = 0;
    const square = memoize((x: number, y: number) => {
      calls++;
      return x === 0 ? null : x * y;
    });
    expect(square(2, 3)).toBe(6);
    expect(square(2, 3)).toBe(6);
    expect(square(0, 3)).toBeNull();
    expect(square(0, 3)).toBeNull();
    expect(square(3, 2)).toBe(6);
    expect(calls).toBe(3);
  });
});
