import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { ruggednessResults } from "~/db/schema";
import * as conclusions from "~/routes/ruggedness/study/conclusions";
import * as effects from "~/routes/ruggedness/study/effects";
import * as factors from "~/routes/ruggedness/study/factors";
import * as newStudy from "~/routes/ruggedness/new";
import * as results from "~/routes/ruggedness/study/results";
import * as precisionStudy from "~/routes/studies/study/layout";
import { RUGGEDNESS_STUDY_CODE } from "../../seed/toolkit-demo";
import { demoCookie, demoStudy, useDemoDatabase } from "../support/demo";
import { call, get, post } from "../support/routes";

let coordinator: string;
let demoStudyId: number;

beforeAll(async () => {
  await useDemoDatabase();
  coordinator = await demoCookie("coordinator@ringbatch.example");
  demoStudyId = (await demoStudy(RUGGEDNESS_STUDY_CODE)).id;
});

const at = (id: number) => ({ ruggednessStudyId: String(id) });

describe("the demo ruggedness study", () => {
  it("finds the one factor that matters — the time after placement when floating starts — for both responses", async () => {
    const page = await call(effects.loader, get(`/ruggedness/${demoStudyId}/effects`, coordinator), at(demoStudyId));
    expect(page.status).toBe(200);
    for (const { analysis } of page.data.responses) {
      expect(analysis.status).toBe("computed");
      expect(analysis.scatter.basis).toBe("replicates");
      const significant = analysis.columns.filter((c: { test: { significant: boolean } }) => c.test.significant).map((c: { label: string }) => c.label);
      expect(significant).toEqual(["Time after placement when floating starts"]);
    }
    const summary = await call(conclusions.loader, get(`/ruggedness/${demoStudyId}/conclusions`, coordinator), at(demoStudyId));
    expect(summary.data.responses[0].analysis.columns[0].conclusion).toMatch(/^Hold float angle within the tested range/);
  });

  it("opened from the coordinator's list of studies, leads to its own pages", async () => {
    const outcome = await call(precisionStudy.loader, get(`/studies/${demoStudyId}`, coordinator), { studyId: String(demoStudyId) });
    expect(outcome.status).toBe(302);
    expect(outcome.headers.get("Location")).toBe(`/ruggedness/${demoStudyId}`);
  });
});

describe("a new ruggedness study", () => {
  let studyId: number;

  it("refuses a taken code beside the code field", async () => {
    const outcome = await call(newStudy.action, post("/ruggedness/new", { code: RUGGEDNESS_STUDY_CODE, title: "Again", template: "float_finishing" }, coordinator));
    expect(outcome.status).toBe(400);
    expect(outcome.data.result.error.code).toEqual(["Another study already has this code."]);
  });

  it("for another test method needs its name and its response, each asked for beside its field", async () => {
    const outcome = await call(newStudy.action, post("/ruggedness/new", { code: "RG-SLUMP-1", title: "Slump screening", template: "custom" }, coordinator));
    expect(outcome.status).toBe(400);
    expect(outcome.data.result.error).toMatchObject({ testMethod: ["Name the test method."], responseName: ["Name the response the test measures."] });
    const created = await call(newStudy.action, post("/ruggedness/new", { code: "RG-SLUMP-1", title: "Slump screening", template: "custom", testMethod: "Slump of fresh concrete", responseName: "Slump", responseUnit: "mm" }, coordinator));
    expect(created.status).toBe(302);
  });

  it("is created with the float test's responses", async () => {
    const outcome = await call(newStudy.action, post("/ruggedness/new", { code: "RG-TEST-1", title: "Screening", template: "float_finishing" }, coordinator));
    expect(outcome.status).toBe(302);
    studyId = (await demoStudy("RG-TEST-1")).id;
    expect(outcome.headers.get("Location")).toBe(`/ruggedness/${studyId}`);
  });

  it("refuses a factor without its high setting, beside that field, and stores nothing", async () => {
    const outcome = await call(
      factors.action,
      post(`/ruggedness/${studyId}`, { replicates: "1", "factors[0].name": "Float angle", "factors[0].low": "5", "factors[1].name": "Operator", "factors[1].low": "A", "factors[1].high": "B" }, coordinator),
      at(studyId),
    );
    expect(outcome.status).toBe(400);
    expect(outcome.data.result.error["factors[0].high"]).toEqual(["Give the high setting."]);
    const page = await call(factors.loader, get(`/ruggedness/${studyId}`, coordinator), at(studyId));
    expect(page.data.setup.plan).toBeNull();
  });

  it("lays out 8 runs for 6 factors, with one dummy column and a random run order", async () => {
    const fields: Record<string, string> = { replicates: "1" };
    ["Float angle", "Start time", "Strike-off height", "Hole depth", "Operator", "Float material"].forEach((name, i) => {
      fields[`factors[${i}].name`] = name;
      fields[`factors[${i}].low`] = "low";
      fields[`factors[${i}].high`] = "high";
    });
    const outcome = await call(factors.action, post(`/ruggedness/${studyId}`, fields, coordinator), at(studyId));
    expect(outcome.status).toBe(302);
    const page = await call(factors.loader, get(`/ruggedness/${studyId}`, coordinator), at(studyId));
    expect(page.data.setup.plan.runs).toBe(8);
    expect([...page.data.setup.plan.runOrder].sort()).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
  });

  it("refuses a fractional pass count beside its box, and an empty form, keeping what is stored", async () => {
    const fractional = await call(results.action, post(`/ruggedness/${studyId}/results`, { r1_1_holes: "7.5" }, coordinator), at(studyId));
    expect(fractional.status).toBe(400);
    expect(fractional.data.result.error.r1_1_holes).toEqual(["A pass count is a whole number."]);
    const saved = await call(results.action, post(`/ruggedness/${studyId}/results`, { r1_1_holes: "7", r2_1_holes: "9" }, coordinator), at(studyId));
    expect(saved.status).toBe(302);
    const empty = await call(results.action, post(`/ruggedness/${studyId}/results`, {}, coordinator), at(studyId));
    expect(empty.status).toBe(400);
    expect(empty.data.result.error[""]).toEqual(["Enter at least one result."]);
    expect(await db.select().from(ruggednessResults).where(eq(ruggednessResults.studyId, studyId))).toHaveLength(2);
  });

  it("fixes the factors once results are in", async () => {
    const outcome = await call(factors.action, post(`/ruggedness/${studyId}`, { replicates: "1", "factors[0].name": "A", "factors[0].low": "1", "factors[0].high": "2", "factors[1].name": "B", "factors[1].low": "1", "factors[1].high": "2" }, coordinator), at(studyId));
    expect(outcome.status).toBe(400);
    expect(outcome.data.result.error.factors[0]).toBe("The factors and the design are fixed once results are entered.");
  });

  it("is not a precision study's page, nor another coordinator's", async () => {
    const precision = (await demoStudy("FF-2026-A")).id;
    expect((await call(effects.loader, get(`/ruggedness/${precision}/effects`, coordinator), at(precision))).status).toBe(404);
    expect((await call(effects.loader, get(`/ruggedness/${studyId}/effects`, await demoCookie("reviewer1@ringbatch.example")), at(studyId))).status).toBe(404);
  });
});
