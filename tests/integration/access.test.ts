import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { studies } from "~/db/schema";
import * as adminLabs from "~/routes/admin/labs";
import * as adminUsers from "~/routes/admin/users";
import * as lab from "~/routes/lab/index";
import * as review from "~/routes/review/index";
import * as studyList from "~/routes/studies/index";
import * as studyOverview from "~/routes/studies/study/overview";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "../support/database";
import { demoCookie } from "../support/demo";
import { call, get } from "../support/routes";

let checkingStudyId: string;

beforeAll(async () => {
  await useFreshDatabase();
  await seedDemo(db);
  const study = await db.query.studies.findFirst({ where: eq(studies.code, "FF-2026-A") });
  checkingStudyId = String(study!.id);
});

describe("role guards", () => {
  it("sends anyone signed out to the sign-in page, remembering where they were going", async () => {
    const outcome = await call(studyList.loader, get("/studies"));
    expect(outcome.status).toBe(302);
    expect(outcome.headers.get("Location")).toBe("/login?redirectTo=%2Fstudies");
  });

  it("answers 404, not 403, when a role opens another role's home", async () => {
    const analyst = await demoCookie("analyst1@ringbatch.example");
    const reviewer = await demoCookie("reviewer1@ringbatch.example");
    expect((await call(studyList.loader, get("/studies", analyst))).status).toBe(404);
    expect((await call(adminUsers.loader, get("/admin/users", analyst))).status).toBe(404);
    expect((await call(adminLabs.loader, get("/admin/labs", reviewer))).status).toBe(404);
    expect((await call(lab.loader, get("/lab", reviewer))).status).toBe(404);
    expect((await call(review.loader, get("/review", analyst))).status).toBe(404);
  });

  it("shows the study overview to its coordinator and the admin only", async () => {
    const params = { studyId: checkingStudyId };
    const coordinator = await call(studyOverview.loader, get(`/studies/${checkingStudyId}`, await demoCookie("coordinator@ringbatch.example")), params);
    expect(coordinator.status).toBe(200);
    expect(coordinator.data.matrix.rows).toHaveLength(8);
    expect((await call(studyOverview.loader, get("/", await demoCookie("admin@ringbatch.example")), params)).status).toBe(200);
    for (const email of ["analyst1@ringbatch.example", "reviewer1@ringbatch.example"]) {
      expect((await call(studyOverview.loader, get("/", await demoCookie(email)), params)).status).toBe(404);
    }
    const missing = await call(studyOverview.loader, get("/", await demoCookie("coordinator@ringbatch.example")), { studyId: "999999" });
    expect(missing.status).toBe(404);
  });

  it("lists only the analyst's own lab on the lab home", async () => {
    const outcome = await call(lab.loader, get("/lab", await demoCookie("analyst1@ringbatch.example")));
    const labNames = new Set(outcome.data.enrollments.map((e: { labName: string }) => e.labName));
    expect([...labNames]).toEqual(["Quarrow County Materials Lab"]);
    // The published study, the one in checking, the one in testing, and the three proficiency rounds.
    expect(outcome.data.enrollments).toHaveLength(6);
  });

  it("lists the studies assigned to a reviewer", async () => {
    const outcome = await call(review.loader, get("/review", await demoCookie("reviewer2@ringbatch.example")));
    expect(outcome.data.studies.map((s: { code: string }) => s.code)).toEqual(["FF-2025-D", "FF-2026-A", "FF-2026-B"]);
  });
});
