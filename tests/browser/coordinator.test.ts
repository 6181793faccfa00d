import { createClient } from "@libsql/client";
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { HIDDEN_TOKEN } from "~/models/mailbox.server";
import { DEMO_LABS, DEMO_PASSWORD } from "../../seed/demo-data";
import { expectAccessible, signInAs, useServerAndBrowser } from "../support/browser";

const running = useServerAndBrowser();

async function signedIn(email: string, password = DEMO_PASSWORD) {
  const context = await running.browser.newContext();
  const page = await context.newPage();
  await signInAs(page, running.server.url, email, password);
  await page.waitForURL((url) => url.pathname !== "/login");
  return page;
}

// Lab index 5 of the demo (analyst6's lab), which has drafts on F1 of the study in testing.
const LAB_SIX = DEMO_LABS[5].name;

const heading = (page: Page) => page.getByRole("heading", { level: 1 }).textContent();

/**
 * The invitation link of the newest message to an address. The coordinator
 * finds the message in the mailbox, where the link is shown without its
 * token (it is not addressed to them); the live link is read from the outbox,
 * as the recipient's own mail program would receive it.
 */
async function invitationLink(coordinator: Page, to: string) {
  await coordinator.goto(`${running.server.url}/dev/mailbox`);
  await coordinator.getByRole("row", { name: new RegExp(to) }).getByRole("link").first().click();
  await coordinator.waitForURL(/\/dev\/mailbox\/\d+$/);
  expect(await coordinator.getByRole("link", { name: /\/invite\// }).getAttribute("href")).toContain(HIDDEN_TOKEN);
  const database = createClient({ url: running.server.databaseUrl });
  try {
    const { rows } = await database.execute({ sql: "select text from email_outbox where \"to\" = ? order by id desc limit 1", args: [to] });
    return String(rows[0]!.text).match(/https?:\/\/\S+\/invite\/\S+/)![0];
  } finally {
    database.close();
  }
}

describe("the coordinator's workflow, in the browser", { timeout: 120_000 }, () => {
  it("creates a study from the template, adds a material, invites a lab, ships, and sees the lab's receipt", async () => {
    // The administrator adds a lab whose contact has no account yet.
    const admin = await signedIn("admin@ringbatch.example");
    await admin.goto(`${running.server.url}/admin/labs`);
    await admin.getByLabel("Name", { exact: true }).fill("Marrowby Field Lab");
    await admin.getByLabel("Contact name").fill("Lena Marrowby");
    await admin.getByLabel("Contact e-mail").fill("lena@marrowby.example");
    await admin.getByRole("button", { name: "Add lab" }).click();
    await expect.poll(() => admin.getByRole("status").textContent()).toContain("Marrowby Field Lab added.");

    const coordinator = await signedIn("coordinator@ringbatch.example");
    await coordinator.getByRole("link", { name: "New study" }).click();
    await coordinator.waitForURL(`${running.server.url}/studies/new`);
    await expectAccessible(coordinator);
    await coordinator.getByLabel("Study code").fill("FF-2027-E");
    await coordinator.getByLabel("Title").fill("Finishability of a slag paving mix");
    await coordinator.getByRole("button", { name: "Create study" }).click();
    await coordinator.waitForURL(/\/studies\/\d+\/setup$/);
    const studyId = /\/studies\/(\d+)\/setup/.exec(coordinator.url())![1];
    await expect.poll(() => heading(coordinator)).toBe("Setup — FF-2027-E");
    expect(await coordinator.title()).toBe("Setup — FF-2027-E · Ringbatch");
    await expect.poll(() => coordinator.getByRole("cell", { name: "Passes to close the preformed holes", exact: true }).count()).toBe(1);
    await expectAccessible(coordinator);

    await coordinator.getByLabel("Material code").fill("S1");
    await coordinator.getByLabel("Description").fill("Slag paving mix");
    await coordinator.getByRole("button", { name: "Add material" }).click();
    await coordinator.waitForURL(/\/materials\/\d+$/);
    const rows: [string, Record<string, string>][] = [
      ["cement", { Name: "Portland cement", "Mass, kg/m³": "218", "Relative density": "3.15" }],
      ["scm", { Name: "Slag cement", "Mass, kg/m³": "117", "Relative density": "2.9" }],
      ["water", { Name: "Batch water", "Mass, kg/m³": "150", "Relative density": "1" }],
      ["coarse_aggregate", { Name: "Crushed limestone", "Mass, kg/m³": "1100", "Relative density": "2.7", "Absorption, %": "0.8" }],
      ["fine_aggregate", { Name: "River sand", "Mass, kg/m³": "718", "Relative density": "2.63", "Absorption, %": "1.2" }],
      ["air", { Name: "Entrained air", "Air, % of concrete": "6" }],
    ];
    for (const [i, [kind, fields]] of rows.entries()) {
      await coordinator.getByRole("button", { name: "Add constituent" }).click();
      const row = coordinator.getByRole("group", { name: `Row ${i + 1}` });
      await row.getByLabel("Kind").selectOption(kind);
      for (const [label, value] of Object.entries(fields)) await row.getByLabel(label, { exact: true }).fill(value);
    }
    // w/cm = 150 / (218 + 117) = 0.448; slag 117 / 335 = 34.9 % (common practice definitions).
    await expect.poll(() => coordinator.getByText("0.448").count()).toBe(1);
    await expect.poll(() => coordinator.getByText("34.9 % of cementitious").count()).toBe(1);
    // Switching to US customary units converts the typed masses: 218 kg/m³ = 367.5 lb/yd³ (NIST SP 811 exact factors).
    await coordinator.getByLabel("US customary (lb/yd³, fl oz/cwt)").check();
    await expect.poll(() => coordinator.getByRole("group", { name: "Row 1" }).getByLabel("Mass, lb/yd³").inputValue()).toBe("367.5");
    await expect.poll(() => coordinator.getByText("0.448").count()).toBe(1);
    await expectAccessible(coordinator);
    await coordinator.getByRole("button", { name: "Save mixture design" }).click();
    await expect.poll(() => coordinator.getByRole("status").first().textContent()).toContain("Mixture design saved.");

    await coordinator.goto(`${running.server.url}/studies/${studyId}/setup`);
    await coordinator.getByRole("button", { name: "Open recruiting" }).click();
    // A move is explained and confirmed in a dialog before anything happens.
    await coordinator.getByRole("dialog").getByText("Labs can then be invited.").waitFor();
    await coordinator.getByRole("dialog").getByRole("button", { name: "Open recruiting" }).click();
    await expect.poll(() => coordinator.getByText("The study is now: Recruiting labs.").count()).toBe(1);
    await coordinator.getByRole("link", { name: "Labs", exact: true }).click();
    await coordinator.waitForURL(`${running.server.url}/studies/${studyId}/labs`);
    await expectAccessible(coordinator);
    await coordinator.getByLabel("Filter labs").fill("Marrowby");
    await coordinator.getByRole("button", { name: "Invite Marrowby Field Lab" }).click();
    await expect.poll(() => coordinator.getByText("Invitation sent to the lab's contact.").count()).toBe(1);

    await coordinator.goto(`${running.server.url}/dev/mailbox`);
    await expectAccessible(coordinator);
    const link = await invitationLink(coordinator, "lena@marrowby.example");
    await expectAccessible(coordinator);

    // The new contact opens the link signed out, sets a password and accepts.
    const analystContext = await running.browser.newContext();
    const analyst = await analystContext.newPage();
    await analyst.goto(link);
    await expect.poll(() => heading(analyst)).toBe("Invitation to FF-2027-E");
    await expectAccessible(analyst);
    await analyst.getByLabel("Your name").fill("Lena Marrowby");
    await analyst.getByLabel("New password").fill("marrowby-field-2027");
    await analyst.getByLabel("Repeat the password").fill("marrowby-field-2027");
    await analyst.getByRole("button", { name: "Set password and accept" }).click();
    await analyst.waitForURL(`${running.server.url}/lab`);

    // The used link is refused.
    const replay = await (await running.browser.newContext()).newPage();
    await replay.goto(link);
    await expect.poll(() => heading(replay)).toBe("This invitation has already been used");
    await expectAccessible(replay);

    await coordinator.goto(`${running.server.url}/studies/${studyId}/shipments`);
    await expectAccessible(coordinator);
    await coordinator.getByLabel("Carrier", { exact: true }).first().fill("Kestrel Freight");
    // The packing list starts from the material's constituent lots; the coordinator gives the quantities, for the one lab.
    const quantities = coordinator.getByLabel("Quantity");
    for (let i = 0; i < (await quantities.count()); i++) await quantities.nth(i).fill("25");
    await coordinator.getByLabel("Ship to", { exact: true }).selectOption({ index: 1 });
    await coordinator.getByRole("button", { name: "Prepare", exact: true }).click();
    await expect.poll(() => coordinator.getByText("Shipment prepared.").count()).toBe(1);
    await coordinator.locator("summary", { hasText: "Mark shipped" }).click();
    await coordinator.locator('input[id$="-trackingNumber"][id^="ship-"]').fill("KF-20270215");
    await coordinator.getByRole("button", { name: "Mark shipped" }).click();
    await expect.poll(() => coordinator.getByText("Marked shipped; the lab has been e-mailed.").count()).toBe(1);

    await analyst.goto(`${running.server.url}/lab/studies/${studyId}/receipt`);
    await expectAccessible(analyst);
    await analyst.getByLabel(/Damaged/).check();
    await analyst.getByLabel("Notes").fill("One cement bag split open in transit.");
    await analyst.getByRole("button", { name: "Confirm receipt" }).click();
    await expect.poll(() => analyst.getByText("Receipt confirmed. Thank you.").count()).toBe(1);

    await coordinator.goto(`${running.server.url}/studies/${studyId}`);
    await expect.poll(() => coordinator.getByRole("alert").textContent()).toContain("arrived damaged");
    await expect.poll(() => coordinator.getByRole("alert").textContent()).toContain("One cement bag split open in transit.");
    await expect.poll(() => coordinator.getByRole("cell", { name: "Marrowby Field Lab" }).count()).toBe(1);
    await expectAccessible(coordinator);
  });

  it("refuses an expired link and a link opened for another study", async () => {
    const coordinator = await signedIn("coordinator@ringbatch.example");
    await coordinator.goto(`${running.server.url}/studies`);
    const studyHref = (await coordinator.getByRole("link", { name: "FF-2027-E" }).getAttribute("href"))!;
    await coordinator.goto(`${running.server.url}${studyHref}/labs`);
    await coordinator.getByRole("button", { name: "Invite Tessel Ready-Mix QC" }).click();
    await expect.poll(() => coordinator.getByText("Invitation sent to the lab's contact.").count()).toBe(1);
    const link = new URL(await invitationLink(coordinator, "analyst2@ringbatch.example"));

    const visitor = await (await running.browser.newContext()).newPage();
    const otherStudy = new URL(link);
    otherStudy.searchParams.set("study", "1");
    const response = await visitor.goto(otherStudy.toString());
    expect(response?.status()).toBe(404);
    await expect.poll(() => heading(visitor)).toBe("This invitation belongs to another study");
    await expectAccessible(visitor);

    // Age the invitation past its 14 days, straight in the server's database.
    const database = createClient({ url: running.server.databaseUrl });
    await database.execute("UPDATE invitations SET expires_at = 0 WHERE used_at IS NULL");
    database.close();
    const expired = await visitor.goto(link.toString());
    expect(expired?.status()).toBe(410);
    await expect.poll(() => heading(visitor)).toBe("This invitation has expired");
  });

  it("withdraws a lab from the study in testing with a reason, and the lab is told", async () => {
    const coordinator = await signedIn("coordinator@ringbatch.example");
    await coordinator.getByRole("link", { name: "FF-2026-B" }).click();
    await coordinator.waitForURL(/\/studies\/\d+$/);
    await coordinator.goto(`${coordinator.url()}/labs`);
    await coordinator.getByLabel("Lab", { exact: true }).selectOption({ label: `${LAB_SIX} (L07)` });
    await coordinator.getByRole("button", { name: "Withdraw the lab" }).click();
    await coordinator.getByRole("dialog").getByRole("button", { name: "Withdraw the lab" }).click();
    // Checked in the browser first: no reason, no post, the message beside the field.
    await expect.poll(() => coordinator.getByText("Give the reason for withdrawing the lab.").count()).toBe(1);
    await coordinator.getByLabel("Reason").fill("Its mixer broke down; it cannot batch before the results are due");
    await coordinator.getByRole("button", { name: "Withdraw the lab" }).click();
    await coordinator.getByRole("dialog").getByRole("button", { name: "Withdraw the lab" }).click();
    await expect.poll(() => coordinator.getByRole("status").first().textContent()).toContain("The lab is withdrawn");
    await expect.poll(() => coordinator.getByRole("row", { name: new RegExp(LAB_SIX) }).textContent()).toContain("Withdrawn");
    expect(await coordinator.getByText(/labs? ha(ve|s) accepted/).textContent()).toBe("7 labs have accepted.");
    await expectAccessible(coordinator);
    await coordinator.getByRole("link", { name: "Analysis" }).click();
    await expect.poll(() => coordinator.getByText(/Not in the analysis: L07, withdrawn from the study/).count()).toBe(1);

    const analyst = await signedIn("analyst6@ringbatch.example");
    await analyst.getByRole("link", { name: "FF-2026-B" }).click();
    await expect.poll(() => analyst.getByText("The coordinator has withdrawn your lab from this study.").count()).toBe(1);
    await expectAccessible(analyst);
  });
});
