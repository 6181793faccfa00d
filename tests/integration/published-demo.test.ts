import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { materials, studies } from "~/db/schema";
import * as labTasks from "~/routes/lab/study/tasks";
import * as ballot from "~/routes/review/study/ballot";
import * as analysis from "~/routes/studies/study/analysis";
import * as labsPage from "~/routes/studies/study/labs";
import * as material from "~/routes/studies/study/material";
import * as overview from "~/routes/studies/study/overview";
import * as report from "~/routes/studies/study/report";
import * as resultsPage from "~/routes/studies/study/results";
import * as setup from "~/routes/studies/study/setup";
import * as shipments from "~/routes/studies/study/shipments";
import * as statement from "~/routes/studies/study/statement";
import { PUBLISHED_STUDY_CODE } from "../../seed/toolkit-demo";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "../support/database";
import { demoCookie } from "../support/demo";
import { call, get } from "../support/routes";

let studyId: number;
let materialId: number;

beforeAll(async () => {
  await useFreshDatabase();
  await seedDemo(db);
  studyId = (await db.query.studies.findFirst({ where: eq(studies.code, PUBLISHED_STUDY_CODE) }))!.id;
  materialId = (await db.query.materials.findFirst({ where: eq(materials.studyId, studyId) }))!.id;
});

describe("the published demo study", () => {
  it("opens on every coordinator page", async () => {
    const cookie = await demoCookie("coordinator@ringbatch.example");
    const params = { studyId: String(studyId), materialId: String(materialId) };
    for (const page of [overview, setup, labsPage, shipments, resultsPage, analysis, statement, report, material]) {
      const outcome = await call(page.loader, get(`/studies/${studyId}`, cookie), params);
      expect(outcome.status, page === material ? "material" : String(Object.keys(page))).toBe(200);
    }
    const published = await call(statement.loader, get(`/studies/${studyId}/statement`, cookie), params);
    expect(published.data.latest.state).toBe("approved");
  });

  it("opens for its reviewers and its labs", async () => {
    const params = { studyId: String(studyId) };
    expect((await call(ballot.loader, get(`/review/${studyId}`, await demoCookie("reviewer3@ringbatch.example")), params)).status).toBe(200);
    expect((await call(labTasks.loader, get(`/lab/studies/${studyId}`, await demoCookie("analyst4@ringbatch.example")), params)).status).toBe(200);
  });
});
