import { describe, expect, it } from "vitest";
import { parseCellList } from "./cells";
import { publicationCheck } from "./publication";
import { decisionRefusal, reviewRefusal } from "./write-rules";

describe("publication rule", () => {
  it("waits for every assigned reviewer, counting an abstention as a vote", () => {
    const check = publicationCheck([1, 2, 3], [
      { reviewerId: 1, choice: "approve", answer: null },
      { reviewerId: 2, choice: "abstain", answer: null },
    ]);
    expect(check.allowed).toBe(false);
    expect(check.awaited).toEqual([3]);
  });
  it("needs an answer to every objection, and a not-upheld answer lets it through", () => {
    const votes = [
      { reviewerId: 1, choice: "approve" as const, answer: null },
      { reviewerId: 2, choice: "object" as const, answer: null },
    ];
    expect(publicationCheck([1, 2], votes).problems).toEqual(["1 objection has no answer yet."]);
    expect(publicationCheck([1, 2], [votes[0]!, { ...votes[1]!, answer: "not_upheld" }]).allowed).toBe(true);
    expect(publicationCheck([1, 2], [votes[0]!, { ...votes[1]!, answer: "upheld" }]).allowed).toBe(false);
  });
  it("refuses with no reviewer at all", () => {
    expect(publicationCheck([], []).allowed).toBe(false);
  });
});

describe("write rules", () => {
  it("make a published study read-only", () => {
    expect(decisionRefusal("published")).toMatch(/read-only/);
    expect(reviewRefusal("published")).toMatch(/read-only/);
    expect(decisionRefusal("checking")).toBeNull();
    expect(reviewRefusal("in_review")).toBeNull();
  });
});

describe("cell lists", () => {
  it("reads lab:material:response items and rejects anything else", () => {
    expect(parseCellList("L01:M3:holes, L08:M2:surface,L01:M3:holes")).toEqual({
      cells: [
        { lab: "L01", material: "M3", response: "holes" },
        { lab: "L08", material: "M2", response: "surface" },
      ],
    });
    expect(parseCellList("")).toEqual({ cells: [] });
    expect(parseCellList("L01:M3")).toHaveProperty("error");
    expect(parseCellList("L01:M3:<script>")).toHaveProperty("error");
  });
});
