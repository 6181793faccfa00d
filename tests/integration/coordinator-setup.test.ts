import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { auditEvents, freshPropertyTargets, materials, responses, studies, studyCoordinators, studyReviewers, users } from "~/db/schema";
import * as newStudy from "~/routes/studies/new";
import * as setup from "~/routes/studies/study/setup";
import { createStudyAs, enrollDemoLabs, postMultipart, STUDY_FIELDS } from "../support/coordinator";
import { demoCookie, demoStudy, useDemoDatabase } from "../support/demo";
import { readReply } from "../support/replies";
import { call, get, post } from "../support/routes";

let coordinator: string;
let study: typeof studies.$inferSelect;

beforeAll(async () => {
  await useDemoDatabase();
  coordinator = await demoCookie("coordinator@ringbatch.example");
  study = await createStudyAs(coordinator);
});

const setupPath = () => `/studies/${study.id}/setup`;
const act = async (fields: Record<string, string>, cookie = coordinator) => readReply(await call(setup.action, post(setupPath(), fields, cookie), { studyId: String(study.id) }));
const reload = async () => (study = (await db.query.studies.findFirst({ where: eq(studies.id, study.id) }))!);

describe("creating a study", () => {
  it("from the float finishing template: two count responses and the usual fresh-property tolerances", async () => {
    const rows = await db.select().from(responses).where(eq(responses.studyId, study.id));
    expect(rows.map((r) => [r.key, r.kind, r.decimals])).toEqual([
      ["holes", "count", 0],
      ["surface", "count", 0],
    ]);
    const targets = await db.select().from(freshPropertyTargets).where(eq(freshPropertyTargets.studyId, study.id));
    // ASTM C94 (from memory, reference/critical-values.md): slump over 50 through 100 mm ± 25 mm; air ± 1.5 points.
    expect(targets.find((t) => t.property === "slump")).toMatchObject({ target: 75, tolerance: 25 });
    expect(targets.find((t) => t.property === "air_content")).toMatchObject({ target: 6, tolerance: 1.5 });
    expect(study).toMatchObject({ state: "draft", targetSurfaceRating: 2, replicatesPerCell: 3 });
  });

  it("as a custom test method without responses, and sends the coordinator to its setup", async () => {
    const outcome = await call(newStudy.action, post("/studies/new", { ...STUDY_FIELDS, template: "custom", code: "SL-2027-1", testMethod: "Slump flow", targetSurfaceRating: "" }, coordinator));
    expect(outcome.status).toBe(302);
    const custom = await demoStudy("SL-2027-1");
    expect(outcome.headers.get("Location")).toBe(`/studies/${custom.id}/setup`);
    expect(await db.select().from(responses).where(eq(responses.studyId, custom.id))).toEqual([]);
    expect(custom.targetSurfaceRating).toBeNull();
  });

  it.each([
    ["code", { code: "no spaces!" }, "Use 2–30 letters"],
    ["code", { code: STUDY_FIELDS.code }, "Another study already has this code."],
    ["title", { title: " " }, "Enter a title."],
    ["testMethod", { testMethod: "" }, "Name the test method."],
    ["replicatesPerCell", { replicatesPerCell: "1" }, "at least 2 replicates"],
    ["replicatesPerCell", { replicatesPerCell: "2.5" }, "whole number"],
    ["significanceLevel", { significanceLevel: "0.5" }, "between 0.0005 and 0.1"],
    ["targetSurfaceRating", { targetSurfaceRating: "4" }, "1, 2 or 3"],
    ["enrollmentDeadline", { enrollmentDeadline: "next week" }, "YYYY-MM-DD"],
    ["shipDate", { shipDate: "2027-01-01" }, "Ship after the enrollment deadline."],
    ["resultsDue", { resultsDue: "2027-02-10" }, "Results are due after the materials ship."],
    ["notes", { notes: "x".repeat(2001) }, "2000 characters"],
    ["template", { template: "other" }, "Choose a template."],
  ])("refuses a bad %s beside the field and keeps what was typed", async (field, change, message) => {
    const fields = { ...STUDY_FIELDS, code: "FF-2027-NEW", ...change };
    const outcome = await readReply(await call(newStudy.action, post("/studies/new", fields, coordinator)));
    expect(outcome.status).toBe(400);
    expect(outcome.errors[field]).toContain(message);
    expect(outcome.values.title).toBe(fields.title);
  });

  it("is for coordinators only", async () => {
    for (const email of ["analyst1@ringbatch.example", "reviewer1@ringbatch.example", "admin@ringbatch.example"]) {
      expect((await call(newStudy.action, post("/studies/new", STUDY_FIELDS, await demoCookie(email)))).status).toBe(404);
    }
  });
});

describe("the setup page", () => {
  it("shows the setup to its coordinator, and 404 to someone outside the study", async () => {
    const outcome = await call(setup.loader, get(setupPath(), coordinator), { studyId: String(study.id) });
    expect(outcome.status).toBe(200);
    expect(outcome.data.setup.responses).toHaveLength(2);
    expect(outcome.data.moves.map((m: { to: string }) => m.to)).toEqual(["recruiting", "cancelled"]);
    expect((await call(setup.loader, get(setupPath(), await demoCookie("analyst1@ringbatch.example")), { studyId: String(study.id) })).status).toBe(404);
    expect((await act({ intent: "study", ...STUDY_FIELDS }, await demoCookie("admin@ringbatch.example"))).status).toBe(404);
  });

  it("saves the study's details, with errors beside the fields", async () => {
    const saved = await act({ intent: "study", ...STUDY_FIELDS, title: "Finishability trial, round 2" });
    expect(saved.done).toBe("Study details saved.");
    expect((await reload()).title).toBe("Finishability trial, round 2");
    const refused = await act({ intent: "study", ...STUDY_FIELDS, code: "FF-2026-A", replicatesPerCell: "0" });
    expect(refused.status).toBe(400);
    expect(refused.errors.replicatesPerCell).toContain("at least 2");
    const duplicate = await act({ intent: "study", ...STUDY_FIELDS, code: "FF-2026-A" });
    expect(duplicate.errors.code).toBe("Another study already has this code.");
    expect((await reload()).code).toBe(STUDY_FIELDS.code);
  });

  const response = { intent: "response-add", key: "bleed", name: "Bleed water", unit: "mL", kind: "continuous", decimals: "1", plausibleMin: "0", plausibleMax: "50" };

  it("adds and removes responses", async () => {
    expect((await act(response)).done).toBe("Response Bleed water added.");
    const row = (await db.query.responses.findFirst({ where: and(eq(responses.studyId, study.id), eq(responses.key, "bleed")) }))!;
    expect(row).toMatchObject({ kind: "continuous", decimals: 1, plausibleMin: 0, plausibleMax: 50, sortOrder: 2 });
    expect((await act({ intent: "response-remove", id: String(row.id) })).done).toBe("Response removed.");
    expect(await db.query.responses.findFirst({ where: eq(responses.id, row.id) })).toBeUndefined();
    expect((await act({ intent: "response-remove", id: String(row.id) })).errors.form).toBe("That response is not part of this study.");
  });

  it.each([
    ["key", { key: "Holes Count" }, "lower-case letters"],
    ["key", { key: "holes" }, "already has a response with this key"],
    ["name", { name: "" }, "Name the response."],
    ["kind", { kind: "ordinal" }, "count or continuous"],
    ["decimals", { decimals: "7" }, "0 to 6 decimals"],
    ["decimals", { kind: "count", decimals: "1" }, "Counts have 0 decimals."],
    ["plausibleMin", { plausibleMin: "low" }, "lowest plausible value as a number"],
    ["plausibleMax", { plausibleMax: "0" }, "must be above the lowest"],
  ])("refuses a response with a bad %s", async (field, change, message) => {
    const outcome = await act({ ...response, ...change });
    expect(outcome.status).toBe(400);
    expect(outcome.errors[field]).toContain(message);
    // A field left blank comes back blank (Conform leaves it out of the typed values).
    expect(outcome.values.name ?? "").toBe({ ...response, ...change }.name);
  });

  it("takes the slump target in inches, stores millimetres, and fills the usual tolerance", async () => {
    const outcome = await act({ intent: "targets", slumpTarget: "3", slumpUnit: "in", slumpTolerance: "", airTarget: "5.5", airTolerance: "" });
    expect(outcome.done).toBe("Fresh-property targets saved.");
    const targets = await db.select().from(freshPropertyTargets).where(eq(freshPropertyTargets.studyId, study.id));
    // 1 in = 25.4 mm exactly (NIST SP 811); C94 (from memory): over 2 through 4 in ± 1 in.
    expect(targets.find((t) => t.property === "slump")!.target).toBeCloseTo(76.2, 10);
    expect(targets.find((t) => t.property === "slump")!.tolerance).toBeCloseTo(25.4, 10);
    expect(targets.find((t) => t.property === "air_content")).toMatchObject({ target: 5.5, tolerance: 1.5 });
  });

  it.each([
    ["slumpTarget", { slumpTarget: "20" }, "at most 12 in"],
    ["slumpTarget", { slumpTarget: "four" }, "slump as a number"],
    ["slumpTolerance", { slumpTolerance: "-1" }, "A tolerance is above 0."],
    ["slumpUnit", { slumpUnit: "cm" }, "Choose mm or in."],
    ["airTarget", { airTarget: "16" }, "between 0 and 15 %"],
    ["airTolerance", { airTolerance: "0" }, "A tolerance is above 0."],
  ])("refuses fresh-property targets with a bad %s", async (field, change, message) => {
    const before = await db.select().from(freshPropertyTargets).where(eq(freshPropertyTargets.studyId, study.id));
    const outcome = await act({ intent: "targets", slumpTarget: "3", slumpUnit: "in", slumpTolerance: "", airTarget: "6", airTolerance: "", ...change });
    expect(outcome.status).toBe(400);
    expect(outcome.errors[field]).toContain(message);
    expect(await db.select().from(freshPropertyTargets).where(eq(freshPropertyTargets.studyId, study.id))).toEqual(before);
  });

  it("attaches a PDF protocol and refuses other files, empty forms and oversized files", async () => {
    const upload = async (bytes: BlobPart, name: string) => {
      const form = new FormData();
      form.set("protocol", new File([bytes], name));
      return readReply(await call(setup.action, postMultipart(setupPath(), form, coordinator), { studyId: String(study.id) }));
    };
    const pdf = await upload("%PDF-1.4\n% a tiny test file\n", "protocol.pdf");
    expect(pdf.done).toBe("Protocol protocol.pdf attached.");
    expect((await reload()).protocolAttachmentId).not.toBeNull();
    const png = await upload(new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0]), "disguised.pdf");
    expect(png.status).toBe(400);
    expect(png.errors.protocol).toContain("not a PDF file");
    const empty = await readReply(await call(setup.action, postMultipart(setupPath(), new FormData(), coordinator), { studyId: String(study.id) }));
    expect(empty.errors.protocol).toBe("Choose a PDF file to upload.");
    const huge = await upload(new Uint8Array(10 * 1024 * 1024 + 1), "huge.pdf");
    expect(huge.errors.protocol).toBe("The file is larger than 10 MB.");
  });

  it("lets the owner add and remove a co-coordinator and reviewers, with clear refusals", async () => {
    const [analyst] = await db.select().from(users).where(eq(users.email, "analyst1@ringbatch.example"));
    const [secondCoordinator] = await db.insert(users).values({ email: "coord2@ringbatch.example", name: "Second Coordinator", role: "coordinator" }).returning();
    expect((await act({ intent: "coordinator-add", email: "coord2@ringbatch.example" })).done).toBe("coord2@ringbatch.example added.");
    expect(await db.select().from(studyCoordinators).where(eq(studyCoordinators.studyId, study.id))).toHaveLength(1);
    expect((await act({ intent: "coordinator-add", email: "coord2@ringbatch.example" })).errors.email).toContain("already");
    expect((await act({ intent: "coordinator-add", email: "nobody@ringbatch.example" })).errors.email).toBe("No active account has this e-mail.");
    expect((await act({ intent: "coordinator-add", email: analyst!.email })).errors.email).toBe("This account is not a coordinator.");
    expect((await act({ intent: "coordinator-add", email: "coordinator@ringbatch.example" })).errors.email).toBe("The owner already coordinates this study.");
    expect((await act({ intent: "coordinator-add", email: "not an address" })).errors.email).toContain("e-mail address");
    expect((await act({ intent: "reviewer-add", email: "reviewer2@ringbatch.example" })).done).toBeDefined();
    expect((await act({ intent: "reviewer-add", email: "coord2@ringbatch.example" })).errors.email).toBe("This account is not a committee reviewer.");
    expect(await db.select().from(studyReviewers).where(eq(studyReviewers.studyId, study.id))).toHaveLength(1);

    // A co-coordinator edits the study but may not change who else is on it.
    const coCookie = await (await import("../support/routes")).sessionCookieFor(secondCoordinator!.id);
    expect((await act({ intent: "study", ...STUDY_FIELDS, title: "Edited by the co-coordinator" }, coCookie)).done).toBe("Study details saved.");
    expect((await act({ intent: "reviewer-add", email: "reviewer3@ringbatch.example" }, coCookie)).status).toBe(404);

    expect((await act({ intent: "coordinator-remove", id: String(secondCoordinator!.id) })).done).toBe("Removed.");
    expect((await act({ intent: "coordinator-remove", id: String(secondCoordinator!.id) })).errors.form).toBe("That person is not assigned to this study.");
    expect((await act({ intent: "study", ...STUDY_FIELDS }, coCookie)).status).toBe(404);
  });

  it("adds a material and opens its page; refuses a duplicate or bad code; removes it", async () => {
    const added = await act({ intent: "material-add", code: "m1", description: "Reference paving mix" });
    expect(added.status).toBe(302);
    const material = (await db.query.materials.findFirst({ where: and(eq(materials.studyId, study.id), eq(materials.code, "M1")) }))!;
    expect(added.headers.get("Location")).toBe(`/studies/${study.id}/materials/${material.id}`);
    expect((await act({ intent: "material-add", code: "M1", description: "" })).errors.code).toBe("This study already has a material with this code.");
    expect((await act({ intent: "material-add", code: "M 1!", description: "" })).errors.code).toContain("Use up to 12 letters");
    const second = await act({ intent: "material-add", code: "M2", description: "" });
    const m2 = (await db.query.materials.findFirst({ where: and(eq(materials.studyId, study.id), eq(materials.code, "M2")) }))!;
    expect(second.status).toBe(302);
    expect((await act({ intent: "material-remove", id: String(m2.id) })).done).toBe("Material removed.");
    expect((await act({ intent: "material-remove", id: "999999" })).errors.form).toBe("That material is not part of this study.");
  });

  it("refuses an unknown intent", async () => {
    const unknown = await act({ intent: "launch" });
    expect(unknown.status).toBe(400);
    expect(unknown.errors.intent).toBe("Unknown action.");
  });
});

describe("the study's lifecycle", () => {
  it("needs materials and 3 accepted labs before testing, warns below 6, and locks setup once testing", async () => {
    expect((await act({ intent: "transition", to: "testing" })).errors.to).toContain("cannot go from draft to testing");
    expect((await act({ intent: "transition", to: "recruiting" })).done).toBe("The study is now: Recruiting labs.");
    await reload();
    const tooFew = await act({ intent: "transition", to: "testing" });
    expect(tooFew.errors.to).toContain("at least 3 labs that have accepted; 0 have");
    await enrollDemoLabs(study.id, 3);
    const started = await act({ intent: "transition", to: "testing" });
    expect(started.done).toMatch(/^The study is now: Testing\. /);
    expect(started.done).toContain("Fewer than 6 labs (3 accepted)");
    await reload();
    expect(study.state).toBe("testing");
    const locked = await act(response("locked"));
    expect(locked.errors.key).toBe("Replicates, responses and materials are fixed once testing starts.");
    expect((await act({ intent: "transition", to: "in_review" })).errors.to).toContain("cannot go from testing to in review");
    expect((await act({ intent: "transition", to: "checking" })).done).toBe("The study is now: Checking data.");
    await reload();
    const audit = await db.select().from(auditEvents).where(and(eq(auditEvents.studyId, study.id), eq(auditEvents.action, "study_state_changed")));
    expect(audit.map((a) => (a.after as { state: string }).state)).toEqual(["recruiting", "testing", "checking"]);
  });

  it("refuses testing without materials even with enough labs", async () => {
    const bare = await createStudyAs(coordinator, { code: "FF-2027-BARE" });
    await db.update(studies).set({ state: "recruiting" }).where(eq(studies.id, bare.id));
    await enrollDemoLabs(bare.id, 6);
    const outcome = await readReply(await call(setup.action, post(`/studies/${bare.id}/setup`, { intent: "transition", to: "testing" }, coordinator), { studyId: String(bare.id) }));
    expect(outcome.errors.to).toBe("Add at least one material before testing starts.");
  });
});

function response(key: string) {
  return { intent: "response-add", key, name: "Locked", unit: "", kind: "count", decimals: "0", plausibleMin: "", plausibleMax: "" };
}
