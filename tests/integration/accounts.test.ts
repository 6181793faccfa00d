import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { auditEvents, emailOutbox, labMembers, labs, users } from "~/db/schema";
import { getUser } from "~/server/guards.server";
import * as account from "~/routes/account";
import * as adminLabs from "~/routes/admin/labs";
import * as adminUsers from "~/routes/admin/users";
import * as welcome from "~/routes/auth/welcome";
import { DEMO_PASSWORD } from "../../seed/demo-data";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "../support/database";
import { demoCookie } from "../support/demo";
import { call, cookieFrom, get, post } from "../support/routes";
import { errorsOf, toastOf, valuesOf } from "../support/replies";

beforeAll(async () => {
  await useFreshDatabase();
  await seedDemo(db);
});

describe("account page", () => {
  it("changes the name, keeping the value on a validation error", async () => {
    const cookie = await demoCookie("reviewer3@ringbatch.example");
    const bad = await call(account.action, post("/account", { intent: "profile", name: "   " }, cookie));
    expect(bad.status).toBe(400);
    expect(errorsOf(bad).name).toBe("Enter a name.");
    const ok = await call(account.action, post("/account", { intent: "profile", name: "Dagny O." }, cookie));
    expect(await toastOf(ok)).toMatch(/saved/);
    expect((await db.query.users.findFirst({ where: eq(users.email, "reviewer3@ringbatch.example") }))!.name).toBe("Dagny O.");
  });

  it("needs the current password to change it, then ends every session", async () => {
    const cookie = await demoCookie("reviewer3@ringbatch.example");
    const other = await demoCookie("reviewer3@ringbatch.example");
    const fields = { intent: "password", currentPassword: "wrong-password", newPassword: "a-new-long-password", confirmPassword: "a-new-long-password" };
    const wrong = await call(account.action, post("/account", fields, cookie));
    expect(wrong.status).toBe(400);
    expect(errorsOf(wrong).currentPassword).toBe("The current password is not correct.");
    const mismatch = await call(account.action, post("/account", { ...fields, currentPassword: DEMO_PASSWORD, confirmPassword: "different-password" }, cookie));
    expect(errorsOf(mismatch).confirmPassword).toBe("The two new passwords differ.");
    const short = await call(account.action, post("/account", { ...fields, currentPassword: DEMO_PASSWORD, newPassword: "short", confirmPassword: "short" }, cookie));
    expect(errorsOf(short).newPassword).toBe("Use at least 12 characters.");
    expect(await getUser(get("/", other))).not.toBeNull();
    const changed = await call(account.action, post("/account", { ...fields, currentPassword: DEMO_PASSWORD }, cookie));
    expect(changed.status).toBe(302);
    expect(await getUser(get("/", other))).toBeNull();
  });

  it("signs out of every session", async () => {
    const a = await demoCookie("analyst5@ringbatch.example");
    const b = await demoCookie("analyst5@ringbatch.example");
    await call(account.action, post("/account", { intent: "sign-out-everywhere" }, a));
    expect(await getUser(get("/", a))).toBeNull();
    expect(await getUser(get("/", b))).toBeNull();
  });

  it("lets a lab contact add analysts of their own lab, who set their password from an e-mailed link", async () => {
    const contact = await demoCookie("analyst1@ringbatch.example");
    const lab1 = await db.query.labs.findFirst({ where: eq(labs.name, "Quarrow County Materials Lab") });
    const lab2 = await db.query.labs.findFirst({ where: eq(labs.name, "Tessel Ready-Mix QC") });
    const colleague = { intent: "add-colleague", labId: String(lab1!.id), name: "Nell Ferris", email: "nell@quarrow.example" };
    const invalid = await call(account.action, post("/account", { ...colleague, email: "not-an-email" }, contact));
    expect(errorsOf(invalid).email).toMatch(/e-mail address/);
    expect(valuesOf(invalid).name).toBe("Nell Ferris");
    const added = await call(account.action, post("/account", colleague, contact));
    expect(await toastOf(added)).toMatch(/Nell Ferris.*e-mail/);
    const nell = await db.query.users.findFirst({ where: eq(users.email, "nell@quarrow.example") });
    expect(nell!.role).toBe("analyst");
    expect(nell!.passwordHash).toBeNull();
    const duplicate = await call(account.action, post("/account", colleague, contact));
    expect(errorsOf(duplicate).email).toBe("An account with this e-mail already exists.");
    const foreign = await call(account.action, post("/account", { ...colleague, labId: String(lab2!.id), email: "x@y.example" }, contact));
    expect(foreign.status).toBe(404);

    // The e-mail carries the only copy of the link.
    const [mail] = await db.select().from(emailOutbox).where(eq(emailOutbox.to, "nell@quarrow.example"));
    const path = new URL(mail!.text.match(/https?:\/\/\S+\/welcome\/\S+/)![0]).pathname;
    const token = path.split("/").pop()!;
    expect((await call(welcome.loader, get(path), { token })).data.account).toEqual({ name: "Nell Ferris", email: "nell@quarrow.example" });
    const short = await call(welcome.action, post(path, { password: "short", confirm: "short" }), { token });
    expect(errorsOf(short).password).toBe("Use at least 12 characters.");
    const set = await call(welcome.action, post(path, { password: "nells-own-password", confirm: "nells-own-password" }), { token });
    expect(set.status).toBe(302);
    expect(set.headers.get("Location")).toBe("/lab");
    expect((await getUser(get("/lab", cookieFrom(set.headers))))!.email).toBe("nell@quarrow.example");
    const again = await call(welcome.loader, get(path), { token });
    expect(again.status).toBe(410);
    expect((await call(welcome.loader, get("/welcome/nonsense"), { token: "nonsense" })).status).toBe(404);

    const removed = await call(account.action, post("/account", { intent: "remove-colleague", labId: String(lab1!.id), userId: String(nell!.id) }, contact));
    expect(await toastOf(removed)).toMatch(/removed/);
    expect(await db.select().from(labMembers).where(eq(labMembers.userId, nell!.id))).toHaveLength(0);
  });
});

describe("admin pages", () => {
  it("creates an account, with a message beside each bad field", async () => {
    const admin = await demoCookie("admin@ringbatch.example");
    const bad = await call(adminUsers.action, post("/admin/users", { intent: "create", email: "x", name: "", roles: "wizard", labId: "" }, admin));
    expect(bad.status).toBe(400);
    expect(Object.keys(errorsOf(bad)).sort()).toEqual(["email", "name", "roles[0]"]);
    const noRole = await call(adminUsers.action, post("/admin/users", { intent: "create", email: "new@lab.example", name: "New Analyst", labId: "" }, admin));
    expect(errorsOf(noRole).roles).toBe("Choose at least one role.");
    const noLab = await call(adminUsers.action, post("/admin/users", { intent: "create", email: "new@lab.example", name: "New Analyst", roles: "analyst", labId: "" }, admin));
    expect(errorsOf(noLab).labId).toMatch(/choose one/);
    expect(valuesOf(noLab).email).toBe("new@lab.example");
    const ok = await call(adminUsers.action, post("/admin/users", { intent: "create", email: "coord2@ringbatch.example", name: "Second Coordinator", roles: "coordinator", labId: "" }, admin));
    expect(await toastOf(ok)).toMatch(/created/);
  });

  it("disables an account and ends its sessions", async () => {
    const admin = await demoCookie("admin@ringbatch.example");
    const victim = await demoCookie("analyst6@ringbatch.example");
    const user = await db.query.users.findFirst({ where: eq(users.email, "analyst6@ringbatch.example") });
    const outcome = await call(adminUsers.action, post("/admin/users", { intent: "disable", userId: String(user!.id), disabled: "true" }, admin));
    expect(await toastOf(outcome)).toMatch(/disabled/);
    expect(await getUser(get("/", victim))).toBeNull();
    const audit = await db.select().from(auditEvents).where(eq(auditEvents.action, "user_disabled"));
    expect(audit).toHaveLength(1);
  });

  it("adds a lab to the directory and refuses a duplicate name", async () => {
    const admin = await demoCookie("admin@ringbatch.example");
    const lab = { name: "Norrow Field Lab", address: "1 Test Road", contactName: "", contactEmail: "", accreditationNumber: "" };
    expect(await toastOf(await call(adminLabs.action, post("/admin/labs", { intent: "save", ...lab }, admin)))).toMatch(/Norrow/);
    const again = await call(adminLabs.action, post("/admin/labs", { intent: "save", ...lab }, admin));
    expect(errorsOf(again).name).toBe("A lab with this name already exists.");
    const badEmail = await call(adminLabs.action, post("/admin/labs", { intent: "save", ...lab, name: "Other", contactEmail: "nope" }, admin));
    expect(errorsOf(badEmail).contactEmail).toMatch(/e-mail/);
  });

  it("edits a lab's entry, so a lab without a contact e-mail can be invited", async () => {
    const admin = await demoCookie("admin@ringbatch.example");
    const norrow = (await db.query.labs.findFirst({ where: eq(labs.name, "Norrow Field Lab") }))!;
    const page = await call(adminLabs.loader, get(`/admin/labs?edit=${norrow.id}`, admin));
    expect(page.data.editing.name).toBe("Norrow Field Lab");
    const entry = { intent: "save", labId: String(norrow.id), name: "Norrow Field Lab", address: "1 Test Road", contactName: "Ada Quill", contactEmail: "ada@norrow.example", accreditationNumber: "QA-0001" };
    const saved = await call(adminLabs.action, post("/admin/labs", entry, admin));
    expect(await toastOf(saved)).toBe("Norrow Field Lab saved.");
    expect((await db.query.labs.findFirst({ where: eq(labs.id, norrow.id) }))!.contactEmail).toBe("ada@norrow.example");
    const taken = await call(adminLabs.action, post("/admin/labs", { ...entry, name: "Tessel Ready-Mix QC" }, admin));
    expect(errorsOf(taken).name).toBe("A lab with this name already exists.");
    const gone = await call(adminLabs.action, post("/admin/labs", { ...entry, labId: "999999" }, admin));
    expect(errorsOf(gone).form).toBe("That lab no longer exists.");
  });
});
