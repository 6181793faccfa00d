import { describe, expect, it } from "vitest";
import { assignmentSchema, checksSchema, newRoundSchema } from "./round-forms";

const errorsOf = (result: { success: boolean; error?: { issues: { path: PropertyKey[]; message: string }[] } }) =>
  Object.fromEntries((result.error?.issues ?? []).map((issue) => [issue.path.join("."), issue.message]));

describe("newRoundSchema", () => {
  it("reads one to three materials, a code and a description per line", () => {
    const parsed = newRoundSchema.parse({ code: "pt-2027-1", title: "Spring", replicatesPerCell: "2", materials: "r1 Reference mix\n\nR2" });
    expect(parsed).toMatchObject({ code: "PT-2027-1", sourceStudyId: null, testMethod: "", resultsDue: null });
    expect(parsed.materials).toEqual([
      { code: "R1", description: "Reference mix" },
      { code: "R2", description: "" },
    ]);
  });
  it("refuses four materials, repeated codes and 4 replicates, each beside its field", () => {
    expect(errorsOf(newRoundSchema.safeParse({ code: "PT-1", title: "x", replicatesPerCell: "4", materials: "A\nB\nC\nD" }))).toEqual({
      replicatesPerCell: "A round takes 1 or 2 replicates per lab and material.",
      materials: "List one to three materials, one per line.",
    });
    expect(errorsOf(newRoundSchema.safeParse({ code: "PT-1", title: "x", replicatesPerCell: "1", materials: "A one\na two" }))).toEqual({ materials: "Give each material its own code." });
  });
});

describe("assignmentSchema", () => {
  const base = { intent: "assignment", materialId: "1", responseId: "2", assignedMethod: "consensus", sigmaMethod: "robust" };
  it("needs a reference value with its uncertainty, and a fixed σ_pt above 0", () => {
    expect(errorsOf(assignmentSchema.safeParse({ ...base, assignedMethod: "reference", referenceValue: "8,5" }))).toEqual({
      referenceUncertainty: "Enter the reference value's standard uncertainty (0 or more).",
    });
    expect(errorsOf(assignmentSchema.safeParse({ ...base, sigmaMethod: "fixed", fixedSigma: "0" }))).toEqual({ fixedSigma: "Enter a σ_pt greater than 0." });
    expect(assignmentSchema.parse({ ...base, assignedMethod: "reference", referenceValue: "8,5", referenceUncertainty: "0.2" })).toMatchObject({ referenceValue: 8.5, referenceUncertainty: 0.2 });
  });
});

describe("checksSchema", () => {
  const base = { intent: "checks", materialId: "1", responseId: "2" };
  it("reads pairs per line and single stability results", () => {
    expect(checksSchema.parse({ ...base, homogeneity: "14 15\n13;14\n", stability: "14\n13 15" })).toMatchObject({
      homogeneity: [
        [14, 15],
        [13, 14],
      ],
      stability: [14, 13, 15],
      justification: "",
    });
  });
  it("names the line that is not a pair of numbers", () => {
    expect(errorsOf(checksSchema.safeParse({ ...base, homogeneity: "14 15\n14" }))).toEqual({ homogeneity: 'Line 2: give the sample\'s two results, such as "12 13".' });
    expect(errorsOf(checksSchema.safeParse({ ...base, homogeneity: "14 15" }))).toEqual({ homogeneity: "Enter at least 2 samples (ISO 13528 asks for 10 or more), or none yet." });
  });
});
