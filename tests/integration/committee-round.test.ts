/**
 * A committee round that an objection cannot be removed from: the reviewers
 * are fixed when the statement is sent, every objection gets a written
 * answer, a "not upheld" answer goes back to the objector, and a maintained
 * objection goes to the chair's ruling. Publication needs every reviewer's
 * vote and two-thirds approval of the votes cast (the quorum the statement
 * page states). Everything goes through the route modules.
 */
import { and, eq, gt } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { emailOutbox, reviewRounds, roundReviewers, studies } from "~/db/schema";
import * as reviewPage from "~/routes/review/study/ballot";
import * as setupPage from "~/routes/studies/study/setup";
import * as statementPage from "~/routes/studies/study/statement";
import { errorsOf, readReply } from "../support/replies";
import { call, get, post } from "../support/routes";
import { useReviewRound } from "../support/review";

const round = useReviewRound();
const { coordinatorDoes, reviewerDoes, statementNow, studyState } = round;
const setupDoes = async (fields: Record<string, string>) => readReply(await call(setupPage.action, post(`/studies/${round.studyId}/setup`, fields, round.coordinator), { studyId: round.studyId }));
const objectionOf = async (reviewerIndex: number) => (await statementNow()).votes.find((v: { reviewerId: number }) => v.reviewerId === round.reviewerIds[reviewerIndex]);

async function mailSince(id: number) {
  return db.select().from(emailOutbox).where(gt(emailOutbox.id, id));
}
const lastMailId = async () => (await db.select({ id: emailOutbox.id }).from(emailOutbox)).reduce((max, m) => Math.max(max, m.id), 0);

async function openNewRound() {
  expect((await coordinatorDoes({ intent: "freeze" })).status).toBe(302);
  const { latest } = await statementNow();
  expect((await round.send(latest.id)).status).toBe(302);
  expect(await studyState()).toBe("in_review");
}

describe("a committee round", () => {
  it("refuses a chair who is not one of the study's reviewers", async () => {
    await coordinatorDoes({ intent: "freeze" });
    const { latest } = await statementNow();
    const refused = await coordinatorDoes({ intent: "send", statementId: String(latest.id), chairId: "999999" });
    expect(refused.status).toBe(409);
    expect(refused.errors.form).toMatch(/chair among the study/);
    expect(await studyState()).toBe("checking");
  });

  it("fixes the reviewers when it opens; the setup page can neither change them nor move the study out of review", async () => {
    await openNewRound();
    const [open] = await db.select().from(reviewRounds).where(eq(reviewRounds.outcome, "open"));
    const members = await db.select().from(roundReviewers).where(eq(roundReviewers.roundId, open!.id));
    expect(members.map((m) => m.userId).sort()).toEqual([...round.reviewerIds].sort());
    expect(open!.chairId).toBe(round.reviewerIds[0]);

    const removal = await setupDoes({ intent: "reviewer-remove", id: String(round.reviewerIds[2]) });
    expect(removal.status).toBe(400);
    expect(removal.errors.form).toBe("The committee of a round is fixed while the statement is in review.");
    const back = await setupDoes({ intent: "transition", to: "checking" });
    expect(back.errors.to).toMatch(/statement page/);
    const study = (await db.query.studies.findFirst({ where: eq(studies.id, Number(round.studyId)) }))!;
    const details = await setupDoes({ intent: "study", code: study.code, title: "A new title behind the committee's back", testMethod: study.testMethod, replicatesPerCell: "3", significanceLevel: "0.005", targetSurfaceRating: "2", enrollmentDeadline: "", shipDate: "", resultsDue: "", notes: "" });
    expect(details.status).toBe(400);
    expect(details.errors.form).toBe("Study details are fixed once the statement goes to the committee.");
    expect(await studyState()).toBe("in_review");
    expect((await db.query.studies.findFirst({ where: eq(studies.id, Number(round.studyId)) }))!.title).toBe(study.title);
  });

  it("e-mails the coordinator on an objection and the objector on the answer", async () => {
    const before = await lastMailId();
    await reviewerDoes(0, { intent: "vote", choice: "approve", reason: "" });
    await reviewerDoes(1, { intent: "vote", choice: "approve", reason: "" });
    expect((await reviewerDoes(2, { intent: "vote", choice: "object", reason: "The reproducibility of M4 rests on two labs only." })).status).toBe(302);
    const onObjection = await mailSince(before);
    expect(onObjection.map((m) => m.to)).toContain("coordinator@ringbatch.example");
    expect(onObjection.find((m) => m.to === "coordinator@ringbatch.example")!.text).toContain("The reproducibility of M4 rests on two labs only.");

    const blocked = await coordinatorDoes({ intent: "publish" });
    expect(blocked.status).toBe(409);
    expect(blocked.errors.form).toMatch(/no answer yet/);

    const objection = await objectionOf(2);
    const afterObjection = await lastMailId();
    const rationale = "M4 has six labs with computed statistics; see the consistency table.";
    expect((await coordinatorDoes({ intent: "answer", voteId: String(objection.id), answer: "not_upheld", rationale })).status).toBe(302);
    const toObjector = (await mailSince(afterObjection)).filter((m) => m.to === "reviewer3@ringbatch.example");
    expect(toObjector).toHaveLength(1);
    expect(toObjector[0]!.text).toContain(rationale);
  });

  it("does not let the coordinator publish over a 'not upheld' answer the objector has not accepted", async () => {
    const blocked = await coordinatorDoes({ intent: "publish" });
    expect(blocked.errors.form).toMatch(/awaits its reviewer's reply/);
    // The coordinator has no way to rule: the ballot page is the committee's.
    const asCoordinator = await call(reviewPage.action, post(`/review/${round.studyId}`, { intent: "rule", voteId: String((await objectionOf(2)).id), ruling: "not_upheld", reason: "I overrule this myself." }, round.coordinator), { studyId: round.studyId });
    expect(asCoordinator.status).toBe(404);
  });

  it("sends a maintained objection to the chair only, who rules with a reason", async () => {
    const before = await lastMailId();
    const maintainedWithoutReason = await reviewerDoes(2, { intent: "reply", reply: "maintained", note: "" });
    expect(maintainedWithoutReason.status).toBe(400);
    expect(errorsOf(maintainedWithoutReason).note).toMatch(/why you maintain/);
    expect((await reviewerDoes(2, { intent: "reply", reply: "maintained", note: "Six labs is the usual minimum, not a comfortable number." })).status).toBe(302);
    expect((await mailSince(before)).map((m) => m.to)).toContain("reviewer1@ringbatch.example");
    expect((await coordinatorDoes({ intent: "publish" })).errors.form).toMatch(/awaits the chair's ruling/);

    const objection = await objectionOf(2);
    const notChair = await reviewerDoes(1, { intent: "rule", voteId: String(objection.id), ruling: "not_upheld", reason: "I am not the chair but try anyway." });
    expect(notChair.status).toBe(409);
    expect(errorsOf(notChair)[""]).toMatch(/Only the chair/);
    const noReason = await reviewerDoes(0, { intent: "rule", voteId: String(objection.id), ruling: "upheld", reason: "" });
    expect(noReason.status).toBe(400);
    expect(errorsOf(noReason).reason).toBeDefined();
  });

  it("returns the statement and the study to checking when the chair upholds it, closing the round", async () => {
    const objection = await objectionOf(2);
    expect((await reviewerDoes(0, { intent: "rule", voteId: String(objection.id), ruling: "upheld", reason: "Two more labs on M4 would settle it; revise the statement." })).status).toBe(302);
    expect(await studyState()).toBe("checking");
    expect((await statementNow()).latest.state).toBe("returned");
    const rounds = await db.select().from(reviewRounds);
    expect(rounds.map((r) => r.outcome)).toEqual(["returned"]);
  });

  it("publishes a new round once the maintained objection is ruled not upheld, showing the tally", async () => {
    await openNewRound();
    await reviewerDoes(0, { intent: "vote", choice: "approve", reason: "" });
    await reviewerDoes(1, { intent: "vote", choice: "approve", reason: "" });
    await reviewerDoes(2, { intent: "vote", choice: "object", reason: "Still only six labs on M4, in my view too few." });
    const objection = await objectionOf(2);
    await coordinatorDoes({ intent: "answer", voteId: String(objection.id), answer: "not_upheld", rationale: "E691 accepts six labs; the statement says how many took part." });
    await reviewerDoes(2, { intent: "reply", reply: "maintained", note: "I still think six is too few for this method." });
    const own = await reviewerDoes(0, { intent: "vote", choice: "object", reason: "Trying to object after approving, as chair." });
    expect(own.status).toBe(302);
    // The chair's new objection needs its own answer before anything else.
    expect((await coordinatorDoes({ intent: "publish" })).errors.form).toMatch(/no answer yet/);
    await reviewerDoes(0, { intent: "vote", choice: "approve", reason: "" });
    expect((await reviewerDoes(0, { intent: "rule", voteId: String(objection.id), ruling: "not_upheld", reason: "The statement names the number of labs; the committee accepts six." })).status).toBe(302);

    const page = await call(statementPage.loader, get(`/studies/${round.studyId}/statement`, round.coordinator), { studyId: round.studyId });
    expect(page.data.publication.tally).toEqual({ reviewers: 3, voted: 3, approve: 2, object: 1, abstain: 0, withdrawn: 0 });
    expect((await coordinatorDoes({ intent: "publish" })).status).toBe(302);
    expect(await studyState()).toBe("published");
    const rounds = await db.select().from(reviewRounds).where(and(eq(reviewRounds.outcome, "published")));
    expect(rounds).toHaveLength(1);
  });
});
