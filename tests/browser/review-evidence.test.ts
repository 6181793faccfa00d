import { describe, expect, it } from "vitest";
import { DEMO_LABS, DEMO_PEOPLE } from "../../seed/demo-data";
import { demoVisitor, expectAccessible, useServerAndBrowser } from "../support/browser";

const running = useServerAndBrowser();
const STUDY = 1; // FF-2026-A, the seeded study in checking

const { as, visit } = demoVisitor(running);

describe("the committee's evidence, in the browser", () => {
  it("shows a reviewer the retained cell and its reason, the values by lab code, and the vote after the evidence", { timeout: 120_000 }, async () => {
    const coordinator = await as("coordinator@ringbatch.example");
    await visit(coordinator, `/studies/${STUDY}/analysis?cell=L08:M2:surface#investigate`);
    // The query behind the decision; L08 is demo lab index 4 in FF-2026-A, whose analyst answers naming a colleague.
    await coordinator.getByLabel("Question to the lab").fill("Please re-count the passes on M2 from your video.");
    await coordinator.getByRole("button", { name: "Send the query" }).click();
    await coordinator.getByText("Query sent to lab L08.").waitFor();
    const analyst = await as("analyst5@ringbatch.example");
    await visit(analyst, "/lab/queries");
    const colleague = DEMO_PEOPLE.analysts[4]!.name;
    await analyst.getByLabel("Your answer").first().fill(`${colleague} re-counted them from the video; the counts stand.`);
    await analyst.getByRole("button", { name: "Send answer" }).first().click();
    await analyst.getByText("Answer sent to the coordinator.").waitFor();
    await visit(coordinator, `/studies/${STUDY}/analysis?cell=L08:M2:surface#investigate`);
    await coordinator.getByLabel("Retain the cell").check();
    // A reason naming the lab is refused beside the field, before it can reach the committee.
    await coordinator.getByLabel("Reason", { exact: true }).fill(`${DEMO_LABS[4].name} re-counted the passes; the counts stand.`);
    await coordinator.getByRole("button", { name: "Save decision" }).click();
    await coordinator.getByText(/Reviewers see labs by code only: remove the lab “Brimmel Aggregates Quality Lab”/).waitFor();
    await expectAccessible(coordinator);
    await coordinator.getByLabel("Reason", { exact: true }).fill("The lab re-counted the passes from its video; the counts stand.");
    await coordinator.getByRole("button", { name: "Save decision" }).click();
    await coordinator.getByText(/Cell L08:M2:surface retained/).waitFor();

    await visit(coordinator, `/studies/${STUDY}/statement`);
    await coordinator.getByRole("button", { name: "Freeze the first version" }).click();
    await coordinator.getByText(/Version 1 frozen/).waitFor();
    await coordinator.getByLabel(/Chair of the round/).selectOption({ label: DEMO_PEOPLE.reviewers[0]!.name });
    await coordinator.getByRole("button", { name: "Send version 1 to the committee" }).click();
    await coordinator.getByRole("dialog").getByRole("button", { name: "Send to the committee" }).click();
    await coordinator.getByText(/Sent to the committee/).waitFor();

    const reviewer = await as("reviewer2@ringbatch.example");
    await visit(reviewer, `/review/${STUDY}`);
    await reviewer.getByRole("heading", { name: "Review — FF-2026-A", level: 1 }).waitFor();
    const decisions = reviewer.getByRole("list", { name: /Cell decisions/ });
    await expect.poll(() => decisions.textContent()).toMatch(/Lab L08 · M2 · surface\s*Retained.*The lab re-counted the passes from its video/);
    // The query and the lab's answer under the decision, the colleague's name withheld from the committee.
    await expect.poll(() => decisions.getByRole("list", { name: "Queries on this cell" }).textContent()).toMatch(
      /Please re-count the passes on M2 from your video\.\s*Lab L08 answered \d{4}-\d{2}-\d{2}: \[withheld\] re-counted them from the video; the counts stand\./,
    );

    await reviewer.getByRole("navigation", { name: "Materials" }).getByRole("link", { name: "M2" }).click();
    await reviewer.waitForURL(/material=M2/);
    const surface = reviewer.getByRole("table", { name: "Cells of M2, Passes to reach the target surface, by lab code" });
    const l08 = surface.getByRole("row").filter({ hasText: "L08" });
    await expect.poll(() => l08.textContent()).toMatch(/Retained/);
    // The planted between-lab outlier (seed/demo-data.ts) keeps its flag with the critical value it was judged by.
    await expect.poll(() => l08.textContent()).toMatch(/h = [\d.]+, beyond ±[\d.]+/);

    const vote = reviewer.getByRole("button", { name: "Record my vote" });
    await vote.waitFor();
    const evidenceBottom = (await surface.boundingBox())!;
    expect((await vote.boundingBox())!.y).toBeGreaterThan(evidenceBottom.y + evidenceBottom.height);
    await expect.poll(() => reviewer.getByTestId("tally").textContent()).toMatch(/0 of 3 reviewers voted/);
    await expect.poll(() => reviewer.getByRole("complementary", { name: "What you are voting on" }).textContent()).toMatch(/Version 1 of the precision statement of FF-2026-A.*1 cell retained/);
    await expectAccessible(reviewer);
    const html = await reviewer.content();
    for (const lab of DEMO_LABS) expect(html).not.toContain(lab.name);
    for (const person of DEMO_PEOPLE.analysts) expect(html).not.toContain(person.name);
  });
});
