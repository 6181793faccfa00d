import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { DEMO_LABS, DEMO_PEOPLE } from "../../seed/demo-data";
import { demoVisitor, expectAccessible, useServerAndBrowser } from "../support/browser";

const running = useServerAndBrowser();
const STUDY = 1; // FF-2026-A, the seeded study in checking

const { as, visit } = demoVisitor(running);

const flaggedRow = (page: Page, lab: string, material: string, response: string) =>
  page.getByRole("table", { name: "Cells flagged by the consistency statistics or the outlier tests" }).getByRole("row").filter({ hasText: lab }).filter({ hasText: material }).filter({ hasText: response });

describe("from the checking study to a published statement, in the browser", () => {
  it("runs the whole investigation and a review round with a maintained objection", { timeout: 180_000 }, async () => {
    const coordinator = await as("coordinator@ringbatch.example");
    await visit(coordinator, `/studies/${STUDY}/analysis`);
    // Both planted outliers, each on its own statistic.
    await expect.poll(() => flaggedRow(coordinator, "L08", "M2", "surface").textContent()).toMatch(/h = /);
    await expect.poll(() => flaggedRow(coordinator, "L01", "M3", "holes").textContent()).toMatch(/k = /);
    // The charts load lazily once hydrated.
    await coordinator.locator('[role="img"][aria-label^="h plot"]').first().waitFor();
    await expectAccessible(coordinator);

    // Ask the lab about L08's M2 surface cell.
    await flaggedRow(coordinator, "L08", "M2", "surface").getByRole("link", { name: /Investigate/ }).click();
    await coordinator.getByRole("heading", { name: /Investigate lab L08/ }).waitFor();
    await expectAccessible(coordinator);
    expect(await coordinator.getByLabel("Statistic quoted").inputValue()).toMatch(/^h = /);
    await coordinator.getByRole("button", { name: "Send the query" }).click();
    await coordinator.getByText("Query sent to lab L08.").waitFor();

    // The lab's analyst answers on the lab's query page.
    const analyst = await as("analyst5@ringbatch.example");
    await visit(analyst, "/lab/queries");
    await analyst.getByLabel("Your answer").fill("Our operator counted the surface passes twice on M2; the worksheet shows it.");
    await analyst.getByRole("button", { name: "Send answer" }).click();
    await analyst.getByText("Answer sent to the coordinator.").waitFor();

    // The coordinator sees the answer, previews the exclusion, and saves it with a reason.
    await coordinator.goto(`${running.server.url}/studies/${STUDY}/analysis?cell=L08:M2:surface#investigate`);
    await coordinator.getByText("Our operator counted the surface passes twice").waitFor();
    const sRBefore = await coordinator.getByRole("table", { name: "Precision statistics of Passes to reach the target surface by material" }).getByRole("row").filter({ hasText: "M2" }).textContent();
    // The preview is recomputed in the page: no request for data leaves for it (only the page's own code may still load).
    const asked: string[] = [];
    const record = (request: { url(): string }) => {
      const { pathname } = new URL(request.url());
      if (!pathname.startsWith("/assets/") && pathname !== "/__manifest") asked.push(pathname);
    };
    coordinator.on("request", record);
    await coordinator.getByLabel("Exclude the cell").check();
    const preview = coordinator.getByRole("table", { name: "Figures of this material and response before and after the decision" });
    await expect.poll(() => preview.getByRole("row").filter({ hasText: "Labs p" }).textContent()).toMatch(/87/);
    coordinator.off("request", record);
    expect(asked).toEqual([]);
    await expectAccessible(coordinator);
    await coordinator.getByLabel("Reason", { exact: true }).fill("The lab confirmed a counting error (assignable cause).");
    await coordinator.getByRole("button", { name: "Save decision" }).click();
    await coordinator.getByRole("dialog").getByRole("button", { name: "Exclude the cell" }).click();
    await coordinator.getByText(/Cell L08:M2:surface excluded/).waitFor();
    const m2Surface = coordinator.getByRole("table", { name: "Precision statistics of Passes to reach the target surface by material" }).getByRole("row").filter({ hasText: "M2" });
    await expect.poll(() => m2Surface.textContent()).not.toBe(sRBefore);
    await expect.poll(() => m2Surface.textContent()).toMatch(/^M27/);

    await visit(coordinator, `/studies/${STUDY}/queries`);
    await coordinator.getByRole("button", { name: /Close the query to lab L08/ }).click();
    await coordinator.getByText("Query closed.").waitFor();

    // Freeze and send.
    await visit(coordinator, `/studies/${STUDY}/statement`);
    await coordinator.getByRole("button", { name: "Freeze the first version" }).click();
    await coordinator.getByText(/Version 1 frozen/).waitFor();
    expect(await coordinator.getByLabel("Statement text, E691 form (r and R)").inputValue()).toContain("lab L08, material M2, surface");
    await expectAccessible(coordinator);
    // The second reviewer chairs the round; the confirmation names the round's reviewers and the quorum.
    await coordinator.getByLabel(/Chair of the round/).selectOption({ label: DEMO_PEOPLE.reviewers[1]!.name });
    await coordinator.getByRole("button", { name: "Send version 1 to the committee" }).click();
    await coordinator.getByRole("dialog").getByText(/two-thirds/).waitFor();
    await coordinator.getByRole("dialog").getByRole("button", { name: "Send to the committee" }).click();
    await coordinator.getByText(/Sent to the committee/).waitFor();

    // Reviewer 1 objects; reviewers never see a lab's name.
    const reviewer1 = await as("reviewer1@ringbatch.example");
    await visit(reviewer1, "/review");
    await reviewer1.getByRole("link", { name: "FF-2026-A" }).click();
    await reviewer1.getByRole("heading", { name: /Review — FF-2026-A/ }).waitFor();
    await reviewer1.locator('[role="img"][aria-label^="k plot"]').first().waitFor();
    await expectAccessible(reviewer1);
    const html = await reviewer1.content();
    for (const lab of DEMO_LABS) expect(html).not.toContain(lab.name);
    await reviewer1.getByLabel("Object (give the reason)").check();
    await reviewer1.getByRole("button", { name: "Record my vote" }).click();
    await reviewer1.getByText(/An objection needs its reason/).waitFor();
    await reviewer1.getByRole("textbox", { name: "Reason" }).fill("Excluding L08 on M2 needs the lab's worksheet on file.");
    await reviewer1.getByRole("button", { name: "Record my vote" }).click();
    await reviewer1.getByText(/Your vote is recorded/).waitFor();

    // The coordinator answers not upheld.
    await visit(coordinator, `/studies/${STUDY}/statement`);
    await coordinator.getByLabel("Not upheld").check();
    await coordinator.getByLabel("Rationale (shown to every reviewer)").fill("The worksheet is attached to the query answer and kept with the study.");
    await coordinator.getByRole("button", { name: "Record the answer" }).click();
    await coordinator.getByText(/Answer recorded/).waitFor();

    // Publishing is refused while the objector has not replied.
    await visit(coordinator, `/studies/${STUDY}/statement`);
    await coordinator.getByText(/awaits its reviewer's reply/).waitFor();

    // The objector maintains the objection; the chair (reviewer 2) rules on it with a reason.
    await reviewer1.goto(`${running.server.url}/review/${STUDY}`);
    await reviewer1.getByText(/The coordinator answered your objection/).waitFor();
    await reviewer1.getByLabel("Maintain it").check();
    await reviewer1.getByRole("button", { name: "Send my reply" }).click();
    await reviewer1.getByText(/Say why you maintain the objection/).waitFor();
    await reviewer1.getByLabel("Note").fill("A worksheet in the query answer is not a retest; I maintain it.");
    await reviewer1.getByLabel("Maintain it").check();
    await reviewer1.getByRole("button", { name: "Send my reply" }).click();
    await reviewer1.getByText(/Objection maintained/).waitFor();
    expect(await reviewer1.getByRole("button", { name: "Record the ruling" }).count()).toBe(0);

    const chair = await as("reviewer2@ringbatch.example");
    await visit(chair, `/review/${STUDY}`);
    await chair.getByText(/awaiting the chair's ruling/).waitFor();
    await chair.getByLabel("Not upheld", { exact: true }).check();
    await chair.getByLabel(/Reason for the ruling/).fill("An assignable cause documented by the lab is enough under E691; a retest is not required.");
    await chair.getByRole("button", { name: "Record the ruling" }).click();
    await chair.getByText(/Ruling recorded: the objection is not upheld/).waitFor();
    await expectAccessible(chair);

    // Reviewers 2 and 3 approve: 2 of 3 votes cast approve, which meets two-thirds.
    for (const reviewer of [chair, await as("reviewer3@ringbatch.example")]) {
      await reviewer.goto(`${running.server.url}/review/${STUDY}`);
      await reviewer.getByLabel("Approve").check();
      await reviewer.getByRole("button", { name: "Record my vote" }).click();
      await reviewer.getByText(/Your vote is recorded/).waitFor();
    }

    // Publish; afterwards the pages offer no writes and a forged write is refused.
    await visit(coordinator, `/studies/${STUDY}/statement`);
    await expect.poll(() => coordinator.getByTestId("tally").textContent()).toMatch(/3 of 3 reviewers voted · 2 approve · 1 object · 0 abstain/);
    await coordinator.getByRole("button", { name: "Publish the study" }).click();
    await coordinator.getByRole("dialog").getByRole("button", { name: "Publish" }).click();
    await coordinator.getByText(/Published. The study is now read-only./).waitFor();
    await visit(coordinator, `/studies/${STUDY}/analysis?cell=L01:M3:holes`);
    await coordinator.getByText("This study is published; its record is read-only.").first().waitFor();
    expect(await coordinator.getByRole("button", { name: "Save decision" }).count()).toBe(0);
    const forged = await coordinator.evaluate(async (url) => {
      const body = new URLSearchParams({ intent: "decide", lab: "L01", material: "M3", response: "holes", decision: "excluded", reason: "Trying after publication." });
      const res = await fetch(`${url}.data`, { method: "POST", body, headers: { "Content-Type": "application/x-www-form-urlencoded" } });
      return res.status;
    }, `${running.server.url}/studies/${STUDY}/analysis`);
    expect(forged).toBe(409);
    await visit(coordinator, `/studies/${STUDY}/report`);
    await coordinator.getByRole("table", { name: "Labs that contributed results" }).getByText(DEMO_LABS[0].name).waitFor();
  });
});
