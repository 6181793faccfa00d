import AxeBuilder from "@axe-core/playwright";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, expect } from "vitest";
import { DEMO_PASSWORD } from "../../seed/demo-data";
import { launchBrowser } from "./chromium";
import { type RunningServer, startServer } from "./server";

export { launchBrowser };

export async function signInAs(page: Page, baseUrl: string, email: string, password: string) {
  await page.goto(`${baseUrl}/login`);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
}

/** No serious or critical accessibility violation (axe-core's WCAG 2 A/AA rules) on the page as shown. */
export async function expectAccessible(page: Page) {
  const { violations } = await new AxeBuilder({ page }).withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa"]).analyze();
  const serious = violations.filter((v) => v.impact === "serious" || v.impact === "critical");
  expect(serious.map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`), `on ${page.url()}`).toEqual([]);
}

/** Starts the built server (fresh demo database) and a browser for one test file, and closes both after it. */
export function useServerAndBrowser() {
  const running = {} as { server: RunningServer; browser: Browser };
  beforeAll(async () => {
    [running.server, running.browser] = await Promise.all([startServer(), launchBrowser()]);
  });
  afterAll(async () => {
    await running.browser?.close();
    await running.server?.stop();
  });
  return running;
}

type Running = { server: RunningServer; browser: Browser };

/** A fresh browser context signed in with a demo account, once it has landed on `landing` (any page but the sign-in one by default). */
export async function signedIn(running: Running, email: string, landing?: string) {
  const context = await running.browser.newContext();
  const page = await context.newPage();
  await signInAs(page, running.server.url, email, DEMO_PASSWORD);
  await page.waitForURL(landing === undefined ? (url) => url.pathname !== "/login" : `${running.server.url}${landing}`);
  return { context, page };
}

/** A page in a fresh browser context, signed in with a demo account, and a visit that checks the answer and accessibility. */
export function demoVisitor(running: Running) {
  return {
    as: async (email: string) => (await signedIn(running, email)).page,
    visit: async (page: Page, path: string) => {
      const response = await page.goto(running.server.url + path);
      expect(response?.status(), path).toBe(200);
      await expectAccessible(page);
    },
  };
}
