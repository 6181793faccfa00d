import { describe, expect, it } from "vitest";
import { DEMO_PASSWORD } from "../../seed/demo-data";
import { expectAccessible, signInAs, useServerAndBrowser } from "../support/browser";

const running = useServerAndBrowser();

describe("API tokens, in the browser", () => {
  it("an analyst creates a token on the account page, a script writes results with it, and revoking it stops it", async () => {
    const page = await (await running.browser.newContext()).newPage();
    await signInAs(page, running.server.url, "analyst7@ringbatch.example", DEMO_PASSWORD); // lab index 6: enrollment 15 of FF-2026-B
    await page.waitForURL(`${running.server.url}/lab`);
    await page.goto(`${running.server.url}/account`);
    await page.getByLabel("Token name").fill("Lab system");
    await page.getByLabel("May reach").selectOption({ label: "Write results: FF-2026-B (Halloway Polytechnic Concrete Lab)" });
    await page.getByRole("button", { name: "Create token" }).click();
    const token = await page.getByLabel("New token").inputValue();
    expect(token).toMatch(/^rbt_/);
    await expectAccessible(page);

    const send = () =>
      fetch(`${running.server.url}/api/v1/enrollments/15/results`, {
        method: "POST",
        headers: { Authorization: `Bearer ${token}`, "Content-Type": "application/json" },
        body: JSON.stringify({ results: [{ material: "F2", response: "holes", replicate: 1, value: 9 }] }),
      });
    const first = await send();
    expect(first.status).toBe(200);
    expect(await first.json()).toEqual({ received: 1, changed: 1 });

    await page.reload();
    const row = page.getByRole("row", { name: /Lab system/ });
    await expect.poll(() => row.textContent()).not.toContain("Never");
    await page.getByRole("button", { name: "Revoke token Lab system" }).click();
    await expect.poll(() => row.textContent()).toContain("Revoked");
    const after = await send();
    expect(after.status).toBe(401);
  });
});
