import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { labMembers, labs, studies, users } from "~/db/schema";
import { accountChangeRefusal } from "~/models/user.server";
import * as adminUsers from "~/routes/admin/users";
import * as labHome from "~/routes/lab/index";
import * as reviewHome from "~/routes/review/index";
import * as root from "~/root";
import * as labsPage from "~/routes/studies/study/labs";
import * as setup from "~/routes/studies/study/setup";
import { getUser } from "~/server/guards.server";
import { createStudyAs } from "../support/coordinator";
import { demoCookie, useDemoDatabase } from "../support/demo";
import { errorsOf, toastOf } from "../support/replies";
import { call, get, post } from "../support/routes";

let admin: string;
let coordinator: string;
const userId = async (email: string) => (await db.query.users.findFirst({ where: eq(users.email, email) }))!.id;
const labId = async (name: string) => (await db.query.labs.findFirst({ where: eq(labs.name, name) }))!.id;

beforeAll(async () => {
  await useDemoDatabase();
  admin = await demoCookie("admin@ringbatch.example");
  coordinator = await demoCookie("coordinator@ringbatch.example");
});

const update = (fields: Record<string, string | string[]>) => call(adminUsers.action, post("/admin/users", { intent: "update", labId: "", ...fields }, admin));
const usersPage = (query = "") => call(adminUsers.loader, get(`/admin/users${query}`, admin));
/** The e-mail addresses of the accounts page's rows, in sorted order. */
const listedEmails = async (query: string) => (await usersPage(query)).data.users.rows.map((u: { email: string }) => u.email).sort();

describe("a person with several roles", () => {
  it("is granted a second role on the admin's users page, and reaches both roles' pages and links", async () => {
    const analyst3 = await userId("analyst3@ringbatch.example");
    const vantoller = await labId("Vantoller Testing Services");
    const granted = await update({ userId: String(analyst3), roles: ["analyst", "reviewer"], labId: String(vantoller), isContact: "on" });
    expect(await toastOf(granted)).toBe("Account updated.");
    const cookie = await demoCookie("analyst3@ringbatch.example");
    const user = (await getUser(get("/", cookie)))!;
    expect(user.roles).toEqual(["analyst", "reviewer"]);
    expect(user.role).toBe("analyst");
    expect((await call(labHome.loader, get("/lab", cookie))).status).toBe(200);
    expect((await call(reviewHome.loader, get("/review", cookie))).status).toBe(200);
    expect((await call(adminUsers.loader, get("/admin/users", cookie))).status).toBe(404);
    const header = await call(root.loader, get("/lab", cookie));
    expect(header.data.user.roles).toEqual(["analyst", "reviewer"]);
  });

  it("loses a role again, and an analyst keeps a lab", async () => {
    const analyst3 = await userId("analyst3@ringbatch.example");
    const noLab = await update({ userId: String(analyst3), roles: ["analyst"] });
    expect(errorsOf(noLab).labId).toBe("An analyst belongs to a lab: choose one.");
    const none = await update({ userId: String(analyst3) });
    expect(errorsOf(none).roles).toBe("Choose at least one role.");
    // Nothing of the refused changes was stored.
    expect((await getUser(get("/", await demoCookie("analyst3@ringbatch.example"))))!.roles).toEqual(["analyst", "reviewer"]);
    await update({ userId: String(analyst3), roles: ["analyst"], labId: String(await labId("Vantoller Testing Services")), isContact: "on" });
    const cookie = await demoCookie("analyst3@ringbatch.example");
    expect((await call(reviewHome.loader, get("/review", cookie))).status).toBe(404);
    await update({ userId: String(analyst3), roles: ["analyst", "reviewer"], labId: String(await labId("Vantoller Testing Services")), isContact: "on" });
  });
});

describe("the admin's users page offers no action that would be refused", () => {
  it("keeps the administrator's own role and account, and the last administrator's", async () => {
    const adminId = await userId("admin@ringbatch.example");
    const page = await usersPage();
    expect(page.data.adminId).toBe(adminId);
    const own = page.data.users.rows.find((u: { id: number }) => u.id === adminId);
    expect(own.onlyAdmin).toBe(true);
    const demote = await update({ userId: String(adminId), roles: ["coordinator"] });
    expect(errorsOf(demote).roles).toMatch(/cannot take the administrator role from yourself/);
    const disable = await call(adminUsers.action, post("/admin/users", { intent: "disable", userId: String(adminId), disabled: "true" }, admin));
    expect(errorsOf(disable).form).toBe("You cannot disable your own account.");
    expect((await db.query.users.findFirst({ where: eq(users.id, adminId) }))!.disabledAt).toBeNull();
    // The same rule, for another administrator acting on the only one left.
    expect(accountChangeRefusal({ userId: adminId, roles: ["analyst"] }, 999, [adminId])).toMatch(/only active administrator/);
    expect(accountChangeRefusal({ userId: adminId, disable: true }, 999, [adminId])).toMatch(/only active administrator/);
    expect(accountChangeRefusal({ userId: adminId, roles: ["analyst"] }, 999, [adminId, 999])).toBeNull();
  });
});

describe("searching and filtering accounts", () => {
  it("finds by part of the name or e-mail, by role (also a second role), by lab, one page at a time", async () => {
    expect(await listedEmails("?q=brennock")).toEqual(["coordinator@ringbatch.example"]);
    expect(await listedEmails("?q=ANALYST1")).toEqual(["analyst1@ringbatch.example", "analyst10@ringbatch.example", "analyst11@ringbatch.example", "analyst12@ringbatch.example"].sort());
    // A % typed in the search means itself, not "anything".
    expect((await usersPage("?q=%25")).data.users.total).toBe(0);
    // analyst8 is the demo's analyst who also sits on the committee (seed/seed.ts).
    expect(await listedEmails("?role=reviewer")).toEqual(["analyst3@ringbatch.example", "analyst8@ringbatch.example", "reviewer1@ringbatch.example", "reviewer2@ringbatch.example", "reviewer3@ringbatch.example"].sort());
    const vantoller = await labId("Vantoller Testing Services");
    expect(await listedEmails(`?lab=${vantoller}&role=analyst`)).toEqual(["analyst3@ringbatch.example"]);
    // Nonsense in the query means "any".
    const nonsense = await usersPage("?role=wizard&lab=abc");
    expect(nonsense.data.filter).toEqual({ q: "", role: null, lab: null });

    const total = nonsense.data.users.total;
    await db.insert(users).values(Array.from({ length: 30 - total }, (_, i) => ({ email: `paging${String(i).padStart(2, "0")}@ringbatch.example`, name: `Paging ${i}`, role: "analyst" as const })));
    const first = await usersPage();
    expect(first.data.users.total).toBe(30);
    expect(first.data.users.pageCount).toBe(2);
    expect(first.data.users.rows).toHaveLength(25);
    const second = await usersPage("?page=2");
    expect(second.data.users.rows).toHaveLength(5);
    expect(new Set([...first.data.users.rows, ...second.data.users.rows].map((u: { id: number }) => u.id)).size).toBe(30);
    const pagedSearch = await usersPage("?q=paging&page=2");
    expect(pagedSearch.data.users.total).toBe(30 - total);
    expect(pagedSearch.data.users.page).toBe(1);
  });
});

describe("a reviewer never reviews a study in which their own lab takes part", () => {
  let study: typeof studies.$inferSelect;
  const studyId = () => String(study.id);

  it("leaves a reviewer of a participating lab out of the picker, says why, and refuses them", async () => {
    study = await createStudyAs(coordinator, { code: "FF-2027-R" });
    await db.update(studies).set({ state: "recruiting" }).where(eq(studies.id, study.id));
    const vantoller = await labId("Vantoller Testing Services");
    const invited = await call(labsPage.action, post(`/studies/${study.id}/labs`, { intent: "invite", labId: String(vantoller) }, coordinator), { studyId: studyId() });
    expect(await toastOf(invited)).toBe("Invitation sent to the lab's contact.");
    const page = await call(setup.loader, get(`/studies/${study.id}/setup`, coordinator), { studyId: studyId() });
    const choice = page.data.reviewerChoice;
    expect(choice.offered.map((r: { email: string }) => r.email)).toEqual(expect.arrayContaining(["reviewer1@ringbatch.example", "reviewer2@ringbatch.example"]));
    expect(choice.offered.map((r: { email: string }) => r.email)).not.toContain("analyst3@ringbatch.example");
    expect(choice.leftOut).toEqual([expect.objectContaining({ email: "analyst3@ringbatch.example", labName: "Vantoller Testing Services" })]);
    const refused = await call(setup.action, post(`/studies/${study.id}/setup`, { intent: "reviewer-add", email: "analyst3@ringbatch.example" }, coordinator), { studyId: studyId() });
    expect(errorsOf(refused).email).toMatch(/works at a participating lab \(Vantoller Testing Services\)/);
    const notReviewer = await call(setup.action, post(`/studies/${study.id}/setup`, { intent: "reviewer-add", email: "analyst4@ringbatch.example" }, coordinator), { studyId: studyId() });
    expect(errorsOf(notReviewer).email).toBe("This account is not a committee reviewer.");
  });

  it("refuses to invite the lab of someone who already reviews the study", async () => {
    const added = await call(setup.action, post(`/studies/${study.id}/setup`, { intent: "reviewer-add", email: "reviewer1@ringbatch.example" }, coordinator), { studyId: studyId() });
    expect(added.status).toBe(302);
    const ostrade = await labId("Ostrade Highway District Lab");
    await db.insert(labMembers).values({ labId: ostrade, userId: await userId("reviewer1@ringbatch.example") });
    const refused = await call(labsPage.action, post(`/studies/${study.id}/labs`, { intent: "invite", labId: String(ostrade) }, coordinator), { studyId: studyId() });
    expect(errorsOf(refused).labId).toMatch(/a reviewer of this study, works at this lab/);
  });
});
