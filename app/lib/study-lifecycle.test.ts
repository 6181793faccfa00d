import { describe, expect, it } from "vitest";
import { STUDY_STATES } from "~/db/schema";
import { allowedNextStates, checkTransition, moveOwner } from "./study-lifecycle";
import { mayWrite, WRITE_RULES, type WriteKind, writeRefusal } from "./write-rules";

describe("study lifecycle rules", () => {
  it("follows draft → recruiting → testing → checking → in_review → published, with cancel before published", () => {
    const forward = ["draft", "recruiting", "testing", "checking", "in_review", "published"] as const;
    for (let i = 1; i < forward.length; i++) expect(allowedNextStates(forward[i - 1]!)).toContain(forward[i]);
    for (const state of STUDY_STATES.filter((s) => s !== "published" && s !== "cancelled")) expect(allowedNextStates(state)).toContain("cancelled");
    expect(allowedNextStates("published")).toEqual([]);
    expect(allowedNextStates("cancelled")).toEqual([]);
  });

  it("refuses testing without materials or with fewer than 3 accepted labs", () => {
    expect(checkTransition("recruiting", "testing", { materials: 0, acceptedLabs: 8 }).problems).toEqual(["Add at least one material before testing starts."]);
    expect(checkTransition("recruiting", "testing", { materials: 2, acceptedLabs: 2 }).allowed).toBe(false);
    expect(checkTransition("recruiting", "testing", { materials: 2, acceptedLabs: 3 }).allowed).toBe(true);
  });

  // E691 asks for at least 6 laboratories for a precision statement (from memory).
  it("warns below 6 labs and not at 6", () => {
    expect(checkTransition("recruiting", "testing", { materials: 1, acceptedLabs: 5 }).warnings).toHaveLength(1);
    expect(checkTransition("recruiting", "testing", { materials: 1, acceptedLabs: 6 }).warnings).toEqual([]);
  });

  it("refuses skipping a state", () => {
    expect(checkTransition("draft", "published", { materials: 1, acceptedLabs: 8 }).allowed).toBe(false);
    expect(checkTransition("draft", "testing", { materials: 1, acceptedLabs: 8 }).allowed).toBe(false);
  });

  it("never moves a study back to testing, and leaves review moves to the statement page", () => {
    for (const state of STUDY_STATES.filter((s) => s !== "recruiting")) expect(allowedNextStates(state)).not.toContain("testing");
    expect(allowedNextStates("in_review", "setup")).toEqual(["cancelled"]);
    expect(allowedNextStates("checking", "setup")).toEqual(["cancelled"]);
    expect(moveOwner("checking", "in_review")).toBe("statement");
    expect(moveOwner("in_review", "checking")).toBe("statement");
    expect(moveOwner("in_review", "published")).toBe("statement");
  });

  it("allows results only while testing, design only before, invitations while recruiting", () => {
    expect(STUDY_STATES.filter((s) => mayWrite("results", s))).toEqual(["testing"]);
    expect(STUDY_STATES.filter((s) => mayWrite("design", s))).toEqual(["draft", "recruiting"]);
    expect(STUDY_STATES.filter((s) => mayWrite("invitations", s))).toEqual(["recruiting"]);
    expect(writeRefusal("design", "testing")).toBe("Replicates, responses and materials are fixed once testing starts.");
  });

  it("refuses every kind of write once a study is published or cancelled", () => {
    for (const kind of Object.keys(WRITE_RULES) as WriteKind[]) {
      expect(writeRefusal(kind, "published")).toMatch(/read-only/);
      expect(writeRefusal(kind, "cancelled")).toMatch(/cancelled/);
    }
  });
});
