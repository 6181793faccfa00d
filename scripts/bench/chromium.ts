/**
 * A page as a tablet opens it: Debian's Chromium with the CPU slowed down
 * 4× through the DevTools protocol (`Emulation.setCPUThrottlingRate`). One
 * load warms the browser's cache, the next is measured: Chromium's own
 * DOMContentLoaded time (from the navigation timing entry), the number of
 * elements at that moment, and the size of the HTML.
 */
import { launchBrowser } from "../../tests/support/chromium";

export async function pageOnTablet(url: string, sessionCookie: string) {
  const browser = await launchBrowser();
  try {
    const context = await browser.newContext();
    const [name, value] = sessionCookie.split("=") as [string, string];
    await context.addCookies([{ name, value, url }]);
    const page = await context.newPage();
    await page.addInitScript(() => {
      document.addEventListener("DOMContentLoaded", () => {
        (window as unknown as { elementsAtContentLoaded: number }).elementsAtContentLoaded = document.getElementsByTagName("*").length;
      });
    });
    const cdp = await context.newCDPSession(page);
    await cdp.send("Emulation.setCPUThrottlingRate", { rate: 4 });
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
  } finally {
    await browser.close();
  }
}
