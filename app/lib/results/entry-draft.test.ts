import { describe, expect, it } from "vitest";
import { draftChanges, type EntryDraft, rebaseDraft } from "./entry-draft";

const draft = (values: Record<string, string>, versions: Record<string, number> = {}, more: Partial<EntryDraft> = {}): EntryDraft => ({
  values,
  testedOn: { 1: "2026-11-02", 2: "2026-11-02" },
  operator: { 1: "T. Ferrow", 2: "T. Ferrow" },
  fresh: { slump: "60" },
  batchedAt: "",
  versions,
  ...more,
});

describe("what an autosave sends", () => {
  it("only the replicates that changed, each with the version it was read at", () => {
    const base = draft({ "holes:1": "12", "holes:2": "" }, { "holes:1": 3 });
    const changes = draftChanges(base, { ...base, values: { "holes:1": "12", "holes:2": "14" } }, ["holes"], 2);
    expect(changes).toEqual({ rows: [{ response: "holes", replicate: 2, value: "14", testedOn: "2026-11-02", operator: "T. Ferrow", readVersion: 0 }], fresh: {} });
  });

  it("every response of a replicate whose date changed, and a changed fresh property alone", () => {
    const base = draft({ "holes:1": "12", "surface:1": "18" }, { "holes:1": 1, "surface:1": 2 });
    const next = { ...base, testedOn: { ...base.testedOn, 1: "2026-11-03" }, fresh: { slump: "65" } };
    const changes = draftChanges(base, next, ["holes", "surface"], 2);
    expect(changes.rows.map((r) => [r.response, r.replicate, r.readVersion])).toEqual([
      ["holes", 1, 1],
      ["surface", 1, 2],
    ]);
    expect(changes.fresh).toEqual({ slump: "65" });
  });
});

describe("folding the server's draft into the page", () => {
  it("takes the server's value where the person typed nothing, and the other person's value where they conflict", () => {
    const oldBase = draft({ "holes:1": "", "holes:2": "" });
    const mine = draft({ "holes:1": "14", "holes:2": "" });
    const newBase = draft({ "holes:1": "12", "holes:2": "9" }, { "holes:1": 1, "holes:2": 1 });
    expect(rebaseDraft(mine, oldBase, newBase, ["holes:1"]).values).toEqual({ "holes:1": "12", "holes:2": "9" });
    // Without a conflict, what the person typed stays.
    expect(rebaseDraft(mine, oldBase, newBase, []).values).toEqual({ "holes:1": "14", "holes:2": "9" });
    expect(rebaseDraft(mine, oldBase, newBase, []).versions).toEqual({ "holes:1": 1, "holes:2": 1 });
  });
});
