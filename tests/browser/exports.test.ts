import { readFile } from "node:fs/promises";
import ExcelJS from "exceljs";
import { describe, expect, it } from "vitest";
import { DEMO_LABS, DEMO_PASSWORD } from "../../seed/demo-data";
import { expectAccessible, signInAs, useServerAndBrowser } from "../support/browser";

const running = useServerAndBrowser();

async function signedIn(email: string) {
  const page = await (await running.browser.newContext({ acceptDownloads: true })).newPage();
  await signInAs(page, running.server.url, email, DEMO_PASSWORD);
  await page.waitForURL((url) => url.pathname !== "/login");
  return page;
}

describe("downloads and the API page, in the browser", { timeout: 120_000 }, () => {
  it("the coordinator downloads the results spreadsheet from the results page, and it reads back with every replicate", async () => {
    const page = await signedIn("coordinator@ringbatch.example");
    await page.goto(`${running.server.url}/studies/1/results`); // FF-2026-A, in checking
    await expectAccessible(page);
    const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: "Results as spreadsheet (.xlsx)" }).click()]);
    expect(download.suggestedFilename()).toBe("FF-2026-A-results.xlsx");
    const workbook = new ExcelJS.Workbook();
    await workbook.xlsx.load((await readFile((await download.path())!)).buffer as ArrayBuffer);
    const sheet = workbook.getWorksheet("Results")!;
    expect((sheet.getRow(1).values as unknown[]).slice(1, 3)).toEqual(["Lab code", "Lab"]);
    // 8 labs × 4 materials × 2 responses × 3 replicates, and a header row.
    expect(sheet.rowCount).toBe(193);
    const labNames = new Set<unknown>();
    sheet.getColumn(2).eachCell((cell, row) => row > 1 && labNames.add(cell.value));
    expect(labNames).toEqual(new Set(DEMO_LABS.slice(0, 8).map((l) => l.name)));
  });

  it("the analysis page offers its tables at the level shown, and a reviewer downloads blinded files from the review page", async () => {
    const coordinator = await signedIn("coordinator@ringbatch.example");
    await coordinator.goto(`${running.server.url}/studies/1/analysis?alpha=0.01`);
    expect(await coordinator.getByRole("link", { name: "Analysis tables as CSV" }).getAttribute("href")).toBe("/api/v1/studies/1/analysis.csv?alpha=0.01");
    const reviewer = await signedIn("reviewer1@ringbatch.example");
    await reviewer.goto(`${running.server.url}/review/1`);
    await expectAccessible(reviewer);
    const [download] = await Promise.all([reviewer.waitForEvent("download"), reviewer.getByRole("link", { name: "Results as CSV" }).click()]);
    expect(download.suggestedFilename()).toBe("FF-2026-A-results-blinded.csv");
    const text = await readFile((await download.path())!, "utf8");
    expect(text.split("\r\n")[0]).toBe("lab,material,response,replicate,value,testedOn,decision,decisionReason");
    for (const lab of DEMO_LABS) expect(text).not.toContain(lab.name);
  });

  it("the API page shows the examples with this app's address and the person's studies, linked from the account page", async () => {
    const page = await signedIn("analyst7@ringbatch.example");
    await page.goto(`${running.server.url}/account`);
    await page.getByRole("link", { name: "Using the API" }).click();
    await page.waitForURL(`${running.server.url}/account/api`);
    await expectAccessible(page);
    expect(await page.getByLabel("Setting up").textContent()).toContain(`B=${running.server.url}`);
    // Analyst 7's lab holds enrollment 15 of FF-2026-B in the demo.
    expect(await page.locator("pre").allTextContents()).toContainEqual(expect.stringContaining("$B/api/v1/enrollments/15/results"));
    const documentLink = await page.getByRole("link", { name: "OpenAPI document" }).getAttribute("href");
    const answer = await fetch(`${running.server.url}${documentLink}`);
    expect(answer.status).toBe(200);
    expect((await answer.json()).openapi).toBe("3.1.0");
  });
});
