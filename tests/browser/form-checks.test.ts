import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { DEMO_PASSWORD } from "../../seed/demo-data";
import { expectAccessible, signInAs, useServerAndBrowser } from "../support/browser";

const running = useServerAndBrowser();

/** Counts the form posts a page sends, to tell a browser-side refusal from the server's. */
function countPosts(page: Page) {
  const counter = { posts: 0 };
  page.on("request", (request) => {
    if (request.method() === "POST") counter.posts++;
  });
  return counter;
}

describe("forms check their input in the browser with the server's schema", () => {
  it("shows each mistake beside its field before anything is sent, and the server still checks", async () => {
    const page = await (await running.browser.newContext()).newPage();
    await signInAs(page, running.server.url, "coordinator@ringbatch.example", DEMO_PASSWORD);
    await page.waitForURL(`${running.server.url}/studies`);

    await page.goto(`${running.server.url}/studies/new`);
    const counter = countPosts(page);
    await page.getByRole("button", { name: "Create study" }).click();
    await expect.poll(() => page.getByText("Enter a title.").count()).toBe(1);
    expect(counter.posts).toBe(0);
    await expectAccessible(page);

    await page.getByLabel("Study code").fill("FF-2027-Q");
    await page.getByLabel("Title").fill("Checked in the browser first");
    await page.getByRole("button", { name: "Create study" }).click();
    await page.waitForURL(/\/studies\/\d+\/setup$/);
    expect(counter.posts).toBe(1);

    await page.getByLabel("Key").fill("Not A Key");
    await page.getByLabel("Response name").fill("Passes to a rating of 1");
    await page.getByRole("button", { name: "Add response" }).click();
    await expect.poll(() => page.getByText(/Use a short key of lower-case letters/).count()).toBe(1);
    expect(counter.posts).toBe(1);
  });

  it("checks the account's password form and the admin's forms the same way", async () => {
    const page = await (await running.browser.newContext()).newPage();
    await signInAs(page, running.server.url, "admin@ringbatch.example", DEMO_PASSWORD);
    await page.waitForURL(`${running.server.url}/admin/users`);
    const counter = countPosts(page);

    await page.getByLabel("E-mail", { exact: true }).fill("new.analyst at ringbatch");
    await page.getByLabel("Name", { exact: true }).fill("New Analyst");
    await page.getByRole("button", { name: "Create account" }).click();
    await expect.poll(() => page.locator("[aria-invalid=true]").count()).toBe(1);
    expect(await page.getByLabel("E-mail", { exact: true }).getAttribute("aria-invalid")).toBe("true");
    expect(counter.posts).toBe(0);
    await expectAccessible(page);

    await page.goto(`${running.server.url}/admin/labs`);
    await page.getByLabel("Name", { exact: true }).fill("Harbour Materials Lab");
    await page.getByLabel("Contact e-mail").fill("not an address");
    await page.getByRole("button", { name: "Add lab" }).click();
    await expect.poll(() => page.getByLabel("Contact e-mail").getAttribute("aria-invalid")).toBe("true");
    expect(counter.posts).toBe(0);

    await page.goto(`${running.server.url}/account`);
    await page.getByLabel("Current password").fill(DEMO_PASSWORD);
    await page.getByLabel("New password", { exact: true }).fill("a-long-enough-password");
    await page.getByLabel("New password again").fill("a-different-password");
    await page.getByRole("button", { name: "Change password" }).click();
    await expect.poll(() => page.getByText("The two new passwords differ.").count()).toBe(1);
    expect(counter.posts).toBe(0);
    await expectAccessible(page);
  });
});
