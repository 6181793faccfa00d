import { and, desc, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { cells, emailOutbox, enrollments, labs, materials, mixtureConstituents, queries, shipments, studies, users } from "~/db/schema";
import { lbPerYd3ToKgPerM3 } from "~/lib/batching";
import * as progressApi from "~/routes/api/v1/study-progress";
import * as receipt from "~/routes/lab/study/receipt";
import * as materialPage from "~/routes/studies/study/material";
import * as shipmentsPage from "~/routes/studies/study/shipments";
import * as overview from "~/routes/studies/study/overview";
import { createStudyAs, postMultipart } from "../support/coordinator";
import { demoCookie, demoStudy, useDemoDatabase } from "../support/demo";
import { readReply } from "../support/replies";
import { call, get, post } from "../support/routes";
import { errorsOf, toastOf } from "../support/replies";

let coordinator: string;
let testing: typeof studies.$inferSelect;

beforeAll(async () => {
  await useDemoDatabase();
  coordinator = await demoCookie("coordinator@ringbatch.example");
  testing = await demoStudy("FF-2026-B");
});

const params = () => ({ studyId: String(testing.id) });

describe("the mixture design editor's save", () => {
  let study: typeof studies.$inferSelect;
  let materialId: number;
  const design = {
    code: "M1",
    description: "Reference",
    "c.0.kind": "cement", "c.0.name": "Portland cement", "c.0.lot": "C-1", "c.0.ssdMassKgPerM3": "335", "c.0.relativeDensity": "3.15",
    "c.1.kind": "water", "c.1.name": "Batch water", "c.1.lot": "", "c.1.ssdMassKgPerM3": "150", "c.1.relativeDensity": "1",
    "c.2.kind": "admixture", "c.2.name": "Water reducer", "c.2.lot": "", "c.2.dosagePer100kgCementitious": "300",
  };
  const save = async (fields: Record<string, string>) =>
    readReply(await call(materialPage.action, post(`/studies/${study.id}/materials/${materialId}`, fields, coordinator), { studyId: String(study.id), materialId: String(materialId) }));

  beforeAll(async () => {
    study = await createStudyAs(coordinator, { code: "FF-2027-MIX" });
    [{ id: materialId }] = await db.insert(materials).values({ studyId: study.id, code: "M1" }).returning();
  });

  it("stores the rows in SI whichever units they were typed in", async () => {
    expect((await save({ ...design, units: "si" })).done).toBe("Mixture design saved.");
    const si = await db.select().from(mixtureConstituents).where(eq(mixtureConstituents.materialId, materialId));
    expect(si.map((r) => [r.kind, r.ssdMassKgPerM3, r.dosageMlPer100Kg])).toEqual([
      ["cement", 335, null],
      ["water", 150, null],
      ["admixture", null, 300],
    ]);
    await save({ ...design, units: "us", "c.0.ssdMassKgPerM3": "564", "c.2.dosagePer100kgCementitious": "4" });
    const us = await db.select().from(mixtureConstituents).where(eq(mixtureConstituents.materialId, materialId));
    // 1 lb/yd³ = 0.45359237 / 0.764554857984 kg/m³ (NIST SP 811 exact definitions): 564 lb/yd³ ≈ 334.61 kg/m³.
    expect(us[0]!.ssdMassKgPerM3).toBeCloseTo(564 * (0.45359237 / 0.764554857984), 9);
    expect(us[0]!.ssdMassKgPerM3).toBeCloseTo(lbPerYd3ToKgPerM3(564), 12);
    // 1 US fl oz = 29.5735295625 mL and 1 cwt = 45.359237 kg (exact): 4 fl oz/cwt ≈ 260.79 mL/100 kg.
    expect(us[2]!.dosageMlPer100Kg).toBeCloseTo((4 * 29.5735295625 * 100) / 45.359237, 9);
  });

  it.each([
    ["c.0.ssdMassKgPerM3", { "c.0.ssdMassKgPerM3": "-5" }, "Mass must be more than 0"],
    ["c.0.relativeDensity", { "c.0.relativeDensity": "" }, "Relative density must be a number"],
    ["c.0.name", { "c.0.name": "" }, "Name is required"],
    ["c.2.dosagePer100kgCementitious", { "c.2.dosagePer100kgCementitious": "9000" }, "at most 5000 mL"],
    ["c.1.kind", { "c.1.kind": "gravel" }, "Kind must be one of"],
    ["constituents", { "c.1.kind": "cement" }, "exactly one water row"],
    ["code", { code: "" }, "Use up to 12 letters"],
  ])("refuses %s beside the field and keeps the stored design", async (field, change, message) => {
    const before = await db.select().from(mixtureConstituents).where(eq(mixtureConstituents.materialId, materialId));
    const outcome = await save({ ...design, units: "si", ...change });
    expect(outcome.status).toBe(400);
    expect(outcome.errors[field]).toContain(message);
    // The rows come back as typed; a field left blank comes back blank.
    const typedRows = outcome.values.c as Record<string, { name?: string }>;
    expect(typedRows["0"]!.name ?? "").toBe({ ...design, ...change }["c.0.name"]);
    expect(await db.select().from(mixtureConstituents).where(eq(mixtureConstituents.materialId, materialId))).toEqual(before);
  });

  it("is fixed once testing starts, and hidden from people outside the study", async () => {
    const path = `/studies/${testing.id}/materials/1`;
    const locked = await call(materialPage.action, post(path, { ...design, units: "si" }, coordinator), { studyId: String(testing.id), materialId: "1" });
    expect([400, 404]).toContain(locked.status);
    const mine = (await db.query.materials.findFirst({ where: eq(materials.studyId, testing.id) }))!;
    const lockedOwn = await readReply(
      await call(materialPage.action, post(`/studies/${testing.id}/materials/${mine.id}`, { ...design, code: mine.code, units: "si" }, coordinator), {
        studyId: String(testing.id),
        materialId: String(mine.id),
      }),
    );
    expect(lockedOwn.errors.code).toBe("Replicates, responses and materials are fixed once testing starts.");
    const outsider = await call(materialPage.loader, get(path, await demoCookie("analyst1@ringbatch.example")), { studyId: String(study.id), materialId: String(materialId) });
    expect(outsider.status).toBe(404);
  });
});

describe("progress and reminders", () => {
  it("counts each lab × material status, with queried from open queries", async () => {
    // Lab index 0 submitted F1; a query on one of its cells makes the pair queried.
    const [cell] = await db.select().from(cells).innerJoin(enrollments, eq(enrollments.id, cells.enrollmentId)).where(eq(enrollments.studyId, testing.id)).limit(1);
    const coordinatorUser = (await db.query.users.findFirst({ where: eq(users.email, "coordinator@ringbatch.example") }))!;
    await db.insert(queries).values({ cellId: cell!.cells.id, raisedBy: coordinatorUser.id, question: "Was replicate 2 from a second batch?" });
    const outcome = await call(progressApi.loader, get(`/api/v1/studies/${testing.id}/progress`, coordinator), params());
    // Revalidated on every poll (an unchanged progress answers 304), never served from a cache unasked.
    expect(outcome.headers.get("Cache-Control")).toBe("private, no-cache");
    expect(outcome.data.labs).toHaveLength(8);
    const [f1, f2] = outcome.data.counts;
    // Seed: 4 labs submitted both materials, 2 hold drafts of F1 only, 2 have not started.
    expect(f1.counts).toEqual({ not_started: 2, draft: 2, submitted: 3, amended: 0, queried: 1 });
    expect(f2.counts).toEqual({ not_started: 4, draft: 0, submitted: 4, amended: 0, queried: 0 });
  });

  it("shows a lab only its own row, and nobody outside the study anything", async () => {
    const own = await call(progressApi.loader, get(`/api/v1/studies/${testing.id}/progress`, await demoCookie("analyst5@ringbatch.example")), params());
    expect(own.status).toBe(200);
    expect(own.data.labs).toHaveLength(1);
    expect(own.data.labs[0].labName).toBe("Brimmel Aggregates Quality Lab");
    const total = own.data.counts.reduce((n: number, c: { counts: Record<string, number> }) => n + Object.values(c.counts).reduce((a, b) => a + b, 0), 0);
    expect(total).toBe(2);
    const [outsider] = await db.insert(users).values({ email: "outsider@ringbatch.example", name: "Out Sider", role: "analyst" }).returning();
    const { sessionCookieFor } = await import("../support/routes");
    expect((await call(progressApi.loader, get("/", await sessionCookieFor(outsider!.id)), params())).status).toBe(404);
    expect((await call(progressApi.loader, get("/", await demoCookie("reviewer1@ringbatch.example")), params())).status).toBe(404);
  });

  it("reminds only the labs with missing results", async () => {
    const before = (await db.select().from(emailOutbox)).length;
    const outcome = await readReply(await call(overview.action, post(`/studies/${testing.id}`, { intent: "remind" }, coordinator), params()));
    expect(outcome.done).toContain("Reminded 4 labs");
    const sent = (await db.select().from(emailOutbox)).slice(before);
    // Labs 5–8 of the seed (drafts or not started); labs 1–4 have submitted everything.
    expect(sent.map((m) => m.to).sort()).toEqual(["analyst5@ringbatch.example", "analyst6@ringbatch.example", "analyst7@ringbatch.example", "analyst8@ringbatch.example"]);
    expect(sent.find((m) => m.to === "analyst5@ringbatch.example")!.text).toContain("F2");
    const checking = await demoStudy("FF-2026-A");
    const refused = await readReply(await call(overview.action, post(`/studies/${checking.id}`, { intent: "remind" }, coordinator), { studyId: String(checking.id) }));
    expect(refused.errors.form).toBe("Reminders go out only while the study is testing.");
    expect((await call(overview.action, post(`/studies/${testing.id}`, { intent: "remind" }, await demoCookie("admin@ringbatch.example")), params())).status).toBe(404);
  });
});

describe("shipments and receipt", () => {
  let enrollmentId: number;
  let contactEmail: string;
  const ship = async (fields: Record<string, string>, cookie = coordinator) =>
    readReply(await call(shipmentsPage.action, post(`/studies/${testing.id}/shipments`, fields, cookie), params()));
  const item = { "items[0].description": "Polypropylene macro-fiber (F1)", "items[0].quantity": "2.5", "items[0].unit": "kg", "items[0].lot": "P-0601", "items[0].containerCount": "1" };

  beforeAll(async () => {
    // A lab whose materials are still on the way in the demo: its box goes missing and is replaced.
    const [inTransit] = await db
      .select({ enrollmentId: shipments.enrollmentId, contactEmail: labs.contactEmail })
      .from(shipments)
      .innerJoin(enrollments, eq(enrollments.id, shipments.enrollmentId))
      .innerJoin(labs, eq(labs.id, enrollments.labId))
      .where(and(eq(enrollments.studyId, testing.id), eq(shipments.status, "shipped")));
    enrollmentId = inTransit!.enrollmentId;
    contactEmail = inTransit!.contactEmail;
  });

  it("offers a lab a new shipment only once its box is lost, refusing bad input", async () => {
    const lab = String(enrollmentId);
    expect((await ship({ intent: "create", enrollmentId: lab, ...item, carrier: "", trackingNumber: "" })).errors.enrollmentId).toBe("Ship only to labs that have accepted and have no shipment yet.");
    const shipped = (await db.query.shipments.findFirst({ where: and(eq(shipments.enrollmentId, enrollmentId), eq(shipments.status, "shipped")) }))!;
    expect((await ship({ intent: "lost", shipmentId: String(shipped.id) })).done).toBe("Marked lost in transit.");
    const page = await call(shipmentsPage.loader, get(`/studies/${testing.id}/shipments`, coordinator), params());
    expect(page.data.awaiting.map((l: { value: string }) => l.value)).toEqual([lab]);
    expect(page.data.startingList.map((l: { lot: string }) => l.lot)).toContain("P-0601");
    expect((await ship({ intent: "create", enrollmentId: lab, carrier: "", trackingNumber: "" })).errors.items).toBe("List at least one item.");
    expect((await ship({ intent: "create", enrollmentId: "", ...item, carrier: "", trackingNumber: "" })).errors.enrollmentId).toBe("Choose a lab.");
    expect((await ship({ intent: "create", enrollmentId: "999999", ...item, carrier: "", trackingNumber: "" })).errors.enrollmentId).toContain("Ship only to labs that have accepted");
    expect((await ship({ intent: "create", enrollmentId: lab, ...item, carrier: "Kestrel Freight", trackingNumber: "" })).done).toBe("Shipment prepared.");
    expect((await ship({ intent: "create", enrollmentId: lab, ...item, carrier: "", trackingNumber: "" }, await demoCookie("analyst1@ringbatch.example"))).status).toBe(404);
  });

  it("marks it shipped and e-mails the lab; refuses a missing carrier or date and a second move", async () => {
    const shipment = (await db.query.shipments.findFirst({ where: eq(shipments.enrollmentId, enrollmentId), orderBy: desc(shipments.id) }))!;
    const id = String(shipment.id);
    expect((await ship({ intent: "ship", shipmentId: id, shippedOn: "", carrier: "Kestrel Freight", trackingNumber: "" })).errors.shippedOn).toContain("YYYY-MM-DD");
    expect((await ship({ intent: "ship", shipmentId: id, shippedOn: "2026-11-16", carrier: "", trackingNumber: "" })).errors.carrier).toBe("Name the carrier.");
    const before = (await db.select().from(emailOutbox)).length;
    expect((await ship({ intent: "ship", shipmentId: id, shippedOn: "2026-11-16", carrier: "Kestrel Freight", trackingNumber: "KF-1" })).done).toContain("e-mailed");
    const [notice] = (await db.select().from(emailOutbox)).slice(before);
    expect(notice).toMatchObject({ to: contactEmail });
    expect(notice!.text).toContain("Polypropylene macro-fiber (F1), 2.5 kg, lot P-0601, 1 container");
    expect(notice!.text).toContain(`/lab/studies/${testing.id}/receipt`);
    expect((await ship({ intent: "ship", shipmentId: id, shippedOn: "2026-11-16", carrier: "Kestrel Freight", trackingNumber: "" })).errors.form).toContain("cannot be changed");
    expect((await ship({ intent: "lost", shipmentId: "999999" })).errors.form).toBe("That shipment is not part of this study.");
  });

  it("lets the lab confirm receipt with a photo, and shows damage on the overview", async () => {
    const shipment = (await db.query.shipments.findFirst({ where: eq(shipments.enrollmentId, enrollmentId), orderBy: desc(shipments.id) }))!;
    const analyst = await demoCookie(contactEmail);
    const confirm = (fields: Record<string, string>, photo?: File, cookie = analyst) => {
      const form = new FormData();
      for (const [k, v] of Object.entries(fields)) form.set(k, v);
      if (photo) form.set("photo", photo);
      return call(receipt.action, postMultipart(`/lab/studies/${testing.id}/receipt`, form, cookie), params());
    };
    const fields = { shipmentId: String(shipment.id), receivedOn: "2026-11-18", condition: "damaged", receiptNotes: "" };
    expect(errorsOf(await confirm(fields)).receiptNotes).toContain("Describe the damage");
    expect(errorsOf(await confirm({ ...fields, condition: "soggy" })).condition).toContain("good condition or damaged");
    expect(errorsOf(await confirm({ ...fields, receivedOn: "18/02/2027" })).receivedOn).toContain("YYYY-MM-DD");
    expect(errorsOf(await confirm({ ...fields, receiptNotes: "Wet bag" }, new File(["<svg/>"], "photo.png"))).photo).toContain("not a JPG, PNG, WEBP file");
    // Another lab's analyst cannot confirm this lab's shipment, and learns nothing from the answer.
    expect((await confirm({ ...fields, receiptNotes: "x" }, undefined, await demoCookie("analyst1@ringbatch.example"))).status).toBe(404);
    // A 1 × 1 pixel PNG (PNG specification: signature 89 50 4E 47 0D 0A 1A 0A, then IHDR, IDAT, IEND).
    const png = new File([Buffer.from("iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNk+M9QDwADhgGAWjR9awAAAABJRU5ErkJggg==", "base64")], "bag.png");
    expect(await toastOf(await confirm({ ...fields, receiptNotes: "One fiber carton crushed." }, png))).toBe("Receipt confirmed. Thank you.");
    const stored = (await db.query.shipments.findFirst({ where: eq(shipments.id, shipment.id) }))!;
    expect(stored).toMatchObject({ status: "received", condition: "damaged", receivedOn: "2026-11-18", receiptNotes: "One fiber carton crushed." });
    expect(stored.photoAttachmentId).not.toBeNull();
    const page = await call(overview.loader, get(`/studies/${testing.id}`, coordinator), params());
    expect(page.data.shipments.damaged.map((s: { receiptNotes: string }) => s.receiptNotes)).toEqual(["One fiber carton crushed."]);
    expect((await call(receipt.loader, get("/", await demoCookie("reviewer1@ringbatch.example")), params())).status).toBe(404);
  });
});
