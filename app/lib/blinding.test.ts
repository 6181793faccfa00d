import { describe, expect, it } from "vitest";
import { blindingRefusal, blindingRefusals, namedIdentities, withheldIdentities, type Identity } from "./blinding";

// Invented names, as the demo's.
const study: Identity[] = [
  { kind: "lab", text: "Tessel Ready-Mix QC" },
  { kind: "person", text: "Bo Lindqvar" },
  { kind: "email", text: "bo.lindqvar@tessel.example" },
];

describe("text that names a lab of the study", () => {
  it("finds a name whatever its case and however its words are spaced", () => {
    expect(namedIdentities("asked tessel ready-mix qc twice", study)).toEqual([study[0]]);
    expect(namedIdentities("per BO\n  LINDQVAR's worksheet", study)).toEqual([study[1]]);
    expect(namedIdentities("mail bo.lindqvar@tessel.example.", study)).toEqual([study[2]]);
  });

  it("matches whole words only", () => {
    expect(namedIdentities("Bo Lindqvarsson checked it", study)).toEqual([]);
    expect(namedIdentities("Tessel Ready-Mix QCA lab", study)).toEqual([]);
    expect(namedIdentities("xbo.lindqvar@tessel.example", study)).toEqual([]);
    expect(namedIdentities("Lab L07 confirmed the counts.", study)).toEqual([]);
  });

  it("treats regular-expression characters in a name as plain text", () => {
    expect(namedIdentities("Lab (North) + Co confirmed", [{ kind: "lab", text: "Lab (North) + Co" }])).toHaveLength(1);
    expect(namedIdentities("Lab North Co", [{ kind: "lab", text: "Lab (North) + Co" }])).toEqual([]);
  });

  it("says what to remove and how to name the lab instead", () => {
    expect(blindingRefusal("Bo Lindqvar of Tessel Ready-Mix QC confirmed", study)).toBe(
      "Reviewers see labs by code only: remove the lab “Tessel Ready-Mix QC”, the person “Bo Lindqvar”, and name the lab by its code (e.g. L04).",
    );
    expect(blindingRefusal("L07 confirmed", study)).toBeNull();
    expect(blindingRefusals({ question: "Ask Bo Lindqvar", statistic: "h = 2.5" }, study)).toEqual({ question: [expect.stringContaining("Bo Lindqvar")] });
    expect(blindingRefusals({ reason: "L07" }, study)).toBeNull();
  });

  it("withholds the names in older text", () => {
    expect(withheldIdentities("Bo Lindqvar (bo.lindqvar@tessel.example) confirmed", study)).toBe("[withheld] ([withheld]) confirmed");
  });
});
