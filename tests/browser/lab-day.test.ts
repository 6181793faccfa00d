import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { DEMO_PASSWORD } from "../../seed/demo-data";
import { expectAccessible, signInAs, useServerAndBrowser } from "../support/browser";
import { pdfPageTexts } from "../support/pdf-text";

const running = useServerAndBrowser();

/** What is shown when the page is printed: controls and banners must be gone. */
async function visibleWhenPrinted(page: Page, selector: string) {
  await page.emulateMedia({ media: "print" });
  const visible = await page.locator(selector).evaluateAll((nodes) => nodes.filter((n) => (n as HTMLElement).offsetParent !== null || getComputedStyle(n).position === "fixed").length);
  // Back to no emulation (not "screen"), so page.pdf() prints with the print styles as a browser does.
  await page.emulateMedia({ media: null });
  return visible;
}

const squeeze = (text: string) => text.replace(/\s+/g, "");

describe("a lab's day, in the browser", () => {
  it("shows the analyst what is waiting, with counts that include drafts, each linking to its page", async () => {
    const context = await running.browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    // analyst5's lab holds a full draft of F1 in FF-2026-B (3 replicates × 2 responses) and nothing of F2.
    await signInAs(page, running.server.url, "analyst5@ringbatch.example", DEMO_PASSWORD);
    await page.waitForURL(`${running.server.url}/lab`);
    const waiting = page.getByRole("list", { name: "Waiting in FF-2026-B" });
    await expect.poll(() => waiting.getByTestId("todo-enter").textContent()).toContain("6 of 12 values entered, drafts included.");
    expect(await waiting.getByTestId("todo-submit").textContent()).toContain("Submit F1");
    expect(await waiting.getByTestId("todo-batch").textContent()).toContain("0 batches of 2 recorded.");
    expect(await page.getByText("0 cells").count()).toBe(0);
    await expectAccessible(page);

    await waiting.getByRole("link", { name: "Results of F2 (0 of 6)" }).click();
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Results of F2 — FF-2026-B");
    // The protocol and targets are one tab away from every lab study page.
    await page.getByRole("link", { name: "Protocol and targets" }).click();
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Protocol and targets — FF-2026-B");
    expect(await page.getByLabel("Targets of the study").textContent()).toContain("75 ± 25 mm");
    await expectAccessible(page);
    await context.close();
  });

  it("prints the batch sheet clean, split for the lab's mixer, with its line and page numbers on every page", async () => {
    const context = await running.browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await signInAs(page, running.server.url, "analyst5@ringbatch.example", DEMO_PASSWORD);
    await page.waitForURL(`${running.server.url}/lab`);
    await page.getByRole("list", { name: "Waiting in FF-2026-B" }).getByRole("link", { name: "Batch sheet F1" }).click();
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Batch sheet F1 — FF-2026-B");
    await page.getByLabel("Batch volume (m³)").fill("0.15");
    await page.getByLabel("Mixer capacity (m³, usable)").fill("0.06");
    await page.getByLabel("Moisture content of Crushed limestone 12.5 mm (% of oven-dry mass)").fill("1.5");
    await page.getByLabel("Moisture content of Natural river sand (% of oven-dry mass)").fill("4");
    // Hand-checked: ⌈0.15 / 0.06⌉ = 3 mixes of 0.0500 m³.
    await expect.poll(() => page.getByTestId("mix-split").textContent()).toContain("3 equal mixes of 0.0500 m³");
    await page.getByRole("button", { name: "Save batch sheet" }).click();
    await expect.poll(() => page.getByText("Saved: this sheet is kept").count()).toBe(1);
    await expect.poll(() => page.getByRole("columnheader", { name: "Mix 3" }).count()).toBe(1);
    await expect.poll(() => page.getByText("Fresh concrete is caustic").count()).toBe(1);
    await expectAccessible(page);

    // Printed: no fields, buttons, banners or the "Saved" message; the sheet's line is there.
    expect(await visibleWhenPrinted(page, "input:not([type=hidden]), button, nav, [role=note]")).toBe(0);
    expect(await visibleWhenPrinted(page, "text=Saved: this sheet is kept")).toBe(0);
    expect(await visibleWhenPrinted(page, "[data-testid=print-header]")).toBe(1);

    const pages = pdfPageTexts(await page.pdf({ format: "Letter" }));
    expect(pages.length).toBeGreaterThan(1);
    pages.forEach((text, i) => {
      expect(squeeze(text)).toContain(squeeze(`Page ${i + 1} of ${pages.length}`));
      expect(squeeze(text)).toContain(squeeze("Batch sheet F1 · FF-2026-B · lab L04"));
    });
    const all = squeeze(pages.join(" "));
    expect(all).toContain(squeeze("Slump 75 ± 25 mm"));
    expect(all).toContain(squeeze("Mixing sequence"));
    expect(all).not.toContain(squeeze("Save batch sheet"));
    expect(all).not.toContain(squeeze("Saved: this sheet is kept"));

    // Opened again, the caution is folded to its summary on screen; on paper it still prints, summary and advice.
    await page.reload();
    const caution = page.locator("details", { hasText: "Safety: caustic concrete, heavy batches" });
    await expect.poll(() => caution.evaluate((d) => (d as HTMLDetailsElement).open)).toBe(false);
    const folded = squeeze(pdfPageTexts(await page.pdf({ format: "Letter" })).join(" "));
    expect(folded).toContain(squeeze("Safety: caustic concrete, heavy batches"));
    expect(folded).toContain(squeeze("Fresh concrete is caustic: wear gloves and eye protection"));
    await context.close();
  });

  it("prints the report clean: no search boxes or sort arrows, a page per material's table, code and version on every page", async () => {
    const context = await running.browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await signInAs(page, running.server.url, "coordinator@ringbatch.example", DEMO_PASSWORD);
    await page.waitForURL(/\/studies/);
    await page.goto(`${running.server.url}/studies/3/report`);
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Report — FF-2025-D");
    await expect.poll(() => page.locator("input[type=search]").count()).toBeGreaterThan(0);
    await expectAccessible(page);
    expect(await visibleWhenPrinted(page, "input, button:not(th button), nav, th [aria-hidden=true]")).toBe(0);

    const header = await page.getByTestId("print-header").textContent();
    expect(header).toMatch(/^Precision report · FF-2025-D · statement version \d+$/);
    const pages = pdfPageTexts(await page.pdf({ format: "Letter" }));
    const tables = await page.getByRole("table", { name: /^Labs on / }).count();
    // Each material's table starts a page, after the statement's own pages.
    expect(pages.length).toBeGreaterThan(tables);
    pages.forEach((text, i) => {
      expect(squeeze(text)).toContain(squeeze(`Page ${i + 1} of ${pages.length}`));
      expect(squeeze(text)).toContain(squeeze(header!));
    });
    expect(squeeze(pages.join(" "))).not.toMatch(/Findalab|↕|▲|▼/);
    await context.close();
  }, 90_000); // an accessibility pass and a 15-page PDF of the whole report
});
