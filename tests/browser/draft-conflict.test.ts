/**
 * Two sessions of one lab on the same material: the second autosave of a
 * value the first has meanwhile saved does not overwrite it; the second
 * person is told beside the field, with the other value, and the page shows
 * the stored value.
 */
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { DEMO_PASSWORD } from "../../seed/demo-data";
import { expectAccessible, signInAs, useServerAndBrowser } from "../support/browser";

const running = useServerAndBrowser();

const saveState = (page: Page) => page.getByTestId("save-state").textContent();

async function entryPage() {
  const page = await (await running.browser.newContext()).newPage();
  await signInAs(page, running.server.url, "analyst7@ringbatch.example", DEMO_PASSWORD); // lab index 6: nothing typed yet in FF-2026-B
  await page.waitForURL(`${running.server.url}/lab`);
  await page.getByRole("link", { name: "FF-2026-B" }).click();
  await page.getByRole("link", { name: "Enter results for F1" }).click();
  await page.getByLabel("Passes to close the preformed holes, replicate 1").waitFor();
  return page;
}

describe("two sessions of one lab typing into the same draft", () => {
  it("never lets the later save erase the earlier one", { timeout: 120_000 }, async () => {
    const first = await entryPage();
    const second = await entryPage();
    const field = (page: Page) => page.getByLabel("Passes to close the preformed holes, replicate 1");

    await field(first).fill("12");
    await expect.poll(() => saveState(first), { timeout: 10_000 }).toBe("All changes saved");

    // The second session still shows the empty field it loaded, and types another value.
    expect(await field(second).inputValue()).toBe("");
    await field(second).fill("14");
    await expect.poll(() => saveState(second), { timeout: 10_000 }).toMatch(/^Someone else changed a field/);
    await expect
      .poll(() => second.getByText(/F1, passes to close the preformed holes, replicate 1: .+ saved 12 after you opened the page, so your 14 was not saved/).count())
      .toBe(1);
    await expect.poll(() => field(second).inputValue()).toBe("12");
    await expectAccessible(second);

    // What is stored is the first value, as both pages show after a reload.
    for (const page of [first, second]) {
      await page.reload();
      await expect.poll(() => field(page).inputValue()).toBe("12");
    }

    // Having seen it, the second person may change it deliberately.
    await field(second).fill("14");
    await expect.poll(() => saveState(second), { timeout: 10_000 }).toBe("All changes saved");
    await first.reload();
    await expect.poll(() => field(first).inputValue()).toBe("14");
  });
});
