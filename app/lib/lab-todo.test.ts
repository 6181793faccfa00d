import { describe, expect, it } from "vitest";
import { type LabStudyFacts, labTodoItems } from "./lab-todo";

const facts = (over: Partial<LabStudyFacts> = {}): LabStudyFacts => ({
  studyId: 2,
  studyState: "testing",
  enrollmentState: "accepted",
  enrollmentDeadline: "2026-08-14",
  resultsDue: "2026-10-30",
  replicatesPerCell: 3,
  responseCount: 2,
  invitation: null,
  shipment: { status: "received", shippedOn: "2026-09-01" },
  materials: [
    { id: 5, code: "M1", batchRecorded: true, valuesEntered: 6, cellsSubmitted: 2 },
    { id: 6, code: "M2", batchRecorded: true, valuesEntered: 4, cellsSubmitted: 0 },
  ],
  openQueries: 0,
  ...over,
});

describe("what is waiting for a lab", () => {
  it("asks an invited lab to accept, with the address the link went to and the enrollment deadline", () => {
    const items = labTodoItems(facts({ studyState: "recruiting", enrollmentState: "invited", invitation: { email: "lab@example.org", expiresOn: "2026-08-20" } }));
    expect(items).toEqual([
      {
        kind: "accept",
        title: "Accept the invitation",
        detail: "Answer here, or with the link in the invitation sent to lab@example.org; either works until 2026-08-20.",
        due: "2026-08-14",
        links: [{ to: "/lab/studies/2", label: "About the study" }],
      },
    ]);
  });

  it("counts drafts as entered: 4 of 6 values of M2 still make an entry to finish, not a submission", () => {
    const items = labTodoItems(facts());
    expect(items.map((i) => i.kind)).toEqual(["enter"]);
    expect(items[0]!.detail).toBe("10 of 12 values entered, drafts included.");
    expect(items[0]!.links).toEqual([{ to: "/lab/studies/2/results/6", label: "Results of M2 (4 of 6)" }]);
  });

  it("lists open queries after testing, and nothing else", () => {
    const items = labTodoItems(facts({ studyState: "checking", openQueries: 2 }));
    expect(items).toEqual([{ kind: "query", title: "Answer 2 queries", detail: "The coordinator asks about your lab's data.", due: null, links: [{ to: "/lab/queries", label: "Answer them on the queries page" }] }]);
  });

  it("shows nothing to a lab that declined or was withdrawn", () => {
    expect(labTodoItems(facts({ enrollmentState: "withdrawn", openQueries: 1 }))).toEqual([]);
    expect(labTodoItems(facts({ enrollmentState: "declined" }))).toEqual([]);
  });
});
