import { readFile } from "node:fs/promises";
import type { Page } from "playwright-core";
import sharp from "sharp";
import { describe, expect, it } from "vitest";
import { DEMO_PASSWORD } from "../../seed/demo-data";
import { expectAccessible, signInAs, useServerAndBrowser } from "../support/browser";

const running = useServerAndBrowser();

async function signedIn(email: string, viewport = { width: 1280, height: 900 }) {
  const context = await running.browser.newContext({ viewport, acceptDownloads: true });
  const page = await context.newPage();
  await signInAs(page, running.server.url, email, DEMO_PASSWORD);
  await page.waitForURL(`${running.server.url}/lab`);
  await page.getByRole("link", { name: "FF-2026-B" }).first().click();
  await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Tasks — FF-2026-B");
  return { context, page, studyUrl: page.url() };
}

/** Elements of the entry table whose right edge passes the viewport's. */
const overflowing = (page: Page) =>
  page.evaluate(() => [...document.querySelectorAll("[data-testid=entry-table] *")].filter((e) => e.getBoundingClientRect().right > window.innerWidth + 0.5).map((e) => e.tagName));

describe("spreadsheets in and out, photos and phones, in the browser", () => {
  it("downloads the template, fills it in, imports it whole, and shows the values on the material's page", async () => {
    const { context, page, studyUrl } = await signedIn("analyst7@ringbatch.example"); // lab index 6: nothing entered yet
    await page.goto(`${studyUrl}/import`);
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Import — FF-2026-B");
    await expectAccessible(page);

    const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: "Download template (CSV)" }).click()]);
    expect(download.suggestedFilename()).toMatch(/^FF-2026-B-L\d+-results\.csv$/);
    const template = (await readFile((await download.path())!, "utf8")).replace(/^\uFEFF/, "");
    const lines = template.trim().split("\r\n");
    expect(lines[0]).toBe("material,response,replicate,value,tested_on,operator,version");
    // Fill in F2 as a spreadsheet in a decimal-comma locale saves it: semicolons between fields; F1 stays blank (skipped).
    const values: Record<string, number> = { "holes:1": 9, "holes:2": 11, "holes:3": 10, "surface:1": 16, "surface:2": 15, "surface:3": 17 };
    const filled = lines.map((line, i) => {
      const fields = line.split(",");
      if (i > 0 && fields[0] === "F2") Object.assign(fields, { 3: String(values[`${fields[1]}:${fields[2]}`]), 4: "2026-10-20", 5: "Bo Lindqvar" });
      return fields.join(";");
    });
    await page.getByLabel("Results file (CSV or .xlsx)").setInputFiles({ name: "filled.csv", mimeType: "text/csv", buffer: Buffer.from(filled.join("\r\n")) });
    await expect.poll(() => page.getByRole("status").filter({ hasText: "Read as" }).textContent()).toContain("Read as semicolon-separated.");
    expect(await page.getByRole("status").filter({ hasText: "Read as" }).textContent()).toContain("6 rows with a value, 6 without (skipped)");
    await expectAccessible(page);
    await page.getByRole("button", { name: "Import 6 rows" }).click();
    await expect.poll(() => page.getByText("Imported 6 results as drafts.").count()).toBe(1);
    await page.getByRole("list", { name: "Imported materials" }).getByRole("link", { name: "Results of F2" }).click();
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Results of F2 — FF-2026-B");
    for (const [key, value] of Object.entries(values)) {
      const [response, replicate] = key.split(":");
      const name = response === "holes" ? "Passes to close the preformed holes" : "Passes to reach the target surface";
      expect(await page.getByLabel(`${name}, replicate ${replicate}`).inputValue()).toBe(String(value));
    }
    expect(await page.getByLabel("Operator, replicate 2").inputValue()).toBe("Bo Lindqvar");
    await context.close();
  });

  it("states the photo limit before choosing, and names an oversize photo beside its replicate", async () => {
    const { context, page } = await signedIn("analyst5@ringbatch.example"); // lab index 4: a draft of F1
    await page.getByRole("link", { name: "Enter results for F1" }).click();
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Results of F1 — FF-2026-B");
    const photo = page.getByLabel("Surface photo of replicate 2");
    expect(await page.locator(`#${await photo.getAttribute("id")}-rule`).textContent()).toBe("JPEG, PNG or WebP, at most 10 MB");
    // 11 MB with a JPEG's first bytes (FF D8 FF, the JPEG start-of-image marker): too large whatever it holds.
    const big = Buffer.alloc(11 * 1024 * 1024, 0x20);
    big.set([0xff, 0xd8, 0xff, 0xe0]);
    await photo.setInputFiles({ name: "surface.jpg", mimeType: "image/jpeg", buffer: big });
    await page.getByRole("button", { name: "Upload photo of replicate 2" }).click();
    const error = page.locator(`#${await photo.getAttribute("id")}-error`);
    await expect.poll(() => error.textContent()).toBe("The photo is larger than 10 MB. Choose a smaller one, or save it from the camera at a lower resolution.");
    expect(await photo.getAttribute("aria-invalid")).toBe("true");
    // The other replicates say nothing.
    expect(await page.getByText("The photo is larger than 10 MB.").count()).toBe(1);
    await expectAccessible(page);
    await context.close();
  });

  it("shows the bytes sent while a photo uploads, then its thumbnail; a file the server refuses is named beside its replicate", async () => {
    const { context, page } = await signedIn("analyst5@ringbatch.example");
    await page.getByRole("link", { name: "Enter results for F1" }).click();
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Results of F1 — FF-2026-B");
    // About 4 MB of noise as a JPEG, sent over an upload link slowed to 1 MB/s, so the progress can be read on the way.
    const noise = Buffer.alloc(2400 * 1800 * 3).map(() => Math.floor(Math.random() * 256));
    const surface = await sharp(noise, { raw: { width: 2400, height: 1800, channels: 3 } }).jpeg({ quality: 95 }).toBuffer();
    const cdp = await context.newCDPSession(page);
    await cdp.send("Network.emulateNetworkConditions", { offline: false, latency: 20, downloadThroughput: -1, uploadThroughput: 1_000_000 });
    await page.getByLabel("Surface photo of replicate 1").setInputFiles({ name: "surface.jpg", mimeType: "image/jpeg", buffer: surface });
    await page.getByRole("button", { name: "Upload photo of replicate 1" }).click();
    // The total is the whole request: the photo and the form's few other fields.
    await expect.poll(() => page.getByText(/^Uploading: /).textContent(), { timeout: 10_000 }).toMatch(/^Uploading: \d+\.\d of \d+\.\d MB \(\d+ %\)$/);
    const bar = await page.locator("progress").evaluate((p) => ({ value: (p as HTMLProgressElement).value, max: (p as HTMLProgressElement).max }));
    expect(bar.max).toBeGreaterThanOrEqual(surface.length);
    expect(bar.value).toBeGreaterThan(0);
    await expectAccessible(page);
    await cdp.send("Network.emulateNetworkConditions", { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: -1 });
    await expect.poll(() => page.getByText("Photo of replicate 1 added.").count(), { timeout: 30_000 }).toBe(1);
    await expect.poll(() => page.locator("progress").count()).toBe(0);
    expect(await page.getByRole("img", { name: /replicate 1/ }).count()).toBe(1);

    // Text named .png passes the browser's check of type and size; the server judges the bytes and refuses it.
    const photo = page.getByLabel("Surface photo of replicate 3");
    await photo.setInputFiles({ name: "notes.png", mimeType: "image/png", buffer: Buffer.from("just some notes, not a picture") });
    await page.getByRole("button", { name: "Upload photo of replicate 3" }).click();
    const error = page.locator(`#${await photo.getAttribute("id")}-error`);
    await expect.poll(() => error.textContent()).toBe("This file is not a JPG, PNG, WEBP file (judged from its contents, not its name).");
    await context.close();
  }, 60_000);

  it("lays result entry out as one card per replicate on a phone, and cuts no column off at 1280 px", async () => {
    const phone = await signedIn("analyst5@ringbatch.example", { width: 390, height: 844 });
    const page = phone.page;
    // The header's menu is folded into one button.
    expect(await page.getByRole("navigation", { name: "Main" }).count()).toBe(0);
    await page.getByText("Menu").click();
    await expect.poll(() => page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "My lab" }).isVisible()).toBe(true);
    await page.getByText("Menu").click();
    await page.getByRole("link", { name: "Enter results for F1" }).click();
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Results of F1 — FF-2026-B");
    const cards = page.getByTestId("replicate-card");
    expect(await cards.count()).toBe(3);
    for (let replicate = 1; replicate <= 3; replicate++) {
      const card = cards.nth(replicate - 1);
      expect(await card.locator("th").textContent()).toBe(`Replicate ${replicate}`);
      for (const label of [
        `Passes to close the preformed holes, replicate ${replicate}`,
        `Passes to reach the target surface, replicate ${replicate}`,
        `Test date, replicate ${replicate}`,
        `Operator, replicate ${replicate}`,
        `Surface photo of replicate ${replicate}`,
      ]) {
        const field = card.getByLabel(label);
        // The photo chooser arrives with the page's later chunk: wait for it rather than read it once.
        await field.waitFor({ state: "visible", timeout: 10_000 });
        const box = (await field.boundingBox())!;
        expect(box.x, label).toBeGreaterThanOrEqual(0);
        expect(box.x + box.width, label).toBeLessThanOrEqual(390);
        // Its label is shown beside it, not only read out.
        expect(await card.locator(`label[for="${await field.getAttribute("id")}"]`).isVisible(), label).toBe(true);
      }
    }
    expect(await overflowing(page)).toEqual([]);
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
    await expectAccessible(page);
    await phone.context.close();

    const desktop = await signedIn("analyst5@ringbatch.example", { width: 1280, height: 900 });
    await desktop.page.getByRole("link", { name: "Enter results for F1" }).click();
    await expect.poll(() => desktop.page.getByRole("columnheader", { name: "Surface photo" }).isVisible()).toBe(true);
    expect(await overflowing(desktop.page)).toEqual([]);
    const region = desktop.page.getByTestId("entry-table");
    expect(await region.evaluate((e) => e.scrollWidth <= e.clientWidth)).toBe(true);
    await desktop.context.close();
  });
});
