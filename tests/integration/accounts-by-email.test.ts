import { createHash } from "node:crypto";
import { desc, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { auditEvents, emailOutbox, passwordTokens, users } from "~/db/schema";
import { lookupPasswordLink } from "~/models/password-link.server";
import { verifyLogin } from "~/models/user.server";
import * as adminUsers from "~/routes/admin/users";
import * as forgot from "~/routes/auth/forgot-password";
import * as login from "~/routes/auth/login";
import * as reset from "~/routes/auth/reset-password";
import * as welcome from "~/routes/auth/welcome";
import { getUser } from "~/server/guards.server";
import { DEMO_PASSWORD } from "../../seed/demo-data";
import { useDemoDatabase, demoCookie } from "../support/demo";
import { errorsOf, toastOf } from "../support/replies";
import { call, cookieFrom, get, post } from "../support/routes";

beforeAll(useDemoDatabase);

/** A form post from a given client address (the rate limits count per address). */
function postFrom(address: string, path: string, fields: Record<string, string>) {
  const request = post(path, fields);
  request.headers.set("X-Forwarded-For", address);
  return request;
}

const mailTo = (to: string) => db.select().from(emailOutbox).where(eq(emailOutbox.to, to)).orderBy(desc(emailOutbox.id));

/** The link a message carries, as the recipient would click it. */
function linkIn(text: string, route: "reset-password" | "welcome") {
  const url = new URL(new RegExp(`https?://\\S+/${route}/\\S+`).exec(text)![0]);
  return { path: url.pathname, token: url.pathname.split("/").pop()! };
}

const askReset = (email: string, address = "198.51.100.1") => call(forgot.action, postFrom(address, "/forgot-password", { email }));

describe("forgot password", () => {
  it("answers the same whether or not the address has an account, and mails only a real one", async () => {
    const before = (await db.select().from(emailOutbox)).length;
    const unknown = await askReset("nobody@nowhere.example");
    const known = await askReset("Analyst7@ringbatch.example");
    expect(unknown.status).toBe(200);
    expect(known.status).toBe(200);
    // The page's words differ only by the address typed.
    expect(Object.keys(unknown.data)).toEqual(Object.keys(known.data));
    expect(unknown.data.sentTo).toBe("nobody@nowhere.example");
    expect(known.data.sentTo).toBe("analyst7@ringbatch.example");
    const after = await db.select().from(emailOutbox);
    expect(after).toHaveLength(before + 1);
    expect(after.at(-1)!.to).toBe("analyst7@ringbatch.example");
    expect(after.at(-1)!.text).toMatch(/30 minutes/);
  });

  it("refuses an empty address beside the field", async () => {
    const empty = await askReset("   ");
    expect(empty.status).toBe(400);
    expect(errorsOf(empty).email).toBe("Enter your e-mail address.");
  });

  it("stores the link only hashed; the link works once, for 30 minutes, and sets a password that signs in", async () => {
    const [mail] = await mailTo("analyst7@ringbatch.example");
    const link = linkIn(mail!.text, "reset-password");
    expect(link.token).toMatch(/^[A-Za-z0-9_-]{43}$/);
    const row = (await db.select().from(passwordTokens).where(eq(passwordTokens.tokenHash, createHash("sha256").update(link.token).digest("hex"))))[0]!;
    expect(row.purpose).toBe("reset");
    expect((await db.select().from(passwordTokens)).some((t) => t.tokenHash.includes(link.token))).toBe(false);
    const lifetime = row.expiresAt.getTime() - row.createdAt.getTime();
    expect(lifetime).toBeGreaterThan(29.9 * 60 * 1000);
    expect(lifetime).toBeLessThanOrEqual(30 * 60 * 1000 + 1000);
    expect((await lookupPasswordLink(link.token, "reset", new Date(row.expiresAt.getTime() + 1))).status).toBe("expired");
    // A reset link is no welcome link.
    expect((await call(welcome.loader, get(`/welcome/${link.token}`), { token: link.token })).status).toBe(404);

    const page = await call(reset.loader, get(link.path), { token: link.token });
    expect(page.data.account.email).toBe("analyst7@ringbatch.example");
    const otherSession = await demoCookie("analyst7@ringbatch.example");
    const mismatch = await call(reset.action, post(link.path, { password: "a-brand-new-secret", confirm: "a-brand-new-secrets" }), { token: link.token });
    expect(errorsOf(mismatch).confirm).toBe("The two passwords differ.");
    const set = await call(reset.action, post(link.path, { password: "a-brand-new-secret", confirm: "a-brand-new-secret" }), { token: link.token });
    expect(set.status).toBe(302);
    expect(set.headers.get("Location")).toBe("/lab");
    expect((await getUser(get("/lab", cookieFrom(set.headers))))!.email).toBe("analyst7@ringbatch.example");
    // Every earlier session ended; the old password no longer works, the new one does.
    expect(await getUser(get("/", otherSession))).toBeNull();
    expect(await verifyLogin("analyst7@ringbatch.example", DEMO_PASSWORD)).toBeNull();
    const signIn = await call(login.action, post("/login", { email: "analyst7@ringbatch.example", password: "a-brand-new-secret" }));
    expect(signIn.status).toBe(302);
    expect(signIn.headers.get("Location")).toBe("/lab");

    expect((await call(reset.loader, get(link.path), { token: link.token })).status).toBe(410);
    const again = await call(reset.action, post(link.path, { password: "yet-another-secret", confirm: "yet-another-secret" }), { token: link.token });
    expect(again.status).toBe(410);
    expect((await db.select().from(auditEvents).where(eq(auditEvents.action, "password_reset"))).length).toBe(1);
  });

  it("retires an earlier unused link when a new one is asked for", async () => {
    await askReset("analyst8@ringbatch.example", "198.51.100.2");
    const first = linkIn((await mailTo("analyst8@ringbatch.example"))[0]!.text, "reset-password");
    await askReset("analyst8@ringbatch.example", "198.51.100.2");
    const second = linkIn((await mailTo("analyst8@ringbatch.example"))[0]!.text, "reset-password");
    expect(second.token).not.toBe(first.token);
    expect((await call(reset.loader, get(first.path), { token: first.token })).status).toBe(410);
    expect((await call(reset.loader, get(second.path), { token: second.token })).status).toBe(200);
  });

  it("is rate-limited: a few links per account, then nothing more is sent; too many requests from one address are refused", async () => {
    const address = "198.51.100.3";
    const before = (await mailTo("analyst9@ringbatch.example")).length;
    for (let i = 0; i < 5; i++) expect((await askReset("analyst9@ringbatch.example", address)).status).toBe(200);
    expect((await mailTo("analyst9@ringbatch.example")).length - before).toBe(3);
    for (let i = 0; i < 5; i++) await askReset(`someone${i}@nowhere.example`, address);
    const refused = await askReset("analyst10@ringbatch.example", address);
    expect(refused.status).toBe(429);
    expect(errorsOf(refused).email).toMatch(/Too many requests from this address/);
    // Another address is not held up.
    expect((await askReset("analyst10@ringbatch.example", "198.51.100.4")).status).toBe(200);
  });

  it("sends nothing to a disabled account", async () => {
    await db.update(users).set({ disabledAt: new Date() }).where(eq(users.email, "analyst11@ringbatch.example"));
    expect((await askReset("analyst11@ringbatch.example", "198.51.100.5")).status).toBe(200);
    expect(await mailTo("analyst11@ringbatch.example")).toHaveLength(0);
  });

  it("links from the sign-in page, carrying the address along", async () => {
    const page = await call(forgot.loader, get("/forgot-password?email=ada%40lab.example"));
    expect(page.data.email).toBe("ada@lab.example");
    expect((await call(forgot.loader, get("/forgot-password", await demoCookie("analyst1@ringbatch.example")))).status).toBe(302);
  });
});

describe("an account made by an administrator", () => {
  it("gets a set-your-password e-mail instead of a typed password, and the link signs in to the role's home", async () => {
    const admin = await demoCookie("admin@ringbatch.example");
    const made = await call(adminUsers.action, post("/admin/users", { intent: "create", email: "Wren.Castell@ringbatch.example", name: "Wren Castell", roles: ["coordinator", "reviewer"], labId: "" }, admin));
    expect(await toastOf(made)).toMatch(/wren.castell@ringbatch.example created; a link to set the password is on its way/);
    const wren = (await db.query.users.findFirst({ where: eq(users.email, "wren.castell@ringbatch.example") }))!;
    expect(wren.passwordHash).toBeNull();
    const [mail] = await mailTo("wren.castell@ringbatch.example");
    expect(mail!.text).toMatch(/as a study coordinator and a committee reviewer/);
    const link = linkIn(mail!.text, "welcome");
    const row = (await db.select().from(passwordTokens).where(eq(passwordTokens.userId, wren.id)))[0]!;
    expect(row.purpose).toBe("welcome");
    expect(row.tokenHash).toBe(createHash("sha256").update(link.token).digest("hex"));
    const set = await call(welcome.action, post(link.path, { password: "wrens-own-password", confirm: "wrens-own-password" }), { token: link.token });
    expect(set.headers.get("Location")).toBe("/studies");
    const user = (await getUser(get("/", cookieFrom(set.headers))))!;
    expect(user.roles).toEqual(["coordinator", "reviewer"]);
  });
});
