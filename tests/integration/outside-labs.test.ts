import { and, desc, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { auditEvents, emailOutbox, enrollments, labMembers, labs, materials, studies, users } from "~/db/schema";
import { listLabs } from "~/models/lab.server";
import * as adminLabs from "~/routes/admin/labs";
import * as adminUsers from "~/routes/admin/users";
import * as invite from "~/routes/auth/invite";
import * as labStudy from "~/routes/lab/study/tasks";
import * as labsPage from "~/routes/studies/study/labs";
import { getUser } from "~/server/guards.server";
import { createStudyAs } from "../support/coordinator";
import { demoCookie, useDemoDatabase } from "../support/demo";
import { errorsOf, readReply, toastOf, valuesOf } from "../support/replies";
import { call, cookieFrom, get, post } from "../support/routes";

let coordinator: string;
let admin: string;
let study: typeof studies.$inferSelect;
const OUTSIDE = { intent: "invite-outside", labName: "Graywick Slab Testing", contactName: "Orla Graywick", contactEmail: "Orla@Graywick.example" };

beforeAll(async () => {
  await useDemoDatabase();
  coordinator = await demoCookie("coordinator@ringbatch.example");
  admin = await demoCookie("admin@ringbatch.example");
  study = await createStudyAs(coordinator, { code: "FF-2027-O" });
  await db.update(studies).set({ state: "recruiting" }).where(eq(studies.id, study.id));
});

const labsAction = (fields: Record<string, string>) => call(labsPage.action, post(`/studies/${study.id}/labs`, fields, coordinator), { studyId: String(study.id) });
const adminAction = (fields: Record<string, string>) => call(adminLabs.action, post("/admin/labs", fields, admin), {});
const labByName = (name: string) => db.query.labs.findFirst({ where: eq(labs.name, name) });

/** The invitation link of the newest message to an address. */
async function invitationLink(to: string) {
  const [message] = await db.select().from(emailOutbox).where(eq(emailOutbox.to, to)).orderBy(desc(emailOutbox.id)).limit(1);
  const url = new URL(/https?:\/\/\S+\/invite\/\S+/.exec(message!.text)![0]);
  return { path: url.pathname + url.search, token: url.pathname.split("/").pop()!, text: message!.text };
}

describe("inviting a lab that is not in the directory", () => {
  it("refuses bad input beside each field, keeping what was typed", async () => {
    const bad = await readReply(await labsAction({ ...OUTSIDE, labName: " ", contactEmail: "orla at graywick" }));
    expect(bad.status).toBe(400);
    expect(bad.errors.labName).toBe("Enter a name.");
    expect(bad.errors.contactEmail).toMatch(/e-mail address/);
    expect(bad.values.contactName).toBe("Orla Graywick");
    const listed = await readReply(await labsAction({ ...OUTSIDE, labName: "quarrow county materials lab" }));
    expect(listed.errors.labName).toBe("A lab of this name is in the directory: invite it from the list.");
    const knownContact = await readReply(await labsAction({ ...OUTSIDE, contactEmail: "analyst2@ringbatch.example" }));
    expect(knownContact.errors.contactEmail).toBe("This is the contact of Tessel Ready-Mix QC, which is in the directory: invite it from the list.");
    expect(await labByName(OUTSIDE.labName)).toBeUndefined();
  });

  it("e-mails the contact an invitation with the study's dates, workload and coordinator; the lab stays out of the pickers until it accepts", async () => {
    const sent = await labsAction(OUTSIDE);
    expect(await toastOf(sent)).toBe("Invitation sent to orla@graywick.example. Graywick Slab Testing joins the lab directory when it accepts.");
    const lab = (await labByName(OUTSIDE.labName))!;
    expect(lab.listing).toBe("invited");
    expect((await listLabs()).map((l) => l.id)).not.toContain(lab.id);
    const page = await call(labsPage.loader, get(`/studies/${study.id}/labs`, coordinator), { studyId: String(study.id) });
    expect(page.data.rows.find((r: { id: number }) => r.id === lab.id)).toMatchObject({ listing: "invited", enrollmentState: "invited" });

    const { text } = await invitationLink("orla@graywick.example");
    expect(text).toContain("Dear Orla Graywick,");
    // The dates of the study made by createStudyAs (tests/support/coordinator.ts).
    expect(text).toContain("Dates: answer by 2027-02-01; materials ship on 2027-02-15; results are due on 2027-04-30.");
    expect(text).toContain("Workload: 3 replicates of each material; each test records Passes to close the preformed holes (passes) and Passes to reach the target surface (passes).");
    expect(text).toContain("Coordinator: Dr. Talia Brennock, coordinator@ringbatch.example.");
  });

  it("creates the contact's account on acceptance; the lab joins the directory, marked for a duplicate check", async () => {
    const link = await invitationLink("orla@graywick.example");
    const opened = await call(invite.loader, get(link.path), { token: link.token });
    expect(opened.data.invitation).toMatchObject({ email: "orla@graywick.example", needsPassword: true, joinsDirectory: true, labName: OUTSIDE.labName });
    const accepted = await call(invite.action, post(link.path, { intent: "accept", name: "Orla Graywick", password: "orlas-own-password", confirm: "orlas-own-password" }), { token: link.token });
    expect(accepted.status).toBe(302);
    const orla = (await getUser(get("/lab", cookieFrom(accepted.headers))))!;
    expect(orla).toMatchObject({ email: "orla@graywick.example", roles: ["analyst"] });
    const lab = (await labByName(OUTSIDE.labName))!;
    expect(orla.contactLabIds).toEqual([lab.id]);
    expect(lab.listing).toBe("unchecked");
    expect((await listLabs()).map((l) => l.id)).toContain(lab.id);
    const enrollment = (await db.query.enrollments.findFirst({ where: and(eq(enrollments.studyId, study.id), eq(enrollments.labId, lab.id)) }))!;
    expect(enrollment.state).toBe("accepted");
    expect(enrollment.labCode).toMatch(/^L\d{2}$/);
    const directory = await call(adminLabs.loader, get("/admin/labs", admin), {});
    expect(directory.data.labs.find((l: { id: number }) => l.id === lab.id)).toMatchObject({ listing: "unchecked", studyCodes: ["FF-2027-O"], memberEmails: ["orla@graywick.example"] });
  });

  it("sends a directory lab's sign-in link with the invited address filled in", async () => {
    const quarrow = (await labByName("Quarrow County Materials Lab"))!;
    await db.insert(materials).values([
      { studyId: study.id, code: "M1", sortOrder: 0 },
      { studyId: study.id, code: "M2", sortOrder: 1 },
    ]);
    expect(await toastOf(await labsAction({ intent: "invite", labId: String(quarrow.id) }))).toBe("Invitation sent to the lab's contact.");
    const link = await invitationLink("analyst1@ringbatch.example");
    expect(link.text).toContain("Workload: 2 materials × 3 replicates = 6 tests; each test records");
    const opened = await call(invite.loader, get(link.path), { token: link.token });
    const signIn = new URL(opened.data.invitation.signInLink, "http://ringbatch.test");
    expect(signIn.pathname).toBe("/login");
    expect(signIn.searchParams.get("email")).toBe("analyst1@ringbatch.example");
    expect(signIn.searchParams.get("redirectTo")).toBe(link.path);
  });
});

describe("merging a duplicate lab", () => {
  it("refuses a merge that would put one lab twice into a study, and says which study", async () => {
    const graywick = (await labByName(OUTSIDE.labName))!;
    const quarrow = (await labByName("Quarrow County Materials Lab"))!;
    const refused = await adminAction({ intent: "merge", labId: String(graywick.id), intoLabId: String(quarrow.id) });
    expect(errorsOf(refused).intoLabId).toBe("Both labs take part in FF-2027-O: a study cannot have the same lab twice, so they cannot be merged.");
    const itself = await adminAction({ intent: "merge", labId: String(graywick.id), intoLabId: String(graywick.id) });
    expect(errorsOf(itself).intoLabId).toMatch(/cannot be merged into itself/);
    const none = await adminAction({ intent: "merge", labId: String(graywick.id), intoLabId: "" });
    expect(errorsOf(none).intoLabId).toBe("Choose the lab to merge into.");
    expect(valuesOf(none).labId).toBe(String(graywick.id));
    expect((await labByName(OUTSIDE.labName))!.mergedIntoId).toBeNull();
  });

  it("moves the enrollments and people, records it, and takes the duplicate out of every picker", async () => {
    const graywick = (await labByName(OUTSIDE.labName))!;
    const brimmel = (await labByName("Brimmel Aggregates Quality Lab"))!;
    const page = await call(adminLabs.loader, get(`/admin/labs?merge=${graywick.id}`, admin), {});
    expect(page.data.merging).toMatchObject({ id: graywick.id, studyCodes: ["FF-2027-O"], memberEmails: ["orla@graywick.example"] });
    const merged = await adminAction({ intent: "merge", labId: String(graywick.id), intoLabId: String(brimmel.id) });
    expect(await toastOf(merged)).toBe("Graywick Slab Testing merged into Brimmel Aggregates Quality Lab.");
    const enrollment = (await db.query.enrollments.findFirst({ where: eq(enrollments.studyId, study.id), orderBy: desc(enrollments.respondedAt) }))!;
    expect(enrollment.labId).toBe(brimmel.id);
    const orla = (await db.query.users.findFirst({ where: eq(users.email, "orla@graywick.example") }))!;
    expect(await db.select().from(labMembers).where(eq(labMembers.userId, orla.id))).toEqual([{ labId: brimmel.id, userId: orla.id, isContact: true }]);
    const gone = (await db.query.labs.findFirst({ where: eq(labs.id, graywick.id) }))!;
    expect(gone.mergedIntoId).toBe(brimmel.id);
    expect((await listLabs()).map((l) => l.id)).not.toContain(graywick.id);
    expect((await call(adminLabs.loader, get("/admin/labs", admin), {})).data.labs.map((l: { id: number }) => l.id)).not.toContain(graywick.id);
    const [audit] = await db.select().from(auditEvents).where(eq(auditEvents.action, "lab_merged"));
    expect(audit).toMatchObject({ entityType: "lab", entityId: String(graywick.id), after: expect.objectContaining({ mergedInto: brimmel.id }) });
    // The contact keeps their study, now under the lab it merged into.
    const cookie = await demoCookie("orla@graywick.example");
    expect((await call(labStudy.loader, get(`/lab/studies/${study.id}`, cookie), { studyId: String(study.id) })).status).toBe(200);
    // A merged lab cannot be merged again.
    const again = await adminAction({ intent: "merge", labId: String(graywick.id), intoLabId: String(brimmel.id) });
    expect(errorsOf(again).form).toBe("That lab no longer exists or was merged already.");
  });

  it("lets the admin clear the mark of a new lab that has no duplicate", async () => {
    const [fresh] = await db.insert(labs).values({ name: "Kestrel Pour Lab", contactEmail: "k@kestrel.example", listing: "unchecked" }).returning();
    expect(await toastOf(await adminAction({ intent: "checked", labId: String(fresh!.id) }))).toBe("Marked as checked: no duplicate.");
    expect((await labByName("Kestrel Pour Lab"))!.listing).toBeNull();
    const twice = await adminAction({ intent: "checked", labId: String(fresh!.id) });
    expect(errorsOf(twice).form).toBe("That lab is not waiting for a check.");
  });
});

describe("an outside lab whose contact declines", () => {
  const DECLINING = { intent: "invite-outside", labName: "Fallowmere Concrete Bench", contactName: "Ansel Fallowmere", contactEmail: "ansel@fallowmere.example" };

  it("never joins the directory or any picker, and the study keeps its declined row", async () => {
    await labsAction(DECLINING);
    const link = await invitationLink("ansel@fallowmere.example");
    const declined = await call(invite.action, post(link.path, { intent: "decline" }), { token: link.token });
    expect(declined.data).toEqual({ declined: true });
    const lab = (await labByName(DECLINING.labName))!;
    expect(lab.listing).toBe("invited");
    expect((await listLabs()).map((l) => l.id)).not.toContain(lab.id);
    const directory = await call(adminLabs.loader, get("/admin/labs", admin), {});
    expect(directory.data.labs.map((l: { id: number }) => l.id)).not.toContain(lab.id);
    const people = await call(adminUsers.loader, get("/admin/users", admin), {});
    expect(people.data.labs.map((l: { id: number }) => l.id)).not.toContain(lab.id);
    // The study's labs page keeps the declined row, so the coordinator can invite the lab again from there.
    const page = await call(labsPage.loader, get(`/studies/${study.id}/labs`, coordinator), { studyId: String(study.id) });
    expect(page.data.rows.find((r: { id: number }) => r.id === lab.id)).toMatchObject({ listing: "invited", enrollmentState: "declined" });
  });

  it("is invited again under the same name and contact, and a different contact under that name is told why not", async () => {
    const lab = (await labByName(DECLINING.labName))!;
    const other = await createStudyAs(coordinator, { code: "FF-2027-P" });
    await db.update(studies).set({ state: "recruiting" }).where(eq(studies.id, other.id));
    const inviteTo = (fields: Record<string, string>) => call(labsPage.action, post(`/studies/${other.id}/labs`, fields, coordinator), { studyId: String(other.id) });
    const elsewhere = await readReply(await inviteTo({ ...DECLINING, contactEmail: "someone@fallowmere.example" }));
    expect(elsewhere.errors.labName).toBe("A lab of this name was invited with another contact and has not joined the directory: check the name and the contact with the lab.");
    expect(await toastOf(await inviteTo(DECLINING))).toMatch(/^Invitation sent to ansel@fallowmere\.example\./);
    expect((await db.select().from(labs).where(eq(labs.name, DECLINING.labName))).map((l) => l.id)).toEqual([lab.id]);
  });
});
