/**
 * The review tests' common ground: a fresh demo, the checking study
 * FF-2026-A, signed-in coordinator and reviewers, and the calls they make.
 */
import { eq } from "drizzle-orm";
import { beforeAll } from "vitest";
import { db } from "~/db/client.server";
import { studies, users } from "~/db/schema";
import * as reviewPage from "~/routes/review/study/ballot";
import * as statementPage from "~/routes/studies/study/statement";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "./database";
import { demoCookie } from "./demo";
import { readReply } from "./replies";
import { call, get, post } from "./routes";

export function useReviewRound() {
  const round = {
    studyId: "",
    coordinator: "",
    reviewers: [] as string[],
    /** User ids of reviewer1…3; reviewer1 chairs the rounds these tests open. */
    reviewerIds: [] as number[],
    send: (statementId: number | string) => round.coordinatorDoes({ intent: "send", statementId: String(statementId), chairId: String(round.reviewerIds[0]) }),
    coordinatorDoes: async (fields: Record<string, string>) =>
      readReply(await call(statementPage.action, post(`/studies/${round.studyId}/statement`, fields, round.coordinator), { studyId: round.studyId })),
    reviewerDoes: (i: number, fields: Record<string, string>) => call(reviewPage.action, post(`/review/${round.studyId}`, fields, round.reviewers[i]), { studyId: round.studyId }),
    statementNow: async () => (await call(statementPage.loader, get(`/studies/${round.studyId}/statement`, round.coordinator), { studyId: round.studyId })).data,
    studyState: async () => (await db.query.studies.findFirst({ where: eq(studies.id, Number(round.studyId)) }))!.state,
  };
  beforeAll(async () => {
    await useFreshDatabase();
    await seedDemo(db);
    round.studyId = String((await db.query.studies.findFirst({ where: eq(studies.code, "FF-2026-A") }))!.id);
    round.coordinator = await demoCookie("coordinator@ringbatch.example");
    for (const n of [1, 2, 3]) {
      round.reviewers.push(await demoCookie(`reviewer${n}@ringbatch.example`));
      round.reviewerIds.push((await db.query.users.findFirst({ where: eq(users.email, `reviewer${n}@ringbatch.example`) }))!.id);
    }
  });
  return round;
}
