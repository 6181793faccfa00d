import { describe, expect, it } from "vitest";
import * as analysisPage from "~/routes/studies/study/analysis";
import * as reviewPage from "~/routes/review/study/ballot";
import { DEMO_LABS } from "../../seed/demo-data";
import { call, get, post } from "../support/routes";
import { useReviewRound } from "../support/review";

const round = useReviewRound();
const { coordinatorDoes, reviewerDoes, statementNow, studyState } = round;
const decide = (fields: Record<string, string>) => call(analysisPage.action, post(`/studies/${round.studyId}/analysis`, { intent: "decide", ...fields }, round.coordinator), { studyId: round.studyId });

describe("the committee before a statement is sent", () => {
  it("sees the current blinded figures, with the planted outlier flagged and no lab named", async () => {
    const page = await call(reviewPage.loader, get(`/review/${round.studyId}?material=M2`, round.reviewers[0]), { studyId: round.studyId });
    expect(page.data.statement).toBeNull();
    const m2surface = page.data.evidence.find((r: { response: string }) => r.response === "surface");
    expect(m2surface.cells.find((c: { lab: string }) => c.lab === "L08").stats.flags).toEqual(["h"]);
    const text = JSON.stringify(page.data);
    for (const lab of DEMO_LABS) expect(text).not.toContain(lab.name);
  });
});

describe("an objection upheld", () => {
  it("returns the version, sends the study back to checking, and a new version starts a new round", async () => {
    await coordinatorDoes({ intent: "freeze" });
    const first = (await statementNow()).latest;
    expect((await round.send(first.id)).status).toBe(302);
    await reviewerDoes(0, { intent: "vote", choice: "object", reason: "L08 on M2 is far off: ask the lab before publishing." });
    await reviewerDoes(1, { intent: "vote", choice: "approve", reason: "" });
    const objection = (await statementNow()).votes.find((v: { choice: string }) => v.choice === "object");

    const answered = await coordinatorDoes({ intent: "answer", voteId: String(objection.id), answer: "upheld", rationale: "Agreed: the lab will be asked and the statement revised." });
    expect(answered.status).toBe(302);
    expect(await studyState()).toBe("checking");
    expect((await statementNow()).latest).toMatchObject({ version: 1, state: "returned" });

    // Back in checking the round.coordinator may decide again, then freezes and sends a second version.
    expect((await decide({ lab: "L08", material: "M2", response: "surface", decision: "excluded", reason: "The lab found its float was not the specified one." })).status).toBe(302);
    await coordinatorDoes({ intent: "freeze" });
    const second = (await statementNow()).latest;
    expect(second).toMatchObject({ version: 2, state: "draft" });
    expect(second.textE691).toContain("L08");
    expect((await round.send(second.id)).status).toBe(302);
    expect(await studyState()).toBe("in_review");

    // The first round's votes do not carry over: publication waits for votes on version 2.
    const blocked = await coordinatorDoes({ intent: "publish" });
    expect(blocked.status).toBe(409);
    for (const i of [0, 1, 2]) expect((await reviewerDoes(i, { intent: "vote", choice: "approve", reason: "" })).status).toBe(302);
    expect((await coordinatorDoes({ intent: "publish" })).status).toBe(302);
    expect(await studyState()).toBe("published");
  });
});
