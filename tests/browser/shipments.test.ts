import { createClient } from "@libsql/client";
import { describe, expect, it } from "vitest";
import { DEMO_PASSWORD } from "../../seed/demo-data";
import { expectAccessible, signInAs, useServerAndBrowser } from "../support/browser";

const running = useServerAndBrowser();

/** Two labs accept the study in testing late, so they still wait for materials (every demo lab has its shipment). */
async function lateLabs() {
  const database = createClient({ url: running.server.databaseUrl });
  try {
    const study = (await database.execute("select id from studies where code = 'FF-2026-B'")).rows[0]!.id as number;
    for (const [i, name] of ["Fenmoor Paving Lab", "Skelbrook Site Lab"].entries()) {
      const lab = (await database.execute({ sql: "insert into labs (name, address) values (?, ?) returning id", args: [name, `${i + 2} Causeway End, Fenmoor`] })).rows[0]!.id as number;
      await database.execute({ sql: "insert into enrollments (study_id, lab_id, state, lab_code) values (?, ?, 'accepted', ?)", args: [study, lab, `L${9 + i}`] });
    }
    return study;
  } finally {
    database.close();
  }
}

describe("shipments, in the browser", { timeout: 120_000 }, () => {
  it("prepares one packing list for every lab awaiting materials and prints one lab's list without the page around it", async () => {
    const studyId = await lateLabs();
    const context = await running.browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await signInAs(page, running.server.url, "coordinator@ringbatch.example", DEMO_PASSWORD);
    await page.waitForURL((url) => url.pathname !== "/login");
    await page.goto(`${running.server.url}/studies/${studyId}/shipments`);
    await expectAccessible(page);

    // The lab list offers the two late labs only, and "every lab" counts them.
    const choices = await page.getByLabel("Ship to", { exact: true }).locator("option").allTextContents();
    expect(choices).toEqual(["Every accepted lab awaiting materials (2)", "L10 · Skelbrook Site Lab", "L9 · Fenmoor Paving Lab"]);

    // The starting list has a line per constituent lot; the coordinator gives the quantities and drops the last line.
    const quantities = page.getByLabel("Quantity");
    const lines = await quantities.count();
    expect(lines).toBeGreaterThan(2);
    for (let i = 0; i < lines; i++) await quantities.nth(i).fill(String(10 * (i + 1)));
    await page.getByRole("button", { name: `Remove item ${lines}` }).click();
    await expect.poll(() => page.getByLabel("Quantity").count()).toBe(lines - 1);
    await page.getByLabel("Carrier", { exact: true }).first().fill("Kestrel Freight");

    let question = "";
    page.once("dialog", (dialog) => {
      question = dialog.message();
      void dialog.accept();
    });
    await page.getByRole("button", { name: "Prepare", exact: true }).click();
    await expect.poll(() => page.getByText("Prepared 2 shipments with the same packing list.").count()).toBe(1);
    expect(question).toBe("Prepare this packing list for all 2 labs awaiting materials?");
    await expect.poll(() => page.getByText("Every accepted lab has a shipment.").count()).toBe(1);
    // Each row folds its items away; opening one shows the lines.
    await page.locator("summary", { hasText: `${lines - 1} items` }).first().click();
    await expect.poll(() => page.getByRole("table", { name: "Items for L10" }).getByRole("row").count()).toBe(lines);
    await expectAccessible(page);

    await page.getByRole("link", { name: "Print the packing list for L9" }).click();
    await page.waitForURL(/\/shipments\/\d+\/packing-list$/);
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Packing list — FF-2026-B");
    await expect.poll(() => page.getByText("2 Causeway End, Fenmoor").count()).toBe(1);
    expect(await page.getByRole("table", { name: "Packing list for Fenmoor Paving Lab (L9)" }).getByRole("row").count()).toBe(lines);
    await expectAccessible(page);

    // As printed: no site header, no tabs, no buttons or inputs; the list, the address and the caution once.
    await page.emulateMedia({ media: "print" });
    await expect.poll(() => page.getByRole("navigation", { name: "Study pages" }).isVisible()).toBe(false);
    expect(await page.locator("header").first().isVisible()).toBe(false);
    expect(await page.getByRole("button", { name: "Print the packing list" }).isVisible()).toBe(false);
    const visibleControls = await page.locator("input, select, textarea, button").evaluateAll((nodes) => nodes.filter((n) => (n as HTMLElement).offsetParent !== null).length);
    expect(visibleControls).toBe(0);
    expect(await page.getByRole("table", { name: "Packing list for Fenmoor Paving Lab (L9)" }).isVisible()).toBe(true);
    expect(await page.getByText(/caustic/).count()).toBe(1);
    await context.close();
  });
});
