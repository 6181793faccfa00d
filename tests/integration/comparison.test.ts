import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { comparisons, precisionStatements, studies } from "~/db/schema";
import { withinLabCriticalDifference } from "~/lib/comparison";
import * as history from "~/routes/compare/index";
import * as newComparison from "~/routes/compare/new";
import * as sheet from "~/routes/compare/sheet";
import { PUBLISHED_STUDY_CODE } from "../../seed/toolkit-demo";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "../support/database";
import { demoCookie } from "../support/demo";
import { call, get, post } from "../support/routes";

let reviewer: string;
let statementId: number;

beforeAll(async () => {
  await useFreshDatabase();
  await seedDemo(db);
  reviewer = await demoCookie("reviewer2@ringbatch.example");
  const study = (await db.query.studies.findFirst({ where: eq(studies.code, PUBLISHED_STUDY_CODE) }))!;
  statementId = (await db.query.precisionStatements.findFirst({ where: eq(precisionStatements.studyId, study.id) }))!.id;
});

const form = (overrides: Record<string, string> = {}) => ({
  basis: `${statementId}:holes`,
  setting: "same-lab",
  referenceLabel: "Reference",
  referenceValues: "8, 9, 8",
  trialLabel: "Trial",
  trialValues: "11 12 12",
  ...overrides,
});

describe("mixture comparison", () => {
  it("offers only published statements", async () => {
    const page = await call(newComparison.loader, get("/compare/new", reviewer));
    expect(page.data.statements.map((s: { studyCode: string }) => s.studyCode)).toEqual([PUBLISHED_STUDY_CODE]);
  });

  it("refuses a result that is not a number beside its field, and saves nothing", async () => {
    const outcome = await call(newComparison.action, post("/compare/new", form({ trialValues: "11, twelve" }), reviewer));
    expect(outcome.status).toBe(400);
    expect(outcome.data.result.error.trialValues).toEqual(['"twelve" is not a number; separate results with commas or spaces.']);
    expect(await db.select().from(comparisons)).toHaveLength(1); // the demo's own
  });

  it("refuses a statement that is not published beside the statement field", async () => {
    const draft = (await db.query.studies.findFirst({ where: eq(studies.code, "FF-2026-A") }))!;
    const [fake] = await db.insert(precisionStatements).values({ studyId: draft.id, version: 1, textE691: "x".repeat(30), textC670: "x".repeat(30), snapshot: {}, dataVersion: 1, createdBy: 1 }).returning();
    const outcome = await call(newComparison.action, post("/compare/new", form({ basis: `${fake!.id}:holes` }), reviewer));
    expect(outcome.status).toBe(400);
    expect(outcome.data.result.error.basis).toEqual(["That statement is not a published one; choose another."]);
  });

  it("saves a comparison tied to the statement version, in the person's own history, with its sheet", async () => {
    const outcome = await call(newComparison.action, post("/compare/new", form(), reviewer));
    expect(outcome.status).toBe(302);
    const id = Number(outcome.headers.get("Location")!.split("/").pop());
    const page = await call(sheet.loader, get(`/compare/${id}`, reviewer), { comparisonId: String(id) });
    const { comparison } = page.data.comparison.outcome;
    expect(page.data.comparison.statementVersion).toBe(1);
    expect(comparison.difference).toBeCloseTo(35 / 3 - 25 / 3, 12);
    expect(comparison.criticalDifference).toBeCloseTo(withinLabCriticalDifference(comparison.precision.sr, 3, 3), 12);
    const mine = await call(history.loader, get("/compare", reviewer));
    expect(mine.data.comparisons.map((c: { id: number }) => c.id)).toEqual([id]);
    // someone else's comparison is not found
    expect((await call(sheet.loader, get(`/compare/${id}`, await demoCookie("analyst1@ringbatch.example")), { comparisonId: String(id) })).status).toBe(404);
  });
});

describe("a kept comparison", () => {
  it("cannot be changed in the database, whoever writes", async () => {
    const [kept] = await db.select().from(comparisons).limit(1);
    const refusal = await db.update(comparisons).set({ trialLabel: "changed" }).where(eq(comparisons.id, kept!.id)).then(
      () => null,
      (error: Error) => `${error.message} ${(error.cause as Error | undefined)?.message ?? ""}`,
    );
    expect(refusal).toContain("comparisons are kept as made");
    expect((await db.query.comparisons.findFirst({ where: eq(comparisons.id, kept!.id) }))!.trialLabel).toBe(kept!.trialLabel);
  });
});
