import { describe, expect, it } from "vitest";
import { randomRunOrder } from "./run-order";

describe("randomRunOrder", () => {
  it("is a permutation of the runs", () => {
    expect([...randomRunOrder(12, 42)].sort((a, b) => a - b)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12]);
  });

  it("gives the same order for the same seed, and other orders for other seeds", () => {
    expect(randomRunOrder(8, 1169)).toEqual(randomRunOrder(8, 1169));
    const orders = new Set(Array.from({ length: 20 }, (_, seed) => randomRunOrder(8, seed).join(",")));
    expect(orders.size).toBeGreaterThan(15);
  });

  it("puts every run in every position about equally often over many seeds", () => {
    const firstPosition = new Array<number>(8).fill(0);
    for (let seed = 0; seed < 8000; seed++) firstPosition[randomRunOrder(8, seed)[0]! - 1]!++;
    for (const count of firstPosition) expect(Math.abs(count - 1000)).toBeLessThan(150);
  });
});
