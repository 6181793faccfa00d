import { describe, expect, it } from "vitest";
import { parseCellList } from "./cells";
import { objectionStage, publicationCheck, type VoteFacts } from "./publication";
import { writeRefusal } from "~/lib/write-rules";

const vote = (reviewerId: number, choice: VoteFacts["choice"], more: Partial<VoteFacts> = {}): VoteFacts => ({ reviewerId, choice, answer: null, ...more });

describe("publication rule", () => {
  it("waits for every reviewer of the round, counting an abstention as a vote", () => {
    const check = publicationCheck([1, 2, 3], [vote(1, "approve"), vote(2, "abstain")]);
    expect(check.allowed).toBe(false);
    expect(check.awaited).toEqual([3]);
  });

  it("ignores votes of people outside the round", () => {
    expect(publicationCheck([1, 2], [vote(1, "approve"), vote(2, "approve"), vote(9, "object")]).allowed).toBe(true);
  });

  it("takes an objection through answer, reply and ruling before it stops standing in the way", () => {
    const others = [vote(1, "approve"), vote(2, "approve")];
    const objection = vote(3, "object");
    const stepsBlocking: [Partial<VoteFacts>, string][] = [
      [{}, "1 objection has no answer yet."],
      [{ answer: "not_upheld" }, "1 objection awaits its reviewer's reply to the answer."],
      [{ answer: "not_upheld", objectorReply: "maintained" }, "1 maintained objection awaits the chair's ruling."],
      [{ answer: "upheld" }, "An objection was upheld: revise the statement and start a new round."],
      [{ answer: "not_upheld", objectorReply: "maintained", ruling: "upheld" }, "An objection was upheld: revise the statement and start a new round."],
    ];
    for (const [more, problem] of stepsBlocking) {
      const check = publicationCheck([1, 2, 3], [...others, { ...objection, ...more }]);
      expect(check.allowed).toBe(false);
      expect(check.problems).toContain(problem);
    }
    expect(publicationCheck([1, 2, 3], [...others, { ...objection, answer: "not_upheld", objectorReply: "withdrawn" }]).allowed).toBe(true);
    expect(publicationCheck([1, 2, 3], [...others, { ...objection, answer: "not_upheld", objectorReply: "maintained", ruling: "not_upheld" }]).allowed).toBe(true);
  });

  // Two-thirds of the votes cast, abstentions not counted: the quorum this product states on the statement page.
  it("needs two-thirds approval of the votes cast", () => {
    const overruled = { answer: "not_upheld", objectorReply: "maintained", ruling: "not_upheld" } as const;
    // 2 approve, 1 overruled objection: 2/3 — enough.
    expect(publicationCheck([1, 2, 3], [vote(1, "approve"), vote(2, "approve"), vote(3, "object", overruled)]).allowed).toBe(true);
    // 1 approve, 2 overruled objections: 1/3 — not enough.
    const short = publicationCheck([1, 2, 3], [vote(1, "approve"), vote(2, "object", overruled), vote(3, "object", overruled)]);
    expect(short.allowed).toBe(false);
    expect(short.problems).toEqual(["Approval falls short of two-thirds of the votes cast (1 of 3)."]);
    // Everyone abstains: nobody approved.
    expect(publicationCheck([1, 2], [vote(1, "abstain"), vote(2, "abstain")]).allowed).toBe(false);
    expect(publicationCheck([1, 2, 3], [vote(1, "approve"), vote(2, "abstain"), vote(3, "object", { answer: "not_upheld", objectorReply: "withdrawn" })]).tally).toEqual({
      reviewers: 3, voted: 3, approve: 1, object: 0, abstain: 2, withdrawn: 1,
    });
  });

  it("refuses a round with no reviewer at all", () => {
    expect(publicationCheck([], []).allowed).toBe(false);
  });

  it("names where an objection stands", () => {
    expect(objectionStage(vote(1, "approve"))).toBeNull();
    expect(objectionStage(vote(1, "object", { answer: "not_upheld", objectorReply: "maintained" }))).toBe("awaiting_ruling");
  });
});

describe("write rules", () => {
  it("make a published study read-only", () => {
    expect(writeRefusal("decisions", "published")).toMatch(/read-only/);
    expect(writeRefusal("review", "published")).toMatch(/read-only/);
    expect(writeRefusal("decisions", "checking")).toBeNull();
    expect(writeRefusal("review", "in_review")).toBeNull();
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
