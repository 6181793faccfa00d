/**
 * Pages as a tablet opens them: Debian's Chromium with the CPU slowed down
 * through the DevTools protocol (`Emulation.setCPUThrottlingRate`).
 */
import type { Page } from "playwright-core";
import { launchBrowser } from "../../tests/support/chromium";

async function withPage<T>(url: string, sessionCookie: string, cpuSlowdown: number, use: (page: Page) => Promise<T>): Promise<T> {
  const browser = await launchBrowser();
  try {
    const context = await browser.newContext();
    const [name, value] = sessionCookie.split("=") as [string, string];
    await context.addCookies([{ name, value, url }]);
    const page = await context.newPage();
    const cdp = await context.newCDPSession(page);
    await cdp.send("Emulation.setCPUThrottlingRate", { rate: cpuSlowdown });
    return await use(page);
  } finally {
    await browser.close();
  }
}

/**
 * One load warms the browser's cache, the next is measured: Chromium's own
 * DOMContentLoaded time (from the navigation timing entry), the number of
 * elements at that moment, and the size of the HTML.
 */
export function pageOnTablet(url: string, sessionCookie: string) {
  return withPage(url, sessionCookie, 4, async (page) => {
    await page.addInitScript(() => {
      document.addEventListener("DOMContentLoaded", () => {
        (window as unknown as { elementsAtContentLoaded: number }).elementsAtContentLoaded = document.getElementsByTagName("*").length;
      });
    });
    await page.goto(url, { waitUntil: "load", timeout: 120_000 });
    await page.goto(url, { waitUntil: "load", timeout: 120_000 });
    return await page.evaluate(() => {
      const navigation = performance.getEntriesByType("navigation")[0] as PerformanceNavigationTiming;
      return {
        domContentLoadedMs: navigation.domContentLoadedEventEnd - navigation.startTime,
        elements: (window as unknown as { elementsAtContentLoaded: number }).elementsAtContentLoaded,
        htmlBytes: navigation.decodedBodySize,
      };
    });
  });
}

/**
 * The analysis page's exclusion preview: opens the first lab's cell of the
 * shown material, toggles "Exclude" and "Retain" `toggles` times each, and
 * reads the page's own "what-if recompute" timings (performance.now around
 * the engine's run). The first run, before the engine is compiled, is kept apart.
 */
export function whatIfInBrowser(analysisUrl: string, sessionCookie: string, cpuSlowdown: number, toggles = 10) {
  return withPage(analysisUrl, sessionCookie, cpuSlowdown, async (page) => {
    await page.goto(analysisUrl, { waitUntil: "load", timeout: 120_000 });
    await page.getByRole("link", { name: /^(Decide|Ask the lab \/ decide) on lab/ }).first().click();
    const exclude = page.getByLabel("Exclude the cell");
    const retain = page.getByLabel("Retain the cell");
    await exclude.waitFor({ timeout: 60_000 });
    for (let i = 0; i < toggles; i++) {
      await exclude.check();
      await retain.check();
    }
    const runs = await page.evaluate(() => performance.getEntriesByName("what-if recompute").map((e) => e.duration));
    const [first, ...rest] = runs;
    const sorted = [...rest].sort((a, b) => a - b);
    return { runs: runs.length, firstMs: first ?? NaN, medianMs: sorted[Math.floor(sorted.length / 2)] ?? NaN, maxMs: sorted.at(-1) ?? NaN };
  });
}
