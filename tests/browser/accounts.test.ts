import { createClient } from "@libsql/client";
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { DEMO_PASSWORD } from "../../seed/demo-data";
import { expectAccessible, signInAs, useServerAndBrowser } from "../support/browser";

const running = useServerAndBrowser();

async function newPage() {
  return (await running.browser.newContext()).newPage();
}

async function signedIn(email: string, password = DEMO_PASSWORD) {
  const page = await newPage();
  await signInAs(page, running.server.url, email, password);
  await page.waitForURL((url) => url.pathname !== "/login");
  return page;
}

async function sql(statement: string, args: (string | number)[] = []) {
  const database = createClient({ url: running.server.databaseUrl });
  try {
    return (await database.execute({ sql: statement, args })).rows;
  } finally {
    database.close();
  }
}

/**
 * The link of the newest message to an address, read from the outbox as the
 * recipient's mail program would receive it (the mailbox page hides the token
 * from anyone else).
 */
async function linkTo(to: string, path: "invite" | "reset-password") {
  const [row] = await sql(`select text from email_outbox where "to" = ? order by id desc limit 1`, [to]);
  return String(row!.text).match(new RegExp(`https?://\\S+/${path}/\\S+`))![0];
}

/** The pages answer a moment after a click; the machine running the tests may be busy. */
const eventually = <T>(read: () => Promise<T> | T) => expect.poll(read, { timeout: 15_000 });

const toast = (page: Page) => page.getByRole("status").first().textContent();

describe("accounts by e-mail, in the browser", { timeout: 120_000 }, () => {
  it("invites a lab from outside the directory; its contact accepts; the lab appears in the directory, marked for a check", async () => {
    const [owner] = await sql(`select id from users where email = 'coordinator@ringbatch.example'`);
    await sql(
      `insert into studies (code, title, test_method, state, replicates_per_cell, owner_id, ship_date, results_due) values ('FF-2027-W', 'Outside lab trial', 'Float finishing test of fresh concrete', 'recruiting', 2, ?, '2027-03-01', '2027-04-15')`,
      [Number(owner!.id)],
    );
    const [study] = await sql(`select id from studies where code = 'FF-2027-W'`);

    const coordinator = await signedIn("coordinator@ringbatch.example");
    await coordinator.goto(`${running.server.url}/studies/${study!.id}/labs`);
    await coordinator.getByLabel("Lab name").fill("Thistlecombe Concrete Lab");
    await coordinator.getByLabel("Contact name").fill("Mira Thistle");
    await coordinator.getByLabel("Contact e-mail").fill("not an address");
    await coordinator.getByRole("button", { name: "Send the invitation" }).click();
    await eventually(() => coordinator.getByLabel("Contact e-mail").getAttribute("aria-invalid")).toBe("true");
    await coordinator.getByLabel("Contact e-mail").fill("mira@thistlecombe.example");
    await coordinator.getByRole("button", { name: "Send the invitation" }).click();
    await eventually(() => toast(coordinator)).toContain("Invitation sent to mira@thistlecombe.example");
    await eventually(() => coordinator.getByText("Not in the directory yet").count()).toBe(1);
    await expectAccessible(coordinator);

    const contact = await newPage();
    await contact.goto(await linkTo("mira@thistlecombe.example", "invite"));
    await eventually(() => contact.getByText("Accepting adds Thistlecombe Concrete Lab to the Ringbatch lab directory").count()).toBe(1);
    await contact.getByLabel("Your name").fill("Mira Thistle");
    await contact.getByLabel("New password").fill("miras-long-password");
    await contact.getByLabel("Repeat the password").fill("miras-long-password");
    await contact.getByRole("button", { name: "Set password and accept" }).click();
    await contact.waitForURL(`${running.server.url}/lab`);

    const admin = await signedIn("admin@ringbatch.example");
    await admin.goto(`${running.server.url}/admin/labs`);
    const row = admin.getByRole("row", { name: /Thistlecombe Concrete Lab/ });
    await eventually(() => row.textContent()).toContain("New — check for duplicates");
    await eventually(() => row.textContent()).toContain("mira@thistlecombe.example");
    await expectAccessible(admin);
    await row.getByRole("link", { name: "Merge Thistlecombe Concrete Lab into another lab" }).click();
    await eventually(() => admin.getByText(/Moves its enrollment \(FF-2027-W\)/).count()).toBe(1);
    await admin.getByRole("button", { name: "Merge…" }).click();
    await eventually(() => admin.getByRole("dialog").textContent()).toContain("1 person (mira@thistlecombe.example)");
    await admin.getByRole("button", { name: "Go back" }).click();
    await expectAccessible(admin);

    // The lab is now in the directory the coordinator invites from.
    await coordinator.reload();
    await eventually(() => coordinator.getByText("Not in the directory yet").count()).toBe(0);
    await eventually(() => coordinator.getByRole("row", { name: /Thistlecombe Concrete Lab/ }).textContent()).toContain("Accepted");
  });

  it("resets a forgotten password: sign-in page → e-mail → mailbox → new password signs in", async () => {
    const page = await newPage();
    // A link that names the address (as an invitation's does) fills it in, and "Forgot your password?" carries it along.
    await page.goto(`${running.server.url}/login?email=reviewer2%40ringbatch.example`);
    await eventually(() => page.getByLabel("E-mail").inputValue()).toBe("reviewer2@ringbatch.example");
    await page.getByRole("link", { name: "Forgot your password?" }).click();
    await page.waitForURL(/\/forgot-password\?email=/);
    await eventually(() => page.getByLabel("E-mail").inputValue()).toBe("reviewer2@ringbatch.example");
    await expectAccessible(page);
    await page.getByRole("button", { name: "Send the link" }).click();
    await eventually(() => page.getByRole("status").first().textContent()).toContain("If reviewer2@ringbatch.example belongs to an active Ringbatch account");

    // The message is in the local mailbox.
    const admin = await signedIn("admin@ringbatch.example");
    await admin.goto(`${running.server.url}/dev/mailbox`);
    await eventually(() => admin.getByRole("row", { name: /reviewer2@ringbatch.example/ }).textContent()).toContain("Set a new Ringbatch password");

    await page.goto(await linkTo("reviewer2@ringbatch.example", "reset-password"));
    await page.getByLabel("New password").fill("reviewer-two-new-password");
    await page.getByLabel("Repeat the password").fill("reviewer-two-new-password");
    await expectAccessible(page);
    await page.getByRole("button", { name: "Set password and sign in" }).click();
    await page.waitForURL(`${running.server.url}/review`);

    const again = await newPage();
    await signInAs(again, running.server.url, "reviewer2@ringbatch.example", DEMO_PASSWORD);
    await eventually(() => again.getByText("That e-mail and password do not match an active account.").count()).toBe(1);
    await signInAs(again, running.server.url, "reviewer2@ringbatch.example", "reviewer-two-new-password");
    await again.waitForURL(`${running.server.url}/review`);
  });
});
