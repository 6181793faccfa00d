import { describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { emailOutbox } from "~/db/schema";
import * as precision from "~/routes/api/v1/study-precision";
import * as resultsJson from "~/routes/api/v1/study-results";
import * as analysisPage from "~/routes/studies/study/analysis";
import * as reportPage from "~/routes/studies/study/report";
import * as reviewList from "~/routes/review/index";
import * as reviewPage from "~/routes/review/study/ballot";
import { DEMO_LABS } from "../../seed/demo-data";
import { demoCookie } from "../support/demo";
import { errorsOf } from "../support/replies";
import { call, get, post } from "../support/routes";
import { useReviewRound } from "../support/review";

const round = useReviewRound();
const { coordinatorDoes, reviewerDoes, statementNow, studyState } = round;
const reviewPath = () => `/review/${round.studyId}`;

function expectNoLabName(value: unknown, where: string) {
  const text = JSON.stringify(value);
  for (const lab of DEMO_LABS) expect(text, `${lab.name} in ${where}`).not.toContain(lab.name);
}

describe("a review round from freezing to publication", () => {
  it("freezes a version with generated texts tied to the data version", async () => {
    await call(analysisPage.action, post(`/studies/${round.studyId}/analysis`, { intent: "decide", lab: "L01", material: "M3", response: "holes", decision: "excluded", reason: "Lab found a mis-set float angle on replicate 3." }, round.coordinator), { studyId: round.studyId });
    const frozen = await coordinatorDoes({ intent: "freeze" });
    expect(frozen.status).toBe(302);
    const { latest, study } = await statementNow();
    expect(latest.version).toBe(1);
    expect(latest.dataVersion).toBe(study.dataVersion);
    expect(latest.textE691).toContain("8 laboratories");
    expect(latest.textE691).toContain("lab L01, material M3, holes: Lab found a mis-set float angle");
    expect(latest.textC670).toContain("d2s");
  });

  it("keeps the figures when the round.coordinator edits the text, and checks the text's length", async () => {
    const { latest } = await statementNow();
    const tooShort = await coordinatorDoes({ intent: "save-text", statementId: String(latest.id), textE691: "short", textC670: latest.textC670 });
    expect(tooShort.status).toBe(400);
    expect(tooShort.errors.textE691).toMatch(/20 characters/);
    const edited = `${latest.textE691}\n\nEdited by the round.coordinator.`;
    expect((await coordinatorDoes({ intent: "save-text", statementId: String(latest.id), textE691: edited, textC670: latest.textC670 })).status).toBe(302);
    const after = (await statementNow()).latest;
    expect(after.textE691).toBe(edited);
    expect(after.snapshot).toEqual(latest.snapshot);
  });

  it("refuses to send a version whose data changed after freezing", async () => {
    await call(analysisPage.action, post(`/studies/${round.studyId}/analysis`, { intent: "decide", lab: "L08", material: "M2", response: "surface", decision: "retained", reason: "The lab confirmed the counts are right." }, round.coordinator), { studyId: round.studyId });
    const { latest } = await statementNow();
    const refused = await round.send(latest.id);
    expect(refused.status).toBe(409);
    expect(refused.errors.form).toMatch(/freeze a new version/);
  });

  it("sends the new version: study in review, round.reviewers e-mailed, no more decisions", async () => {
    await coordinatorDoes({ intent: "freeze" });
    const { latest } = await statementNow();
    expect(latest.version).toBe(2);
    const before = (await db.select().from(emailOutbox)).length;
    expect((await round.send(latest.id)).status).toBe(302);
    expect(await studyState()).toBe("in_review");
    const mail = (await db.select().from(emailOutbox)).slice(before);
    expect(mail.map((m) => m.to).sort()).toEqual(["reviewer1@ringbatch.example", "reviewer2@ringbatch.example", "reviewer3@ringbatch.example"]);
    const decision = await call(analysisPage.action, post(`/studies/${round.studyId}/analysis`, { intent: "decide", lab: "L08", material: "M2", response: "surface", decision: "excluded", reason: "Too late to change anything now." }, round.coordinator), { studyId: round.studyId });
    expect(decision.status).toBe(409);
    const list = await call(reviewList.loader, get("/review", round.reviewers[0]));
    expect(list.data.studies.find((s: any) => s.id === Number(round.studyId)).voteAwaited).toBe(true);
  });

  it("requires a reason for an objection and a choice for any vote", async () => {
    const noReason = await reviewerDoes(0, { intent: "vote", choice: "object", reason: "" });
    expect(noReason.status).toBe(400);
    expect(errorsOf(noReason).reason).toMatch(/reason/);
    const noChoice = await reviewerDoes(0, { intent: "vote", reason: "" });
    expect(errorsOf(noChoice).choice).toBeDefined();
    const emptyComment = await reviewerDoes(0, { intent: "comment", body: " " });
    expect(errorsOf(emptyComment).body).toBeDefined();
  });

  it("lets a reviewer object; the round.coordinator answers not upheld, and every reviewer sees the rationale", async () => {
    expect((await reviewerDoes(0, { intent: "comment", body: "Why is M3 holes left out for L01?" })).status).toBe(302);
    expect((await reviewerDoes(0, { intent: "vote", choice: "object", reason: "The exclusion of L01 on M3 needs a better reason." })).status).toBe(302);
    const blocked = await coordinatorDoes({ intent: "publish" });
    expect(blocked.status).toBe(409);
    expect(blocked.errors.form).toMatch(/not voted|no answer/);
    const { votes } = await statementNow();
    const objection = votes.find((v: any) => v.choice === "object");
    const noRationale = await coordinatorDoes({ intent: "answer", voteId: String(objection.id), answer: "not_upheld", rationale: "" });
    expect(noRationale.status).toBe(400);
    expect(noRationale.errors.rationale).toBeDefined();
    const rationale = "The lab documented the float angle fault in its answer; the exclusion has an assignable cause.";
    expect((await coordinatorDoes({ intent: "answer", voteId: String(objection.id), answer: "not_upheld", rationale })).status).toBe(302);
    const seenByOther = (await call(reviewPage.loader, get(reviewPath(), round.reviewers[1]), { studyId: round.studyId })).data;
    expect(seenByOther.votes[0]).toMatchObject({ answer: "not_upheld", answerRationale: rationale });
    expect(seenByOther.comments[0].body).toContain("Why is M3");
  });

  it("publishes once every reviewer voted and no objection is unresolved; then every write refuses", async () => {
    const changeOfVote = await reviewerDoes(0, { intent: "vote", choice: "approve", reason: "" });
    expect(changeOfVote.status).toBe(409);
    // A refusal of the whole ballot form (Conform keeps it under the empty field name).
    expect(errorsOf(changeOfVote)[""]).toMatch(/withdraw or maintain/);
    expect((await coordinatorDoes({ intent: "publish" })).errors.form).toMatch(/awaits its reviewer's reply/);
    expect((await reviewerDoes(0, { intent: "reply", reply: "withdrawn", note: "The assignable cause convinces me." })).status).toBe(302);
    expect((await reviewerDoes(1, { intent: "vote", choice: "approve", reason: "" })).status).toBe(302);
    expect((await coordinatorDoes({ intent: "publish" })).status).toBe(409);
    expect((await reviewerDoes(2, { intent: "vote", choice: "abstain", reason: "" })).status).toBe(302);
    expect((await coordinatorDoes({ intent: "publish" })).status).toBe(302);
    expect(await studyState()).toBe("published");
    expect((await statementNow()).latest.state).toBe("approved");

    expect((await coordinatorDoes({ intent: "freeze" })).errors.form).toMatch(/published/);
    expect((await reviewerDoes(0, { intent: "vote", choice: "object", reason: "Changing my mind after the fact." })).status).toBe(409);
    expect((await reviewerDoes(0, { intent: "comment", body: "A late comment." })).status).toBe(409);
    const decision = await call(analysisPage.action, post(`/studies/${round.studyId}/analysis`, { intent: "decide", lab: "L08", material: "M2", response: "surface", decision: "excluded", reason: "After publication this must refuse." }, round.coordinator), { studyId: round.studyId });
    expect(errorsOf(decision).form).toMatch(/published/);
    const ask = await call(analysisPage.action, post(`/studies/${round.studyId}/analysis`, { intent: "ask", lab: "L08", material: "M2", response: "surface", statistic: "", question: "After publication this must refuse." }, round.coordinator), { studyId: round.studyId });
    expect(errorsOf(ask).form).toMatch(/published/);
  });
});

describe("blinding: a reviewer never sees a lab's name", () => {
  it("holds for the review page, the report, the list and the JSON a reviewer can fetch", async () => {
    const reviewer = round.reviewers[0]!;
    const sources = {
      review: await call(reviewPage.loader, get(reviewPath(), reviewer), { studyId: round.studyId }),
      report: await call(reportPage.loader, get(`/studies/${round.studyId}/report`, reviewer), { studyId: round.studyId }),
      list: await call(reviewList.loader, get("/review", reviewer)),
      precision: await call(precision.loader, get(`/api/v1/studies/${round.studyId}/precision`, reviewer), { studyId: round.studyId }),
      results: await call(resultsJson.loader, get(`/api/v1/studies/${round.studyId}/results`, reviewer), { studyId: round.studyId }),
    };
    for (const [where, outcome] of Object.entries(sources)) {
      expect(outcome.status, where).toBe(200);
      expectNoLabName(outcome.data, where);
    }
    expect(sources.report.data.labs.length).toBe(8);
    // The round.coordinator's report does name them, so the check above is not vacuous.
    const named = await call(reportPage.loader, get(`/studies/${round.studyId}/report`, round.coordinator), { studyId: round.studyId });
    expect(JSON.stringify(named.data)).toContain(DEMO_LABS[0].name);
  });

  it("keeps the review page from anyone but the study's round.reviewers", async () => {
    for (const cookie of [round.coordinator, await demoCookie("analyst1@ringbatch.example")]) {
      expect((await call(reviewPage.loader, get(reviewPath(), cookie), { studyId: round.studyId })).status).toBe(404);
    }
  });
});
