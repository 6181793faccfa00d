import { describe, expect, it } from "vitest";
import { DEMO_PASSWORD } from "../../seed/demo-data";
import { expectAccessible, signedIn, signInAs, useServerAndBrowser } from "../support/browser";

const running = useServerAndBrowser();

const HOMES = [
  { email: "admin@ringbatch.example", path: "/admin/users", heading: "Users", more: ["/admin/labs", "/studies", "/account"] },
  { email: "coordinator@ringbatch.example", path: "/studies", heading: "Studies", more: ["/studies/1", "/account"] },
  { email: "analyst1@ringbatch.example", path: "/lab", heading: "My lab", more: ["/account"] },
  { email: "reviewer1@ringbatch.example", path: "/review", heading: "Reviews", more: ["/account"] },
];

describe("signing in, in the browser", () => {
  it("shows the sign-in page accessibly", async () => {
    const context = await running.browser.newContext();
    const page = await context.newPage();
    await page.goto(running.server.url);
    expect(new URL(page.url()).pathname).toBe("/login");
    await expectAccessible(page);
    await context.close();
  });

  for (const home of HOMES) {
    it(`lands ${home.email} on ${home.path}, and every page reached is accessible`, async () => {
      const context = await running.browser.newContext();
      const page = await context.newPage();
      await signInAs(page, running.server.url, home.email, DEMO_PASSWORD);
      await page.waitForURL(`${running.server.url}${home.path}`);
      await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe(home.heading);
      await expectAccessible(page);
      for (const path of home.more) {
        const response = await page.goto(running.server.url + path);
        expect(response?.status(), path).toBe(200);
        await expectAccessible(page);
      }
      await context.close();
    });
  }

  it("shows the generic error for a wrong password, beside the form", async () => {
    const context = await running.browser.newContext();
    const page = await context.newPage();
    await signInAs(page, running.server.url, "coordinator@ringbatch.example", "not-the-password");
    await expect.poll(() => page.getByRole("alert").textContent()).toBe("That e-mail and password do not match an active account.");
    expect(new URL(page.url()).pathname).toBe("/login");
    await expectAccessible(page);
    await context.close();
  });

  it("answers 404 when an analyst opens the coordinator's studies", async () => {
    const { context, page } = await signedIn(running, "analyst2@ringbatch.example", "/lab");
    const response = await page.goto(`${running.server.url}/studies`);
    expect(response?.status()).toBe(404);
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Not found");
    await context.close();
  });

  it("ends the session at sign-out: the old cookie no longer works", async () => {
    const { context, page } = await signedIn(running, "coordinator@ringbatch.example", "/studies");
    const [sessionCookie] = (await context.cookies()).filter((c) => c.name === "__ringbatch_session");
    expect(sessionCookie?.httpOnly).toBe(true);
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.waitForURL(`${running.server.url}/login`);
    // Replay the old cookie, as someone who copied it would.
    const replay = await fetch(`${running.server.url}/studies`, {
      headers: { Cookie: `${sessionCookie!.name}=${sessionCookie!.value}` },
      redirect: "manual",
    });
    expect(replay.status).toBe(302);
    expect(replay.headers.get("Location")).toBe("/login?redirectTo=%2Fstudies");
    await context.close();
  });

  it("runs every page under the nonce-based policy: no violation, hydrated, charts drawn", async () => {
    const context = await running.browser.newContext();
    const page = await context.newPage();
    const violations: string[] = [];
    page.on("console", (message) => {
      if (/Content[- ]Security[- ]Policy/i.test(message.text())) violations.push(message.text());
    });
    await page.addInitScript(() => {
      document.addEventListener("securitypolicyviolation", (event) => console.error(`Content Security Policy: ${event.violatedDirective} ${event.blockedURI}`));
    });
    const documents: string[] = [];
    page.on("request", (request) => {
      if (request.resourceType() === "document") documents.push(new URL(request.url()).pathname);
    });
    await signInAs(page, running.server.url, "coordinator@ringbatch.example", DEMO_PASSWORD);
    await page.waitForURL(`${running.server.url}/studies`);
    // The analysis page draws its charts with echarts.
    await page.goto(`${running.server.url}/studies/1/analysis`);
    await expect.poll(() => page.locator("figure svg path").count(), { timeout: 20_000 }).toBeGreaterThan(0);
    // A tab followed without a new document load: the page's scripts ran and React took it over.
    const loadsBefore = documents.length;
    await page.getByRole("link", { name: "Results", exact: true }).first().click();
    await page.waitForURL(`${running.server.url}/studies/1/results`);
    expect(documents.length).toBe(loadsBefore);
    expect(violations).toEqual([]);
    await context.close();
  });

  it("sends the security headers and refuses a cross-site form post", async () => {
    const page = await fetch(`${running.server.url}/login`);
    expect(page.headers.get("Content-Security-Policy")).toContain("frame-ancestors 'none'");
    expect(page.headers.get("X-Content-Type-Options")).toBe("nosniff");
    expect(page.headers.get("Referrer-Policy")).toBe("same-origin");
    const crossSite = await fetch(`${running.server.url}/login`, {
      method: "POST",
      headers: { Origin: "https://elsewhere.example", "Content-Type": "application/x-www-form-urlencoded" },
      body: "email=coordinator%40ringbatch.example&password=ringbatch-demo",
      redirect: "manual",
    });
    // Refused before any action runs (the framework's own origin check or ours), and no session is made.
    expect([400, 403]).toContain(crossSite.status);
    expect(crossSite.headers.get("Set-Cookie")).toBeNull();
  });
});
