/**
 * Withdrawing a lab from a study (product design: enrollment `withdrawn`):
 * the coordinator gives a reason, the lab can no longer change results, and
 * its results, kept for the record, leave the analysis.
 */
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { auditEvents, enrollments, labs, materials, studies } from "~/db/schema";
import { studyAnalysis } from "~/models/analysis.server";
import { InvitationError, withdrawEnrollment } from "~/models/invitation.server";
import * as labStudy from "~/routes/lab/study/tasks";
import * as entry from "~/routes/lab/study/result-entry";
import * as analysisPage from "~/routes/studies/study/analysis";
import * as labsPage from "~/routes/studies/study/labs";
import * as resultsPage from "~/routes/studies/study/results";
import { DEMO_LABS } from "../../seed/demo-data";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "../support/database";
import { demoCookie } from "../support/demo";
import { readReply } from "../support/replies";
import { call, get, post } from "../support/routes";

let study: typeof studies.$inferSelect;
let enrollment: typeof enrollments.$inferSelect;
let coordinator: string;

const loadStudy = async () => (await db.query.studies.findFirst({ where: eq(studies.id, study.id) }))!;
const withdraw = async (fields: Record<string, string>, cookie = coordinator) =>
  readReply(await call(labsPage.action, post(`/studies/${study.id}/labs`, { intent: "withdraw", ...fields }, cookie), { studyId: String(study.id) }));
const codesInAnalysis = async () => new Set((await studyAnalysis(await loadStudy())).groups.flatMap((g) => g.labs.map((l) => l.lab)));

beforeAll(async () => {
  await useFreshDatabase();
  await seedDemo(db);
  study = (await db.query.studies.findFirst({ where: eq(studies.code, "FF-2026-B") }))!;
  // Lab index 0 has submitted its results in the demo (analyst1 works there).
  const lab = (await db.query.labs.findFirst({ where: eq(labs.name, DEMO_LABS[0].name) }))!;
  enrollment = (await db.query.enrollments.findFirst({ where: and(eq(enrollments.studyId, study.id), eq(enrollments.labId, lab.id)) }))!;
  coordinator = await demoCookie("coordinator@ringbatch.example");
});

describe("withdrawing a lab", () => {
  it("needs a reason, from the study's coordinator", async () => {
    const noReason = await withdraw({ enrollmentId: String(enrollment.id), reason: "  " });
    expect(noReason.status).toBe(400);
    expect(noReason.errors.reason).toBe("Give the reason for withdrawing the lab.");
    const byAnalyst = await withdraw({ enrollmentId: String(enrollment.id), reason: "not mine to decide" }, await demoCookie("analyst2@ringbatch.example"));
    expect(byAnalyst.status).toBe(404);
    expect((await db.query.enrollments.findFirst({ where: eq(enrollments.id, enrollment.id) }))!.state).toBe("accepted");
  });

  it("takes the lab's results out of the analysis, keeps them, and records who and why", async () => {
    expect((await codesInAnalysis()).has(enrollment.labCode!)).toBe(true);
    const before = await loadStudy();
    const outcome = await withdraw({ enrollmentId: String(enrollment.id), reason: "Tested at 35 °C ambient against the protocol's 23 °C" });
    expect(outcome.done).toMatch(/withdrawn/);
    expect((await db.query.enrollments.findFirst({ where: eq(enrollments.id, enrollment.id) }))!.state).toBe("withdrawn");
    expect((await loadStudy()).dataVersion).toBe(before.dataVersion + 1);
    expect((await codesInAnalysis()).has(enrollment.labCode!)).toBe(false);
    // The analysis page says which lab is left out, and why.
    const page = await call(analysisPage.loader, get(`/studies/${study.id}/analysis`, coordinator), { studyId: String(study.id) });
    expect(page.data.withdrawn).toEqual([enrollment.labCode]);
    // The results stay on the results page, marked.
    const results = await call(resultsPage.loader, get(`/studies/${study.id}/results`, coordinator), { studyId: String(study.id) });
    const rows = results.data.rows.filter((r: { labCode: string }) => r.labCode === enrollment.labCode);
    expect(rows.length).toBeGreaterThan(0);
    expect(rows.every((r: { withdrawn: boolean; cells: { values: unknown[] }[] }) => r.withdrawn)).toBe(true);
    expect(rows.some((r: { cells: { values: unknown[] }[] }) => r.cells.some((c) => c.values.length > 0))).toBe(true);
    const [event] = await db.select().from(auditEvents).where(and(eq(auditEvents.action, "lab_withdrawn"), eq(auditEvents.entityId, String(enrollment.id))));
    expect(event!.reason).toBe("Tested at 35 °C ambient against the protocol's 23 °C");
    // The coordinator's lab page no longer offers the withdrawal for it.
    const again = await withdraw({ enrollmentId: String(enrollment.id), reason: "twice" });
    expect(again.errors.reason).toBe("Only an invited or enrolled lab can be withdrawn.");
  });

  it("closes the study's pages to the lab, results entry included, and tells it why on the first page", async () => {
    const analyst = await demoCookie("analyst1@ringbatch.example");
    const f1 = (await db.query.materials.findFirst({ where: and(eq(materials.studyId, study.id), eq(materials.code, "F1")) }))!;
    const draft = JSON.stringify({ rows: [{ response: "holes", replicate: 1, value: "9", testedOn: "", operator: "", readVersion: 0 }], fresh: {} });
    const save = await call(entry.action, post(`/lab/studies/${study.id}/results/${f1.id}`, { intent: "draft", draft }, analyst), { studyId: String(study.id), materialId: String(f1.id) });
    expect(save.status).toBe(404);
    const tasks = await call(labStudy.loader, get(`/lab/studies/${study.id}`, analyst), { studyId: String(study.id) });
    expect(tasks.data.ended).toBe("withdrawn");
  });

  it("is refused once the statement is with the committee", async () => {
    const other = (await db.select().from(enrollments).where(and(eq(enrollments.studyId, study.id), eq(enrollments.state, "accepted"))))[0]!;
    await expect(withdrawEnrollment({ ...(await loadStudy()), state: "in_review" }, other.id, "late", 1)).rejects.toBeInstanceOf(InvitationError);
    expect((await db.query.enrollments.findFirst({ where: eq(enrollments.id, other.id) }))!.state).toBe("accepted");
  });
});
