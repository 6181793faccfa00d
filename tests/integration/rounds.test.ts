/**
 * Proficiency rounds through their routes, with a real database: the demo's
 * planted scores, a round set up from the published study and run to
 * publication, refusals beside their fields, the material-check gate, frozen
 * published scores, and each lab reading only its own letter.
 */
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { enrollments, labs, materials, responses, roundScores, roundSettings, studies } from "~/db/schema";
import * as apiRounds from "~/routes/api/v1/rounds";
import * as apiScores from "~/routes/api/v1/round-scores";
import * as letterPage from "~/routes/lab/rounds/round/letter";
import * as labRound from "~/routes/lab/rounds/round/uncertainty";
import * as assignedValues from "~/routes/rounds/round/assigned-values";
import * as materialChecks from "~/routes/rounds/round/material-checks";
import * as newRound from "~/routes/rounds/new";
import * as overview from "~/routes/rounds/round/overview";
import * as report from "~/routes/rounds/round/report";
import * as scores from "~/routes/rounds/round/scores";
import * as setupPage from "~/routes/studies/study/setup";
import * as studyLayout from "~/routes/studies/study/layout";
import { ROUND_CHECKS } from "../../seed/rounds-data";
import { demoCookie, demoStudy, useDemoDatabase } from "../support/demo";
import { call, get, post } from "../support/routes";

let coordinator: string;

beforeAll(async () => {
  await useDemoDatabase();
  coordinator = await demoCookie("coordinator@ringbatch.example");
});

describe("the demo's published round", () => {
  it("shows the planted unsatisfactory and questionable scores and nothing else outside satisfactory", async () => {
    const round = await demoStudy("PT-2026-1");
    const outcome = await call(report.loader, get(`/rounds/${round.id}/report`, coordinator), { roundId: String(round.id) });
    expect(outcome.status).toBe(200);
    const flagged = outcome.data.groups.flatMap((g: any) =>
      g.scores.labs.filter((l: any) => l.verdict !== "satisfactory").map((l: any) => ({ group: `${g.material.code}:${g.response.key}`, lab: outcome.data.labNames[l.labCode], verdict: l.verdict, score: l.score })),
    );
    expect(flagged.map(({ group, lab, verdict }: any) => ({ group, lab, verdict }))).toEqual([
      { group: "R1:surface", lab: "Kestrel Ridge Ready-Mix QC", verdict: "unsatisfactory" },
      { group: "R2:holes", lab: "Ostrade Highway District Lab", verdict: "questionable" },
    ]);
    expect(Math.abs(flagged[0].score)).toBeGreaterThan(3);
    expect(Math.abs(flagged[1].score)).toBeGreaterThan(2);
    expect(Math.abs(flagged[1].score)).toBeLessThan(3);
    // σ_pt came from the published study's precision, and the choice is written out.
    expect(outcome.data.groups[0].sigmaBasis).toMatch(/FF-2025-D/);
    expect(outcome.data.groups[0].scores.labs).toHaveLength(12);
  });

  it("never lets a published score change", async () => {
    const round = await demoStudy("PT-2026-1");
    await expect(db.update(roundScores).set({ score: 0 }).where(eq(roundScores.studyId, round.id))).rejects.toThrow();
    await expect(db.delete(roundScores).where(eq(roundScores.studyId, round.id))).rejects.toThrow();
    await expect(db.update(roundSettings).set({ publishedReport: null }).where(eq(roundSettings.studyId, round.id))).rejects.toThrow();
  });

  it("gives each lab its own letter: its scores, other labs as codes only", async () => {
    const round = await demoStudy("PT-2026-1");
    const params = { roundId: String(round.id) };
    const analyst = await demoCookie("analyst4@ringbatch.example"); // Ostrade Highway District Lab
    const outcome = await call(letterPage.loader, get(`/lab/rounds/${round.id}/letter`, analyst), params);
    const letter = outcome.data.letter;
    const own = letter.groups.find((g: any) => g.material.code === "R2" && g.response.key === "holes").own;
    expect(own.labCode).toBe(letter.labCode);
    expect(own.verdict).toBe("questionable");
    expect(letter.groups.every((g: any) => g.own === null || g.own.labCode === letter.labCode)).toBe(true);
    expect(letter.groups[0].distribution).toHaveLength(12);
    const text = JSON.stringify(outcome.data);
    for (const lab of await db.select({ name: labs.name }).from(labs)) expect(text).not.toContain(lab.name);
    // Its history: the earlier round, then this one, in the order they were published.
    expect([...new Set(letter.history.map((h: any) => h.round))]).toEqual(["PT-2025-2", "PT-2026-1"]);

    const ownScores = await call(apiScores.loader, get(`/api/v1/rounds/${round.id}/scores`, analyst), params);
    expect(ownScores.data.scores.every((s: any) => s.labCode === letter.labCode)).toBe(true);
    expect(ownScores.data.scores).toHaveLength(4);
  });
});

describe("the rounds API with a token", () => {
  it("reads a lab's own scores with a study:read token made for the round, and nothing else", async () => {
    const round = await demoStudy("PT-2026-1");
    const analyst = (await db.query.users.findFirst({ where: (u, { eq }) => eq(u.email, "analyst4@ringbatch.example") }))!;
    const { loadSessionUser } = await import("~/models/user.server");
    const { createApiToken } = await import("~/models/api-token.server");
    const { token } = await createApiToken((await loadSessionUser(analyst.id))!, { name: "letter script", scope: "study:read", studyId: round.id });
    const bearer = (path: string) => new Request(`http://ringbatch.test${path}`, { headers: { Authorization: `Bearer ${token}` } });
    const listed = await call(apiRounds.loader, bearer("/api/v1/rounds"));
    expect(listed.data.rounds.map((r: any) => r.code)).toEqual(["PT-2026-1"]);
    const mine = await call(apiScores.loader, bearer(`/api/v1/rounds/${round.id}/scores`), { roundId: String(round.id) });
    expect(mine.status).toBe(200);
    expect(new Set(mine.data.scores.map((s: any) => s.labCode))).toEqual(new Set([mine.data.labCode]));
    const earlier = await demoStudy("PT-2025-2");
    expect((await call(apiScores.loader, bearer(`/api/v1/rounds/${earlier.id}/scores`), { roundId: String(earlier.id) })).status).toBe(404);
  });
});

describe("a lab's own uncertainty", () => {
  it("is refused beside its field when not above 0, and once saved gives the lab a ζ score", async () => {
    const round = await demoStudy("PT-2026-2");
    const params = { roundId: String(round.id) };
    const analyst = await demoCookie("analyst1@ringbatch.example"); // Quarrow, which has submitted in this round
    const r1 = (await db.query.materials.findFirst({ where: (m, { and, eq }) => and(eq(m.studyId, round.id), eq(m.code, "R1")) }))!;
    const holes = (await db.query.responses.findFirst({ where: (r, { and, eq }) => and(eq(r.studyId, round.id), eq(r.key, "holes")) }))!;
    const form = (u: string) => ({ intent: "uncertainty", materialId: String(r1.id), responseId: String(holes.id), standardUncertainty: u });
    const refused = await call(labRound.action, post(`/lab/rounds/${round.id}`, form("-1"), analyst), params);
    expect(refused.status).toBe(400);
    expect(refused.data.result.error.standardUncertainty).toEqual(["Enter a standard uncertainty above 0, or leave it blank."]);
    const saved = await call(labRound.action, post(`/lab/rounds/${round.id}`, form("0,4"), analyst), params);
    expect(saved.status).toBe(302);
    const own = (await db.select({ code: enrollments.labCode }).from(enrollments).innerJoin(labs, eq(labs.id, enrollments.labId)).where(eq(labs.name, "Quarrow County Materials Lab")))
      .map((e) => e.code);
    const page = await call(scores.loader, get(`/rounds/${round.id}/scores`, coordinator), params);
    const group = page.data.groups.find((g: any) => g.material.code === "R1" && g.response.key === "holes");
    const zetas = group.scores.labs.filter((l: any) => l.zeta !== null);
    expect(zetas).toHaveLength(1);
    expect(own).toContain(zetas[0].labCode);
    expect(zetas[0].zeta).toBeCloseTo((zetas[0].result - group.scores.assignedValue) / Math.sqrt(0.4 ** 2 + group.scores.assignedUncertainty ** 2), 10);
  });
});

describe("a material added to a round after it was set up", () => {
  it("is scored with the default choices, and its choice can be saved", async () => {
    const round = await demoStudy("PT-2026-2");
    const params = { roundId: String(round.id) };
    const [added] = await db.insert(materials).values({ studyId: round.id, code: "R3", description: "Added on the setup page", sortOrder: 9 }).returning();
    const page = await call(assignedValues.loader, get(`/rounds/${round.id}/assigned-values`, coordinator), params);
    const group = page.data.groups.find((g: any) => g.material.code === "R3");
    expect(group.assignment).toMatchObject({ assignedMethod: "consensus", sigmaMethod: "precision" });
    expect(group.scored.refusal).toMatch(/at least 2 labs/);
    const holes = (await db.query.responses.findFirst({ where: (r, { and, eq }) => and(eq(r.studyId, round.id), eq(r.key, "holes")) }))!;
    const saved = await call(
      assignedValues.action,
      post(`/rounds/${round.id}/assigned-values`, { intent: "assignment", materialId: String(added!.id), responseId: String(holes.id), assignedMethod: "reference", referenceValue: "8", referenceUncertainty: "0.2", sigmaMethod: "fixed", fixedSigma: "1" }, coordinator),
      params,
    );
    expect(saved.status).toBe(302);
    const again = await call(assignedValues.loader, get(`/rounds/${round.id}/assigned-values`, coordinator), params);
    expect(again.data.groups.find((g: any) => g.material.code === "R3" && g.response.key === "holes").assignment).toMatchObject({ assignedMethod: "reference", referenceValue: 8, fixedSigma: 1 });
  });
});

describe("a round from the published study, run to publication", () => {
  let roundId: number;
  const params = () => ({ roundId: String(roundId) });

  it("refuses bad input beside its field, and keeps nothing", async () => {
    const source = await demoStudy("FF-2025-D");
    const refused = await call(newRound.action, post("/rounds/new", { code: "x", title: "", sourceStudyId: String(source.id), replicatesPerCell: "5", materials: "" }, coordinator));
    expect(refused.status).toBe(400);
    expect(Object.keys(refused.data.result.error)).toEqual(expect.arrayContaining(["code", "title", "replicatesPerCell", "materials"]));
    expect(await db.query.studies.findFirst({ where: eq(studies.code, "X") })).toBeUndefined();
  });

  it("creates the round with the study's method, responses and precision", async () => {
    const source = await demoStudy("FF-2025-D");
    const created = await call(
      newRound.action,
      post("/rounds/new", { code: "PT-2027-1", title: "Spring 2027 round", sourceStudyId: String(source.id), testMethod: "", replicatesPerCell: "2", materials: "R1 Reference mix\nR2 Fly ash mix", resultsDue: "" }, coordinator),
    );
    expect(created.status).toBe(302);
    const round = await demoStudy("PT-2027-1");
    roundId = round.id;
    expect(round).toMatchObject({ kind: "proficiency", testMethod: source.testMethod, state: "draft", replicatesPerCell: 2 });
    const keys = (await db.select({ key: responses.key }).from(responses).where(eq(responses.studyId, round.id))).map((r) => r.key);
    expect(keys).toEqual(["holes", "surface"]);
    const settings = (await db.query.roundSettings.findFirst({ where: eq(roundSettings.studyId, round.id) }))!;
    // The approved statement's frozen analysis comes along, so σ_pt cannot move if anything changes elsewhere.
    expect((settings.precision as any).sourceCode).toBe("FF-2025-D");
    expect(new Set((settings.precision as any).analysis.groups.map((g: any) => g.response))).toEqual(new Set(["holes", "surface"]));
  });

  it("scores the submitted results and gates publication on the material checks", async () => {
    // Enrol every demo lab with a fresh code and submit results (as the lab pages would).
    const { cells, results } = await import("~/db/schema");
    const labRows = await db.select().from(labs);
    const materialRows = await db.select().from(materials).where(eq(materials.studyId, roundId));
    const responseRows = await db.select().from(responses).where(eq(responses.studyId, roundId));
    for (const [i, lab] of labRows.entries()) {
      const [enrollment] = await db.insert(enrollments).values({ studyId: roundId, labId: lab.id, labCode: `L${String(i + 1).padStart(2, "0")}`, state: "accepted" }).returning();
      for (const material of materialRows) {
        for (const response of responseRows) {
          const [cell] = await db.insert(cells).values({ enrollmentId: enrollment!.id, materialId: material.id, responseId: response.id, status: "submitted" }).returning();
          const base = (material.code === "R1" ? 8 : 7) + (response.key === "surface" ? 6 : 0) + ((i % 3) - 1);
          await db.insert(results).values([{ cellId: cell!.id, replicate: 1, value: base }, { cellId: cell!.id, replicate: 2, value: base + (i % 2) }]);
        }
      }
    }
    await db.update(studies).set({ state: "testing" }).where(eq(studies.id, roundId));
    const moved = await call(overview.action, post(`/rounds/${roundId}`, { intent: "transition", to: "checking" }, coordinator), params());
    expect(moved.status).toBe(302);

    const first = materialRows[0]!;
    const holes = responseRows.find((r) => r.key === "holes")!;
    // A reference value without its uncertainty is refused beside the field.
    const refused = await call(
      assignedValues.action,
      post(`/rounds/${roundId}/assigned-values`, { intent: "assignment", materialId: String(first.id), responseId: String(holes.id), assignedMethod: "reference", referenceValue: "8", referenceUncertainty: "", sigmaMethod: "precision", fixedSigma: "" }, coordinator),
      params(),
    );
    expect(refused.status).toBe(400);
    expect(refused.data.result.error.referenceUncertainty).toBeDefined();

    const page = await call(scores.loader, get(`/rounds/${roundId}/scores`, coordinator), params());
    expect(page.data.groups.every((g: any) => g.scores !== null)).toBe(true);
    expect(page.data.problems.join(" ")).toMatch(/homogeneity and stability/);
    const blocked = await call(scores.action, post(`/rounds/${roundId}/scores`, { intent: "publish", confirm: "yes" }, coordinator), params());
    expect(blocked.status).toBe(400);
    expect((await demoStudy("PT-2027-1")).state).toBe("checking");

    // A failing homogeneity check (one sample far off) still blocks until a justification is recorded.
    const failing = ["8 8", "8 9", "8 8", "12 12", "8 8", "9 8", "8 8", "8 8", "8 9", "8 8"].join("\n");
    await call(materialChecks.action, post(`/rounds/${roundId}/material-checks`, { intent: "checks", materialId: String(first.id), responseId: String(holes.id), homogeneity: failing, stability: "8\n8", justification: "" }, coordinator), params());
    const checked = await call(materialChecks.loader, get(`/rounds/${roundId}/material-checks`, coordinator), params());
    expect(checked.data.groups[0].scored.homogeneity.passes).toBe(false);

    for (const material of materialRows) {
      for (const response of responseRows) {
        const data = ROUND_CHECKS[`${material.code}:${response.key}`]!;
        const isFailing = material.id === first.id && response.id === holes.id;
        await call(
          materialChecks.action,
          post(
            `/rounds/${roundId}/material-checks`,
            {
              intent: "checks",
              materialId: String(material.id),
              responseId: String(response.id),
              homogeneity: isFailing ? failing : data.homogeneity.map((p) => p.join(" ")).join("\n"),
              stability: data.stability.join("\n"),
              justification: isFailing ? "Sample 4 came from a bag opened for a trial batch; the other nine agree, and the shipped bags were sealed." : "",
            },
            coordinator,
          ),
          params(),
        );
      }
    }
    const published = await call(scores.action, post(`/rounds/${roundId}/scores`, { intent: "publish", confirm: "yes" }, coordinator), params());
    expect(published.status).toBe(302);
    expect((await demoStudy("PT-2027-1")).state).toBe("published");
    const frozen = await db.select().from(roundScores).where(eq(roundScores.studyId, roundId));
    expect(frozen).toHaveLength(labRows.length * 4);
    // Each lab's contact is told the letter is ready; the e-mail carries no score.
    const { emailOutbox } = await import("~/db/schema");
    const told = await db.select().from(emailOutbox).where(eq(emailOutbox.subject, "PT-2027-1: your proficiency letter is ready"));
    expect(told.length).toBe(labRows.filter((l) => l.contactEmail).length);
    expect(told.every((m) => m.text.includes(`/lab/rounds/${roundId}/letter`) && !/[+−-]\d+\.\d{2}\b/.test(m.text))).toBe(true);

    // Once published, the choices no longer change.
    const late = await call(
      assignedValues.action,
      post(`/rounds/${roundId}/assigned-values`, { intent: "assignment", materialId: String(first.id), responseId: String(holes.id), assignedMethod: "consensus", sigmaMethod: "robust", referenceValue: "", referenceUncertainty: "", fixedSigma: "" }, coordinator),
      params(),
    );
    expect(late.status).toBe(400);
  });

  it("answers 404 to a lab outside the round and to round pages opened on a precision study", async () => {
    const outsider = await db.insert(labs).values({ name: "Lab Outside The Round" }).returning();
    const { labMembers, users } = await import("~/db/schema");
    const [user] = await db.insert(users).values({ email: "outside-analyst@ringbatch.example", name: "Outside Analyst", role: "analyst" }).returning();
    await db.insert(labMembers).values({ labId: outsider[0]!.id, userId: user!.id });
    const { sessionCookieFor } = await import("../support/routes");
    const outside = await call(letterPage.loader, get(`/lab/rounds/${roundId}/letter`, await sessionCookieFor(user!.id)), params());
    expect(outside.status).toBe(404);
    const precision = await demoStudy("FF-2026-A");
    const wrongKind = await call(report.loader, get(`/rounds/${precision.id}/report`, coordinator), { roundId: String(precision.id) });
    expect(wrongKind.status).toBe(404);
  });
});

describe("replicates of a round on the setup page", () => {
  const details = (round: { code: string; title: string; testMethod: string; significanceLevel: number }, replicatesPerCell: string) => ({
    intent: "study",
    code: round.code,
    title: `${round.title} (renamed)`,
    testMethod: round.testMethod,
    replicatesPerCell,
    significanceLevel: String(round.significanceLevel),
    targetSurfaceRating: "",
    enrollmentDeadline: "",
    shipDate: "",
    resultsDue: "",
    notes: "",
  });

  it("keeps a round of 1 replicate editable, accepts 1–2 and refuses 3 beside the field", async () => {
    const created = await call(newRound.action, post("/rounds/new", { code: "PT-2027-9", title: "Single-replicate round", sourceStudyId: "", testMethod: "Float finishing test of fresh concrete", replicatesPerCell: "1", materials: "R1", resultsDue: "" }, coordinator));
    expect(created.status).toBe(302);
    const round = await demoStudy("PT-2027-9");
    expect(round.replicatesPerCell).toBe(1);
    const at = { studyId: String(round.id) };
    const renamed = await call(setupPage.action, post(`/studies/${round.id}/setup`, details(round, "1"), coordinator), at);
    expect(renamed.status).toBe(302);
    expect((await demoStudy("PT-2027-9")).title).toBe("Single-replicate round (renamed)");
    expect((await call(setupPage.action, post(`/studies/${round.id}/setup`, details(round, "2"), coordinator), at)).status).toBe(302);
    const three = await call(setupPage.action, post(`/studies/${round.id}/setup`, details(round, "3"), coordinator), at);
    expect(three.status).toBe(400);
    expect(three.data.result.error.replicatesPerCell).toEqual(["A round takes 1 or 2 replicates per lab and material."]);
    expect((await demoStudy("PT-2027-9")).replicatesPerCell).toBe(2);
  });

  it("still asks a precision study for at least 2, beside the field", async () => {
    const study = await demoStudy("FF-2026-A");
    await db.update(studies).set({ state: "draft" }).where(eq(studies.id, study.id));
    try {
      const one = await call(setupPage.action, post(`/studies/${study.id}/setup`, details(study, "1"), coordinator), { studyId: String(study.id) });
      expect(one.status).toBe(400);
      expect(one.data.result.error.replicatesPerCell).toEqual(["Use at least 2 replicates per cell (repeatability needs two)."]);
      expect((await demoStudy("FF-2026-A")).replicatesPerCell).toBe(study.replicatesPerCell);
    } finally {
      await db.update(studies).set({ state: study.state }).where(eq(studies.id, study.id));
    }
  });
});

describe("starting a round from a published precision study", () => {
  const frame = async (code: string, cookie: string) => {
    const study = await demoStudy(code);
    return call(studyLayout.loader, get(`/studies/${study.id}`, cookie), { studyId: String(study.id) });
  };

  it("is offered to the coordinator on a published study's pages, and the new-round form starts from it", async () => {
    const published = await frame("FF-2025-D", coordinator);
    expect(published.status).toBe(200);
    expect(published.data.canStartRound).toBe(true);
    const source = await demoStudy("FF-2025-D");
    const form = await call(newRound.loader, get(`/rounds/new?from=${source.id}`, coordinator));
    expect(form.data.from).toBe(String(source.id));
    expect(form.data.sources.map((s: { id: number }) => s.id)).toContain(source.id);
  });

  it("is not offered before publication, nor to a reviewer or an admin", async () => {
    expect((await frame("FF-2026-A", coordinator)).data.canStartRound).toBe(false);
    expect((await frame("FF-2025-D", await demoCookie("admin@ringbatch.example"))).data.canStartRound).toBe(false);
    const reviewerView = await frame("FF-2025-D", await demoCookie("reviewer1@ringbatch.example"));
    expect(reviewerView.status).toBe(200);
    expect(reviewerView.data.canStartRound).toBe(false);
  });
});
