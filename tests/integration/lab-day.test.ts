import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { auditEvents, enrollments, invitations, labMembers, labs, studies, users } from "~/db/schema";
import { INVITATION_LIFETIME_MS } from "~/models/invitation.server";
import { hashToken } from "~/server/token-hash.server";
import { saveFreshProperties } from "~/models/batch.server";
import * as labHome from "~/routes/lab/index";
import * as batchPage from "~/routes/lab/study/batch-sheet";
import * as protocolPage from "~/routes/lab/study/protocol";
import * as entry from "~/routes/lab/study/result-entry";
import * as newStudy from "~/routes/studies/new";
import * as setupPage from "~/routes/studies/study/setup";
import * as studyResults from "~/routes/studies/study/results";
import { DEMO_LABS } from "../../seed/demo-data";
import { demoCookie, demoEnrollment, demoStudy, useDemoStudyInTesting } from "../support/demo";
import { entryChanges } from "../support/entry-draft";
import { errorsOf, toastOf } from "../support/replies";
import { call, get, post } from "../support/routes";

let studyId: string;
let f1: string;
let f2: string;

beforeAll(async () => {
  ({ studyId, f1, f2 } = await useDemoStudyInTesting());
});

const enrollmentOf = (labIndex: number) => demoEnrollment(Number(studyId), labIndex);

type Todo = { kind: string; title: string; detail: string; due: string | null; links: { to: string; label: string }[] };

describe("the lab home as a to-do list", () => {
  it("counts a lab's drafts: F1 fully drafted is ready to submit, F2 still to enter, both to batch", async () => {
    // analyst5 (demo lab index 4) holds a complete draft of F1 in FF-2026-B: 2 responses × 3 replicates.
    const home = await call(labHome.loader, get("/lab", await demoCookie("analyst5@ringbatch.example")));
    expect(home.status).toBe(200);
    const study = home.data.enrollments.find((e: { studyCode: string }) => e.studyCode === "FF-2026-B");
    const todo: Todo[] = study.todo;
    expect(todo.map((t) => t.kind)).toEqual(["batch", "enter", "submit"]);
    const enter = todo.find((t) => t.kind === "enter")!;
    expect(enter.detail).toBe("6 of 12 values entered, drafts included.");
    expect(enter.links).toEqual([{ to: `/lab/studies/${studyId}/results/${f2}`, label: "Results of F2 (0 of 6)" }]);
    expect(enter.due).toBe("2027-01-29");
    expect(todo.find((t) => t.kind === "submit")!.links).toEqual([{ to: `/lab/studies/${studyId}/results/${f1}`, label: "Submit F1" }]);
    expect(todo.find((t) => t.kind === "batch")!.links.map((l) => l.label)).toEqual(["Batch sheet F1", "Batch sheet F2"]);
  });

  it("asks a lab whose shipment is on its way to confirm receipt", async () => {
    const shipped = await db.query.enrollments.findFirst({ where: and(eq(enrollments.studyId, Number(studyId)), eq(enrollments.labCode, "L03")) });
    const lab = await db.query.labs.findFirst({ where: eq(labs.id, shipped!.labId) });
    const analystIndex = DEMO_LABS.findIndex((l) => l.name === lab!.name);
    const home = await call(labHome.loader, get("/lab", await demoCookie(`analyst${analystIndex + 1}@ringbatch.example`)));
    const todo: Todo[] = home.data.enrollments.find((e: { studyCode: string }) => e.studyCode === "FF-2026-B").todo;
    expect(todo[0]).toMatchObject({ kind: "receipt", title: "Confirm receipt of the materials", links: [{ to: `/lab/studies/${studyId}/receipt`, label: "Confirm receipt" }] });
  });

  it("shows nothing waiting in a published study", async () => {
    const home = await call(labHome.loader, get("/lab", await demoCookie("analyst5@ringbatch.example")));
    expect(home.data.enrollments.find((e: { studyCode: string }) => e.studyCode === "FF-2025-D").todo).toEqual([]);
  });
});

describe("answering an invitation on the lab home", () => {
  // analyst10's lab takes no part in FF-2026-B (seed/seed.ts enrolls the first eight labs).
  const ANALYST = "analyst10@ringbatch.example";
  async function invitedLab() {
    const [lab] = await db.select({ id: labMembers.labId }).from(labMembers).innerJoin(users, eq(users.id, labMembers.userId)).where(eq(users.email, ANALYST));
    // As the coordinator's invitation leaves it (inviting is open only while recruiting; no demo study recruits): enrollment invited, a link for 14 days.
    const [enrollment] = await db.insert(enrollments).values({ studyId: Number(studyId), labId: lab!.id, state: "invited", invitedAt: new Date() }).returning();
    await db.insert(invitations).values({ enrollmentId: enrollment!.id, email: ANALYST, tokenHash: hashToken("lab-home-answer"), expiresAt: new Date(Date.now() + INVITATION_LIFETIME_MS) });
    return enrollment!;
  }

  it("lets a signed-in analyst of the invited lab accept in the app, with a lab code drawn as the e-mail link would", async () => {
    const enrollment = await invitedLab();
    const cookie = await demoCookie(ANALYST);
    const home = await call(labHome.loader, get("/lab", cookie));
    const study = home.data.enrollments.find((e: { studyCode: string }) => e.studyCode === "FF-2026-B");
    expect(study.todo.map((t: Todo) => t.kind)).toEqual(["accept"]);
    expect(study.todo[0].detail).toMatch(/^Answer here, or with the link in the invitation sent to /);

    // Another lab's analyst cannot answer it.
    const stranger = await call(labHome.action, post("/lab", { intent: "accept", enrollmentId: String(enrollment.id) }, await demoCookie("analyst1@ringbatch.example")));
    expect(stranger.status).toBe(409);
    expect(errorsOf(stranger).form).toBe("Your lab has no invitation to answer here.");

    const accepted = await call(labHome.action, post("/lab", { intent: "accept", enrollmentId: String(enrollment.id) }, cookie));
    expect(await toastOf(accepted)).toBe("Invitation accepted. Your lab code is shown beside the study.");
    const after = (await db.query.enrollments.findFirst({ where: eq(enrollments.id, enrollment.id) }))!;
    expect(after.state).toBe("accepted");
    expect(after.labCode).toMatch(/^L\d{2}$/);

    const again = await call(labHome.action, post("/lab", { intent: "decline", enrollmentId: String(enrollment.id) }, cookie));
    expect(errorsOf(again).form).toBe("This invitation has already been answered.");
  });
});

describe("the protocol and targets page", () => {
  it("gives the lab the study's targets, specimen volume and coordinator", async () => {
    const page = await call(protocolPage.loader, get(`/lab/studies/${studyId}/protocol`, await demoCookie("analyst5@ringbatch.example")), { studyId });
    expect(page.status).toBe(200);
    expect(page.data.targets.slump).toEqual({ target: 75, tolerance: 25 });
    expect(page.data.study).toMatchObject({ targetSurfaceRating: 2, specimenVolumeM3: 0.0425, wastePercent: 10 });
    expect(page.data.coordinator.email).toBe("coordinator@ringbatch.example");
  });
});

describe("the batch sheet for the mixer", () => {
  const path = (materialId: string, query = "") => `/lab/studies/${studyId}/batch/${materialId}${query}`;

  it("splits the batch into equal mixes that fit the lab's mixer, and remembers the mixer for the next sheet", async () => {
    const cookie = await demoCookie("analyst5@ringbatch.example");
    const page = await call(batchPage.loader, get(path(f1), cookie), { studyId, materialId: f1 });
    expect(page.data.study).toMatchObject({ specimenVolumeM3: 0.0425, wastePercent: 10 });
    const moisture = Object.fromEntries(page.data.aggregates.map((a: { id: number }) => [`moisture-${a.id}`, "2"]));
    const saved = await call(batchPage.action, post(path(f1), { batchVolume: "0.15", mixerCapacity: "0.06", ...moisture }, cookie), { studyId, materialId: f1 });
    expect(await toastOf(saved)).toBe("Saved: this sheet is kept for your batch of F1.");
    // Hand-checked: ⌈0.15 / 0.06⌉ = 3 mixes of 0.05 m³; each mix takes a third of every quantity.
    const again = await call(batchPage.loader, get(path(f1), cookie), { studyId, materialId: f1 });
    expect(again.data.computed.split).toMatchObject({ mixes: 3 });
    expect(again.data.computed.split.volumePerMixM3).toBeCloseTo(0.05, 12);
    // The other material's sheet starts from the same mixer.
    const other = await call(batchPage.loader, get(path(f2), cookie), { studyId, materialId: f2 });
    expect(other.data.saved.mixerCapacityM3).toBe(0.06);
    // ?mixer= shows another split without saving it.
    const asked = await call(batchPage.loader, get(path(f1, "?mixer=0.2"), cookie), { studyId, materialId: f1 });
    expect(asked.data.computed.split.mixes).toBe(1);
    expect((await enrollmentOf(4)).mixerCapacityM3).toBe(0.06);
  });

  it("refuses a mixer of no size beside its field and keeps what was stored", async () => {
    const cookie = await demoCookie("analyst5@ringbatch.example");
    const page = await call(batchPage.loader, get(path(f1), cookie), { studyId, materialId: f1 });
    const moisture = Object.fromEntries(page.data.aggregates.map((a: { id: number }) => [`moisture-${a.id}`, "2"]));
    const refused = await call(batchPage.action, post(path(f1), { batchVolume: "0.15", mixerCapacity: "0", ...moisture }, cookie), { studyId, materialId: f1 });
    expect(refused.status).toBe(400);
    expect(errorsOf(refused).mixerCapacity).toBe("Enter your mixer's usable capacity in m³, more than 0 and at most 3, or leave it blank.");
    expect((await enrollmentOf(4)).mixerCapacityM3).toBe(0.06);
  });

  it("carries the targets and a mixing sequence for the mixture's constituents", async () => {
    const page = await call(batchPage.loader, get(path(f1), await demoCookie("analyst5@ringbatch.example")), { studyId, materialId: f1 });
    expect(page.data.targets.air_content).toEqual({ target: 6, tolerance: 1.5 });
    expect(page.data.study.targetSurfaceRating).toBe(2);
    expect(page.data.sequence[1]).toMatch(/^With the mixer stopped, add the coarse aggregate/);
  });

  it("suggests no volume for a test method whose specimen volume is not set", async () => {
    await db.update(studies).set({ specimenVolumeM3: null, wastePercent: null }).where(eq(studies.id, Number(studyId)));
    try {
      const page = await call(batchPage.loader, get(path(f2), await demoCookie("analyst7@ringbatch.example")), { studyId, materialId: f2 });
      expect(page.data.computed.suggestion).toBeNull();
      expect(page.data.computed.batchVolumeM3).toBeNull();
    } finally {
      await db.update(studies).set({ specimenVolumeM3: 0.0425, wastePercent: 10 }).where(eq(studies.id, Number(studyId)));
    }
  });
});

describe("specimen volume per test method", () => {
  const base = { code: "CU-2027-A", title: "Rebound check", replicatesPerCell: "3", significanceLevel: "0.005", targetSurfaceRating: "" };

  it("refuses a custom study that keeps the float finishing test's name", async () => {
    const cookie = await demoCookie("coordinator@ringbatch.example");
    const refused = await call(newStudy.action, post("/studies/new", { ...base, template: "custom", testMethod: "Float finishing test of fresh concrete" }, cookie));
    expect(refused.status).toBe(400);
    expect(errorsOf(refused).testMethod).toMatch(/^A custom study needs its own test method name/);
  });

  it("starts a custom study without a specimen volume, and the setup page sets one", async () => {
    const cookie = await demoCookie("coordinator@ringbatch.example");
    const created = await call(newStudy.action, post("/studies/new", { ...base, template: "custom", testMethod: "Rebound hammer on fresh slabs" }, cookie));
    expect(created.status).toBe(302);
    const study = await demoStudy("CU-2027-A");
    expect(study).toMatchObject({ specimenVolumeM3: null, wastePercent: null, targetSurfaceRating: null });
    const fields = { intent: "study", ...base, testMethod: study.testMethod, specimenVolumeM3: "0.028", wastePercent: "15" };
    const saved = await call(setupPage.action, post(`/studies/${study.id}/setup`, fields, cookie), { studyId: String(study.id) });
    expect(saved.status).toBe(302);
    expect(await demoStudy("CU-2027-A")).toMatchObject({ specimenVolumeM3: 0.028, wastePercent: 15 });
    const refused = await call(setupPage.action, post(`/studies/${study.id}/setup`, { ...fields, specimenVolumeM3: "-1" }, cookie), { studyId: String(study.id) });
    expect(errorsOf(refused).specimenVolumeM3).toBe("Enter a specimen volume above 0 and at most 1 m³.");
    expect((await demoStudy("CU-2027-A")).specimenVolumeM3).toBe(0.028);
  });

  it("starts a float finishing study with the 3 ft × 2 ft × 3 in form (0.0425 m³, batching.md)", async () => {
    const cookie = await demoCookie("coordinator@ringbatch.example");
    await call(newStudy.action, post("/studies/new", { ...base, code: "FF-2027-Z", template: "float_finishing", testMethod: "Float finishing test of fresh concrete", targetSurfaceRating: "2", specimenVolumeM3: "0.0425", wastePercent: "10" }, cookie));
    expect(await demoStudy("FF-2027-Z")).toMatchObject({ specimenVolumeM3: 0.0425, wastePercent: 10, targetSurfaceRating: 2 });
  });
});

describe("a readable audit trail", () => {
  it("logs a fresh-property change as old → new, and nothing for a save that changes nothing", async () => {
    const enrollment = await enrollmentOf(6);
    const user = { id: (await db.query.users.findFirst({ where: (u, { eq: is }) => is(u.email, "analyst7@ringbatch.example") }))!.id };
    const count = async () => (await db.select().from(auditEvents).where(eq(auditEvents.studyId, Number(studyId)))).length;
    await saveFreshProperties(enrollment, Number(f2), { slump: "180" }, user);
    const afterFirst = await count();
    await saveFreshProperties(enrollment, Number(f2), { slump: "180" }, user);
    expect(await count()).toBe(afterFirst);
    await saveFreshProperties(enrollment, Number(f2), { slump: "175", air_content: "" }, user);
    expect(await count()).toBe(afterFirst + 1);

    // The same through the page's autosave: a draft that resends the stored slump writes nothing.
    const cookie = await demoCookie("analyst7@ringbatch.example");
    const { changes } = await entryChanges(cookie, studyId, f2, { fresh: { slump: "175" } });
    await call(entry.action, post(`/lab/studies/${studyId}/results/${f2}`, { intent: "draft", draft: changes }, cookie), { studyId, materialId: f2 });
    expect(await count()).toBe(afterFirst + 1);

    const trail = await call(studyResults.loader, get(`/studies/${studyId}/results`, await demoCookie("coordinator@ringbatch.example")), { studyId });
    const latest = trail.data.audit.events[0];
    expect(latest).toMatchObject({ action: "batch.fresh_properties_saved", labCode: enrollment.labCode });
    // Only what changed is kept: the blank air content that was already blank is not part of the event.
    expect([latest.before, latest.after]).toEqual([{ slumpMm: 180 }, { slumpMm: 175 }]);
  });
});
