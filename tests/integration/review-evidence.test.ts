import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { cellDecisions, cells, enrollments, materials, queries, responses, users } from "~/db/schema";
import * as labQueries from "~/routes/lab/queries";
import * as reviewPage from "~/routes/review/study/ballot";
import * as analysisPage from "~/routes/studies/study/analysis";
import * as statementPage from "~/routes/studies/study/statement";
import { DEMO_LABS, DEMO_PEOPLE } from "../../seed/demo-data";
import { PUBLISHED_STUDY_CODE } from "../../seed/toolkit-demo";
import { demoCookie, demoStudy, useDemoDatabase } from "../support/demo";
import { errorsOf } from "../support/replies";
import { call, get, post } from "../support/routes";

let published: string;
let checking: string;
let reviewer: string;
let coordinator: string;

beforeAll(async () => {
  await useDemoDatabase();
  published = String((await demoStudy(PUBLISHED_STUDY_CODE)).id);
  checking = String((await demoStudy("FF-2026-A")).id);
  reviewer = await demoCookie("reviewer2@ringbatch.example");
  coordinator = await demoCookie("coordinator@ringbatch.example");
});

const reviewerPage = async (studyId: string, query = "") => (await call(reviewPage.loader, get(`/review/${studyId}${query}`, reviewer), { studyId })).data;

/** Everything of the demo that would unblind a lab: its name, its people, their addresses. */
const identities = [...DEMO_LABS.map((l) => l.name), ...DEMO_PEOPLE.analysts.flatMap((a) => [a.name, a.email])];

function expectBlinded(data: unknown) {
  const text = JSON.stringify(data).toLowerCase();
  for (const identity of identities) expect(text, identity).not.toContain(identity.toLowerCase());
}

type Cell = { lab: string; values: { value: number }[]; stats: { mean: number; h: number | null } | null; standing: string; decision: { decision: string; reason: string } | null };

describe("the committee's evidence on the published demo study", () => {
  it("lists every cell decision, retained and excluded, with its reason and no decider's name", async () => {
    const page = await reviewerPage(published);
    expect(page.decisions).toEqual([
      expect.objectContaining({ lab: "L03", material: "M3", response: "surface", decision: "retained", reason: expect.stringMatching(/operator log/) }),
      expect.objectContaining({ lab: "L04", material: "M2", response: "holes", decision: "excluded", reason: expect.stringMatching(/floated 40 minutes late/) }),
    ]);
    expect(JSON.stringify(page.decisions)).not.toContain(DEMO_PEOPLE.coordinator.name);
    expectBlinded(page);
  });

  it("opens on the first material and shows one material at a time", async () => {
    const first = await reviewerPage(published);
    expect(first.material).toBe("M1");
    expect(first.materialAnalysis.groups.every((g: { material: string }) => g.material === "M1")).toBe(true);
    const m2 = await reviewerPage(published, "?material=M2");
    expect(m2.material).toBe("M2");
    expect(m2.evidence.map((r: { response: string }) => r.response)).toEqual(["holes", "surface"]);
    // An unknown material falls back to the first.
    expect((await reviewerPage(published, "?material=M9")).material).toBe("M1");
  });

  it("shows each lab's replicate values by code, the excluded cell among them, as stored", async () => {
    const page = await reviewerPage(published, "?material=M2");
    const holes: Cell[] = page.evidence.find((r: { response: string }) => r.response === "holes").cells;
    expect(holes.map((c) => c.lab)).toEqual(["L01", "L02", "L03", "L04", "L05", "L06", "L07", "L08"]);
    const excluded = holes.find((c) => c.lab === "L04")!;
    expect(excluded).toMatchObject({ standing: "excluded", stats: null, decision: { decision: "excluded" } });
    // The planted late-floated specimen (seed/toolkit-demo.ts) is the second replicate.
    expect(excluded.values[1]!.value).toBe(16);
    expect(holes.filter((c) => c.lab !== "L04").every((c) => c.standing === "analysed" && c.values.length === 3)).toBe(true);
    expectBlinded(page);
  });

  it("gives h as ASTM E691 defines it from the values shown: (cell average − average of averages) / s of the averages", async () => {
    const page = await reviewerPage(published, "?material=M3");
    const surface: Cell[] = page.evidence.find((r: { response: string }) => r.response === "surface").cells;
    const averages = surface.map((c) => c.values.reduce((sum, v) => sum + v.value, 0) / c.values.length);
    const grand = averages.reduce((a, b) => a + b, 0) / averages.length;
    const sx = Math.sqrt(averages.reduce((sum, a) => sum + (a - grand) ** 2, 0) / (averages.length - 1));
    surface.forEach((cell, i) => expect(cell.stats!.h).toBeCloseTo((averages[i]! - grand) / sx, 10));
    const retained = surface.find((c) => c.lab === "L03")!;
    expect(retained.decision).toMatchObject({ decision: "retained" });
    expect(page.evidence[1].criteria.hCritical).toBeGreaterThan(1);
  });
});

describe("text that would unblind a lab", () => {
  const analysisPath = () => `/studies/${checking}/analysis`;
  const act = (fields: Record<string, string>) => call(analysisPage.action, post(analysisPath(), fields, coordinator), { studyId: checking });
  const cell = { lab: "L04", material: "M2", response: "surface" };
  const decisionsOfCell = async () =>
    db
      .select({ id: cellDecisions.id })
      .from(cellDecisions)
      .innerJoin(cells, eq(cells.id, cellDecisions.cellId))
      .innerJoin(enrollments, eq(enrollments.id, cells.enrollmentId))
      .where(and(eq(enrollments.studyId, Number(checking)), eq(enrollments.labCode, "L04")));

  it("refuses a decision's reason that names an enrolled lab, whatever its case, and stores nothing", async () => {
    const refused = await act({ intent: "decide", ...cell, decision: "excluded", reason: `Called ${DEMO_LABS[3].name.toUpperCase()} about the float; they confirmed a fault.` });
    expect(refused.status).toBe(400);
    expect(errorsOf(refused).reason).toMatch(/by code only.*Ostrade Highway District Lab/);
    expect(await decisionsOfCell()).toEqual([]);
  });

  it("refuses a query naming a lab's analyst or e-mail address, beside the field", async () => {
    const byName = await act({ intent: "ask", ...cell, statistic: "", question: `Could ${DEMO_PEOPLE.analysts[3]!.name} check the float angle used?` });
    expect(byName.status).toBe(400);
    expect(errorsOf(byName).question).toMatch(/the person “Hanne Oduya”/);
    const byAddress = await act({ intent: "ask", ...cell, statistic: `h = 2.5, see ${DEMO_PEOPLE.analysts[0]!.email}`, question: "Please check the float angle used on M2." });
    expect(errorsOf(byAddress).statistic).toMatch(/the e-mail address “analyst1@ringbatch.example”/);
  });

  it("accepts the same text when it names the lab by its code", async () => {
    const saved = await act({ intent: "decide", ...cell, decision: "retained", reason: "Lab L04 confirmed the float; the finishing order of the method was followed." });
    expect(saved.status).toBe(302);
    expect(await decisionsOfCell()).toHaveLength(1);
  });

  it("withholds a name from a reason stored before the check, on the reviewer's page", async () => {
    const [surface] = await db.select({ id: responses.id }).from(responses).where(and(eq(responses.studyId, Number(checking)), eq(responses.key, "surface")));
    const [m1] = await db.select({ id: materials.id }).from(materials).where(and(eq(materials.studyId, Number(checking)), eq(materials.code, "M1")));
    const [l02] = await db.select({ id: cells.id }).from(cells).innerJoin(enrollments, eq(enrollments.id, cells.enrollmentId)).where(and(eq(enrollments.labCode, "L02"), eq(enrollments.studyId, Number(checking)), eq(cells.materialId, m1!.id), eq(cells.responseId, surface!.id)));
    const [coordinatorRow] = await db.select({ id: users.id }).from(users).where(eq(users.email, DEMO_PEOPLE.coordinator.email));
    await db.insert(cellDecisions).values({ cellId: l02!.id, decision: "retained", reason: `Checked with ${DEMO_PEOPLE.analysts[1]!.name} by phone.`, decidedBy: coordinatorRow!.id, decidedAt: new Date() });
    const page = await reviewerPage(checking);
    expect(page.decisions.find((d: { lab: string }) => d.lab === "L02").reason).toBe("Checked with [withheld] by phone.");
    expectBlinded(page);
  });
});

describe("the queries behind the decisions, on the reviewer's page", () => {
  it("shows the coordinator's question and the lab's answer by lab code, with the lab's own people withheld", async () => {
    const cell = { lab: "L04", material: "M2", response: "surface" };
    const asked = await call(analysisPage.action, post(`/studies/${checking}/analysis`, { intent: "ask", ...cell, statistic: "h = 2.31", question: "Please check the float angle used on M2." }, coordinator), { studyId: checking });
    expect(asked.status).toBe(302);
    const [query] = await db.select({ id: queries.id }).from(queries).orderBy(queries.id).all().then((rows) => rows.slice(-1));
    // Demo lab index 7 holds L04 in FF-2026-A (seed/seed.ts); its analyst answers naming a colleague, which the coordinator may read.
    const answer = `${DEMO_PEOPLE.analysts[7]!.name} re-ran the float at 8 degrees; see ${DEMO_PEOPLE.analysts[7]!.email}.`;
    const answered = await call(labQueries.action, post("/lab/queries", { queryId: String(query!.id), answer }, await demoCookie("analyst8@ringbatch.example")));
    expect(answered.status).toBe(302);

    const page = await reviewerPage(checking);
    const shown = page.queries.filter((q: { lab: string; material: string }) => q.lab === "L04" && q.material === "M2");
    expect(shown).toEqual([
      expect.objectContaining({ response: "surface", statistic: "h = 2.31", question: "Please check the float angle used on M2.", answer: "[withheld] re-ran the float at 8 degrees; see [withheld].", state: "answered" }),
    ]);
    expect(Object.keys(shown[0])).not.toContain("labName");
    expectBlinded(page);
  });
});

describe("a statement text that would unblind a lab", () => {
  it("is refused beside the text, and the stored text stays as it was", async () => {
    const statementPath = `/studies/${checking}/statement`;
    const coordinatorDoes = (fields: Record<string, string>) => call(statementPage.action, post(statementPath, fields, coordinator), { studyId: checking });
    expect((await coordinatorDoes({ intent: "freeze" })).status).toBe(302);
    const { latest } = (await call(statementPage.loader, get(statementPath, coordinator), { studyId: checking })).data;
    const refused = await coordinatorDoes({ intent: "save-text", statementId: String(latest.id), textE691: `${latest.textE691}\nThanks to ${DEMO_LABS[0].name}.`, textC670: latest.textC670 });
    expect(refused.status).toBe(400);
    expect(errorsOf(refused).textE691).toMatch(/Quarrow County Materials Lab/);
    const after = (await call(statementPage.loader, get(statementPath, coordinator), { studyId: checking })).data.latest;
    expect(after.textE691).toBe(latest.textE691);
  });
});
