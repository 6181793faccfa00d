import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { DEMO_PASSWORD } from "../../seed/demo-data";
import { expectAccessible, signedIn, signInAs, useServerAndBrowser } from "../support/browser";

const running = useServerAndBrowser();

const saveState = (page: Page) => page.getByTestId("save-state").textContent();

describe("an analyst's day in the lab, in the browser", () => {
  it("batches F1, records and submits its results, amends one, and the coordinator sees the amendment", async () => {
    const context = await running.browser.newContext();
    const page = await context.newPage();
    await signInAs(page, running.server.url, "analyst5@ringbatch.example", DEMO_PASSWORD); // lab index 4: a draft of F1 in FF-2026-B
    await page.waitForURL(`${running.server.url}/lab`);
    await expectAccessible(page);

    await page.getByRole("link", { name: "FF-2026-B" }).click();
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Tasks — FF-2026-B");
    await expectAccessible(page);
    const studyUrl = page.url();

    // Batch sheet: the day's moisture contents give the wet masses and the corrected water.
    await page.getByRole("link", { name: "Open batch sheet for F1" }).click();
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Batch sheet F1 — FF-2026-B");
    await expect.poll(() => page.getByText("Fresh concrete is caustic").count()).toBe(1);
    await page.getByLabel("Moisture content of Crushed limestone 12.5 mm (% of oven-dry mass)").fill("1.5");
    await page.getByLabel("Moisture content of Natural river sand (% of oven-dry mass)").fill("4");
    await page.getByRole("button", { name: "Save batch sheet" }).click();
    await expect.poll(() => page.getByText("Saved: this sheet is kept").count()).toBe(1);
    await expect.poll(() => page.getByRole("table", { name: "Batch sheet" }).textContent()).toContain("free water");
    await expectAccessible(page);

    // Result entry: a changed draft value is saved as typed and survives a reload.
    await page.goto(studyUrl);
    await page.getByRole("link", { name: "Enter results for F1" }).click();
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Results of F1 — FF-2026-B");
    await expect.poll(() => page.title()).toBe("Results of F1 — FF-2026-B · Ringbatch");
    await expectAccessible(page);
    const holes1 = page.getByLabel("Passes to close the preformed holes, replicate 1");
    await holes1.fill("13");
    await page.getByLabel("Slump (mm)").fill("120");
    await expect.poll(() => page.getByText("Outside tolerance").count()).toBe(1);
    await expect.poll(() => saveState(page), { timeout: 10_000 }).toBe("All changes saved");
    await page.reload();
    await expect.poll(() => holes1.inputValue()).toBe("13");
    await expect.poll(() => page.getByLabel("Slump (mm)").inputValue()).toBe("120");

    // Offline, what is typed stays in the form and is saved when the connection returns.
    await context.setOffline(true);
    await page.getByLabel("Passes to reach the target surface, replicate 2").fill("18");
    await expect.poll(() => saveState(page), { timeout: 10_000 }).toMatch(/^Offline/);
    await context.setOffline(false);
    await expect.poll(() => saveState(page), { timeout: 15_000 }).toBe("All changes saved");
    await page.reload();
    await expect.poll(() => page.getByLabel("Passes to reach the target surface, replicate 2").inputValue()).toBe("18");

    // Impossible values are refused beside the field.
    await page.getByLabel("Passes to reach the target surface, replicate 3").fill("2.5");
    await expect.poll(() => page.getByText("A count is a whole number, such as 12.").count()).toBe(1);
    await page.getByLabel("Passes to reach the target surface, replicate 3").fill("16");
    await expect.poll(() => saveState(page), { timeout: 10_000 }).toBe("All changes saved");

    await page.getByRole("button", { name: "Submit F1" }).click();
    await expect.poll(() => page.getByText("F1 is submitted. Thank you.").count()).toBe(1);
    await expect.poll(() => page.getByRole("heading", { name: "Submitted results" }).count()).toBe(1);
    await expectAccessible(page);

    // A submitted value changes only by an amendment with a reason.
    await page.getByText("Amend Passes to close the preformed holes, replicate 1").click();
    await page.getByLabel("Corrected value, passes to close the preformed holes, replicate 1").fill("12");
    await page.getByLabel("Reason for the change").first().fill("Recount from the video of specimen 1");
    await page.getByRole("button", { name: "Record amendment" }).first().click();
    await expect.poll(() => page.getByRole("list", { name: "Amendments of this material" }).textContent()).toContain("13 → 12");
    await expectAccessible(page);
    await context.close();

    const { context: coordinatorContext, page: coordinator } = await signedIn(running, "coordinator@ringbatch.example", "/studies");
    const studyPath = new URL(studyUrl).pathname.replace("/lab", "");
    await coordinator.goto(`${running.server.url}${studyPath}/results`);
    const trail = coordinator.getByRole("table", { name: "Audit trail of the study" });
    await expect.poll(() => trail.textContent()).toContain("L04 amended F1 holes r1: 13 → 12. Reason: Recount from the video of specimen 1");
    expect(await coordinator.getByRole("table", { name: "Amendments of submitted results" }).textContent()).toContain("13 → 12");
    await expectAccessible(coordinator);
    await coordinatorContext.close();
  });

  it("shows the import and queries pages accessibly", async () => {
    const { context, page } = await signedIn(running, "analyst1@ringbatch.example", "/lab");
    await page.getByRole("link", { name: "Queries to your lab" }).click();
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Queries");
    await expectAccessible(page);
    await page.getByLabel("Your answer").fill("Same operator, all within ten minutes; the counts stand.");
    await page.getByRole("button", { name: "Send answer" }).click();
    await expect.poll(() => page.getByText("Answer sent to the coordinator.").count()).toBe(1);
    await page.goto(`${running.server.url}/lab`);
    await page.getByRole("link", { name: "FF-2026-B" }).click();
    await page.getByRole("link", { name: "Import results from CSV" }).click();
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Import — FF-2026-B");
    // Choosing a file checks it at once; the server names each row's problem.
    await page.getByLabel("Results file (CSV or .xlsx)").setInputFiles({ name: "f1.csv", mimeType: "text/csv", buffer: Buffer.from("material,response,replicate,value\nF1,holes,1,9\nF7,holes,1,9\n") });
    await expect.poll(() => page.getByRole("table", { name: "Rows of the file, those with problems first" }).textContent()).toContain("already submitted");
    expect(await page.getByRole("table", { name: "Rows of the file, those with problems first" }).textContent()).toContain("The study has no material “F7”");
    expect(await page.getByRole("button", { name: /^Import \d+ rows?$/ }).count()).toBe(0);
    await expectAccessible(page);
    // A spreadsheet's Latin-1 export ("Müller" as one byte 0xFC) is refused beside the file field, with no preview.
    await page.getByLabel("Results file (CSV or .xlsx)").setInputFiles({ name: "latin1.csv", mimeType: "text/csv", buffer: Buffer.from("material,response,replicate,value,operator\nF2,holes,1,9,Müller\n", "latin1") });
    await expect.poll(() => page.locator("#import-file-error").textContent()).toContain("not UTF-8 text");
    expect(await page.getByRole("table", { name: "Rows of the file, those with problems first" }).count()).toBe(0);
    await context.close();
  });
});
