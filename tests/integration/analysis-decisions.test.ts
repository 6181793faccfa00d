import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { auditEvents, emailOutbox, queries, studies } from "~/db/schema";
import { exclusionsWith, materialWhatIf } from "~/lib/review/what-if";
import { answerQuery } from "~/models/lab-queries.server";
import * as analysisPage from "~/routes/studies/study/analysis";
import * as queriesPage from "~/routes/studies/study/queries";
import * as whatIf from "~/routes/api/v1/study-what-if";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "../support/database";
import { demoCookie } from "../support/demo";
import { errorsOf, toastOf, valuesOf } from "../support/replies";
import { call, get, post } from "../support/routes";

let studyId: string;
let coordinator: string;

beforeAll(async () => {
  await useFreshDatabase();
  await seedDemo(db);
  studyId = String((await db.query.studies.findFirst({ where: eq(studies.code, "FF-2026-A") }))!.id);
  coordinator = await demoCookie("coordinator@ringbatch.example");
});

const page = (query = "") => `/studies/${studyId}/analysis${query}`;
const group = (analysis: any, material: string, response: string) => analysis.groups.find((g: any) => g.material === material && g.response === response);

describe("the analysis page", () => {
  it("flags the planted outliers on the right statistic", async () => {
    const { status, data } = await call(analysisPage.loader, get(page(), coordinator), { studyId });
    expect(status).toBe(200);
    const flagged = data.flagged.map((f: any) => `${f.lab}:${f.material}:${f.response}:${f.flags.join("")}`);
    // The demo plants a between-lab shift (h) and a within-lab scatter (k); see seed/demo-data.ts.
    expect(flagged).toContain("L08:M2:surface:h");
    expect(flagged).toContain("L01:M3:holes:k");
  });

  it("recomputes the critical values at another significance level", async () => {
    const strict = await call(analysisPage.loader, get(page(), coordinator), { studyId });
    const loose = await call(analysisPage.loader, get(page("?alpha=0.05"), coordinator), { studyId });
    expect(loose.data.alpha).toBe(0.05);
    expect(group(loose.data.analysis, "M1", "holes").kCritical).toBeLessThan(group(strict.data.analysis, "M1", "holes").kCritical);
  });

  it("sends the labs' cell statistics of one material at a time, the first by default, and every material's precision figures", async () => {
    const labsSentFor = (data: any) => [...new Set(data.analysis.groups.filter((g: any) => g.labs.length > 0).map((g: any) => g.material))];
    const first = (await call(analysisPage.loader, get(page(), coordinator), { studyId })).data;
    expect(first.material).toBe("M1");
    expect(labsSentFor(first)).toEqual(["M1"]);
    expect(new Set(first.analysis.groups.map((g: any) => g.material))).toEqual(new Set(first.materials.map((m: any) => m.code)));
    expect(group(first.analysis, "M3", "holes").sR).toBeGreaterThan(0);
    const third = (await call(analysisPage.loader, get(page("?material=M3"), coordinator), { studyId })).data;
    expect(labsSentFor(third)).toEqual(["M3"]);
    expect(labsSentFor((await call(analysisPage.loader, get(page("?material=nonsense"), coordinator), { studyId })).data)).toEqual(["M1"]);
    // Investigating a cell shows its material, whatever ?material= says.
    expect((await call(analysisPage.loader, get(page("?material=M1&cell=L08:M2:surface"), coordinator), { studyId })).data.material).toBe("M2");
  });

  it("refuses other people with 404 and reviewers too", async () => {
    for (const email of ["analyst1@ringbatch.example", "reviewer1@ringbatch.example"]) {
      const outcome = await call(analysisPage.loader, get(page(), await demoCookie(email)), { studyId });
      expect(outcome.status).toBe(404);
    }
  });
});

describe("asking the lab", () => {
  it("keeps the question and shows the error beside it when it is too short", async () => {
    const outcome = await call(analysisPage.action, post(page(), { intent: "ask", lab: "L08", material: "M2", response: "surface", statistic: "h", question: "Why?" }, coordinator), { studyId });
    expect(outcome.status).toBe(400);
    expect(errorsOf(outcome).question).toMatch(/at least 10/);
    expect(valuesOf(outcome).question).toBe("Why?");
  });

  it("refuses a cell that does not exist", async () => {
    const outcome = await call(analysisPage.action, post(page(), { intent: "ask", lab: "L99", material: "M2", response: "surface", statistic: "", question: "Please check these results." }, coordinator), { studyId });
    expect(outcome.status).toBe(409);
    expect(errorsOf(outcome).form).toMatch(/L99/);
  });

  it("raises a query, e-mails the lab, and tracks it through the answer to closed", async () => {
    const before = (await db.select().from(emailOutbox)).length;
    const outcome = await call(
      analysisPage.action,
      post(page(), { intent: "ask", lab: "L08", material: "M2", response: "surface", statistic: "h = 2.3 (critical ±2.15)", question: "Please check the surface pass counts of M2." }, coordinator),
      { studyId },
    );
    expect(outcome.status).toBe(302);
    expect(await toastOf(outcome)).toBe("Query sent to lab L08.");
    const mail = (await db.select().from(emailOutbox)).slice(before);
    expect(mail.map((m) => m.to)).toContain("analyst5@ringbatch.example");
    expect(mail[0]!.text).toContain("Please check the surface pass counts of M2.");
    const listed = await call(queriesPage.loader, get(`/studies/${studyId}/queries`, coordinator), { studyId });
    const query = listed.data.queries.find((q: any) => q.lab === "L08");
    expect(query.state).toBe("open");

    const analyst = (await db.query.users.findFirst({ where: (u, { eq: equals }) => equals(u.email, "analyst5@ringbatch.example") }))!;
    const member = await db.query.labMembers.findFirst({ where: (m, { eq: equals }) => equals(m.userId, analyst.id) });
    await answerQuery(query.id, [member!.labId], "The operator miscounted passes on that day.", analyst, null);
    expect((await db.query.queries.findFirst({ where: eq(queries.id, query.id) }))!.state).toBe("answered");

    const closed = await call(queriesPage.action, post(`/studies/${studyId}/queries`, { intent: "close", queryId: String(query.id) }, coordinator), { studyId });
    expect(closed.status).toBe(302);
    expect(await toastOf(closed)).toBe("Query closed.");
    expect((await db.query.queries.findFirst({ where: eq(queries.id, query.id) }))!.state).toBe("closed");
    const again = await call(queriesPage.action, post(`/studies/${studyId}/queries`, { intent: "close", queryId: String(query.id) }, coordinator), { studyId });
    expect(again.status).toBe(409);
  });
});

describe("cell decisions", () => {
  it("previews an exclusion through the what-if resource without saving anything", async () => {
    const version = (await db.query.studies.findFirst({ where: eq(studies.id, Number(studyId)) }))!.dataVersion;
    const outcome = await call(whatIf.loader, get(`/api/v1/studies/${studyId}/what-if?exclude=L08:M2:surface`, coordinator), { studyId });
    expect(outcome.status).toBe(200);
    expect(group(outcome.data, "M2", "surface").p).toBe(7);
    expect(outcome.data.excluded).toHaveLength(1);
    expect((await db.query.studies.findFirst({ where: eq(studies.id, Number(studyId)) }))!.dataVersion).toBe(version);
    const bad = await call(whatIf.loader, get(`/api/v1/studies/${studyId}/what-if?exclude=nonsense`, coordinator), { studyId });
    expect(bad.status).toBe(422);
    expect(bad.data.error.code).toBe("invalid_exclude");
    const reviewer = await call(whatIf.loader, get(`/api/v1/studies/${studyId}/what-if`, await demoCookie("reviewer1@ringbatch.example")), { studyId });
    expect(reviewer.status).toBe(404);
  });

  it("computes the preview in the page with the server's engine, and the server's what-if agrees", async () => {
    const cell = { lab: "L08", material: "M2", response: "surface" };
    const { data } = await call(analysisPage.loader, get(page("?cell=L08:M2:surface"), coordinator), { studyId });
    const inPage = (decision: "retained" | "excluded") => JSON.parse(JSON.stringify(materialWhatIf(data.whatIf, exclusionsWith(data.analysis.excluded, cell, decision))));
    const server = await call(whatIf.loader, get(`/api/v1/studies/${studyId}/what-if?exclude=L08:M2:surface`, coordinator), { studyId });
    const serverM2 = server.data.groups.filter((g: any) => g.material === "M2");
    expect(inPage("excluded")).toEqual(serverM2);
    expect(group({ groups: inPage("excluded") }, "M2", "surface").p).toBe(group(data.analysis, "M2", "surface").p - 1);
    // Retaining the cell gives back the figures the page already shows.
    expect(inPage("retained")).toEqual(JSON.parse(JSON.stringify(data.analysis.groups.filter((g: any) => g.material === "M2"))));
  });

  it("requires a decision and a reason", async () => {
    const outcome = await call(analysisPage.action, post(page(), { intent: "decide", lab: "L08", material: "M2", response: "surface", reason: "" }, coordinator), { studyId });
    expect(outcome.status).toBe(400);
    expect(Object.keys(errorsOf(outcome)).sort()).toEqual(["decision", "reason"]);
  });

  it("excludes a cell with its reason: the figures change, the data version moves, the trail records it", async () => {
    const before = (await call(analysisPage.loader, get(page("?cell=L08:M2:surface"), coordinator), { studyId })).data;
    const previewed = materialWhatIf(before.whatIf, exclusionsWith(before.analysis.excluded, { lab: "L08", material: "M2", response: "surface" }, "excluded"));
    const reason = "Lab confirmed an operator counting error on that day (query answered).";
    const saved = await call(analysisPage.action, post(page(), { intent: "decide", lab: "L08", material: "M2", response: "surface", decision: "excluded", reason }, coordinator), { studyId });
    expect(saved.status).toBe(302);
    const after = (await call(analysisPage.loader, get(page(), coordinator), { studyId })).data;
    expect(after.study.dataVersion).toBe(before.study.dataVersion + 1);
    expect(group(after.analysis, "M2", "surface").p).toBe(group(before.analysis, "M2", "surface").p - 1);
    expect(group(after.analysis, "M2", "surface").sR).toBeLessThan(group(before.analysis, "M2", "surface").sR);
    // What the server recomputed on saving is what the page previewed.
    const savedM2 = (await call(analysisPage.loader, get(page("?material=M2"), coordinator), { studyId })).data.analysis.groups.filter((g: any) => g.material === "M2");
    expect(JSON.parse(JSON.stringify(previewed))).toEqual(JSON.parse(JSON.stringify(savedM2)));
    expect(after.decisions).toEqual([expect.objectContaining({ lab: "L08", material: "M2", response: "surface", decision: "excluded", reason, decidedBy: "Dr. Talia Brennock" })]);
    const trail = await db.select().from(auditEvents).where(eq(auditEvents.action, "cell_decision.saved"));
    expect(trail.at(-1)!.reason).toBe(reason);
    expect(after.history[0].after).toMatchObject({ lab: "L08", decision: "excluded" });
  });
});
