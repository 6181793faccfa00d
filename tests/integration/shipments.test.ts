import { cpSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { createClient } from "@libsql/client";
import { and, eq, inArray } from "drizzle-orm";
import { drizzle } from "drizzle-orm/libsql";
import { migrate } from "drizzle-orm/libsql/migrator";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { enrollments, labs, shipmentItems, shipments, studies } from "~/db/schema";
import * as packingList from "~/routes/studies/study/packing-list";
import * as shipmentsPage from "~/routes/studies/study/shipments";
import * as labsPage from "~/routes/studies/study/labs";
import { demoCookie, demoStudy, useDemoDatabase } from "../support/demo";
import { readReply } from "../support/replies";
import { call, get, post } from "../support/routes";

let testing: typeof studies.$inferSelect;
let coordinator: string;
const params = () => ({ studyId: String(testing.id) });
const page = (cookie = coordinator) => call(shipmentsPage.loader, get(`/studies/${testing.id}/shipments`, cookie), params());
const send = async (fields: Record<string, string>) => readReply(await call(shipmentsPage.action, post(`/studies/${testing.id}/shipments`, fields, coordinator), params()));

const list = {
  "items[0].description": "Polypropylene macro-fiber (F1, F3)",
  "items[0].quantity": "2,5",
  "items[0].unit": "kg",
  "items[0].lot": "P-0601",
  "items[0].containerCount": "2",
  "items[1].description": "Portland cement Type I/II (F1–F4)",
  "items[1].quantity": "150",
  "items[1].unit": "kg",
  "items[1].lot": "C-2611",
  "items[1].containerCount": "6",
};

let newLabs: (typeof labs.$inferSelect)[];

beforeAll(async () => {
  await useDemoDatabase();
  testing = await demoStudy("FF-2026-B");
  coordinator = await demoCookie("coordinator@ringbatch.example");
  // Three labs accept late: every demo lab already has its shipment.
  newLabs = await db.insert(labs).values([{ name: "Fenmoor Paving Lab", address: "2 Causeway End, Fenmoor" }, { name: "Skelbrook Site Lab" }, { name: "Tarrow Bridge Lab" }]).returning();
  await db.insert(enrollments).values(newLabs.map((lab, i) => ({ studyId: testing.id, labId: lab.id, state: "accepted" as const, labCode: `L${9 + i}` })));
});

describe("preparing one packing list for every lab awaiting materials", () => {
  it("offers only the labs without a shipment, and a starting list from the constituent lots", async () => {
    const { data } = await page();
    expect(data.awaiting.map((l: { label: string }) => l.label)).toEqual(["L10 · Skelbrook Site Lab", "L11 · Tarrow Bridge Lab", "L9 · Fenmoor Paving Lab"]);
    // Water and entrained air are not shipped; a lot shared by several materials is one line (seed/demo-data.ts: the fiber P-0601 in F1 and F3 … ).
    const lots = data.startingList.map((l: { lot: string }) => l.lot);
    expect(lots).toContain("P-0601");
    expect(new Set(lots).size).toBe(lots.length);
    expect(data.startingList.some((l: { description: string }) => /^(Batch water|Entrained air)/.test(l.description))).toBe(false);
    expect(data.startingList.find((l: { lot: string }) => l.lot === "A-7720")?.unit).toBe("L");
  });

  it("refuses a list with a bad line, beside the line's field, and stores nothing", async () => {
    const before = await db.select().from(shipments);
    const bad = await send({ intent: "create", enrollmentId: "every", labCount: "3", ...list, "items[0].quantity": "two", "items[1].containerCount": "0", "items[1].unit": "sacks" });
    expect(bad.status).toBe(400);
    expect(bad.errors["items[0].quantity"]).toBe("Enter the quantity as a number.");
    expect(bad.errors["items[1].containerCount"]).toBe("Pack at least one container.");
    expect(bad.errors["items[1].unit"]).toContain("Choose a unit");
    expect(bad.values).toMatchObject({ "items": [{ quantity: "two" }, { unit: "sacks" }] });
    expect(await db.select().from(shipments)).toHaveLength(before.length);
  });

  it("refuses when the number of labs differs from the one confirmed", async () => {
    const stale = await send({ intent: "create", enrollmentId: "every", labCount: "2", ...list });
    expect(stale.errors.enrollmentId).toBe("The labs awaiting materials changed meanwhile: 3 now. Check the list and send again.");
  });

  it("copies the list to all three labs in one step, then offers none of them again", async () => {
    const done = await send({ intent: "create", enrollmentId: "every", labCount: "3", ...list, carrier: "Kestrel Freight", note: "Fibers pre-weighed per batch." });
    expect(done.done).toBe("Prepared 3 shipments with the same packing list.");
    const made = await db
      .select({ id: shipments.id, status: shipments.status, note: shipments.note, carrier: shipments.carrier })
      .from(shipments)
      .innerJoin(enrollments, eq(enrollments.id, shipments.enrollmentId))
      .where(inArray(enrollments.labId, newLabs.map((l) => l.id)));
    expect(made).toHaveLength(3);
    expect(made.every((s) => s.status === "preparing" && s.note === "Fibers pre-weighed per batch." && s.carrier === "Kestrel Freight")).toBe(true);
    for (const shipment of made) {
      const items = await db.select().from(shipmentItems).where(eq(shipmentItems.shipmentId, shipment.id)).orderBy(shipmentItems.sortOrder);
      expect(items.map(({ description, quantity, unit, lot, containerCount }) => ({ description, quantity, unit, lot, containerCount }))).toEqual([
        { description: "Polypropylene macro-fiber (F1, F3)", quantity: 2.5, unit: "kg", lot: "P-0601", containerCount: 2 },
        { description: "Portland cement Type I/II (F1–F4)", quantity: 150, unit: "kg", lot: "C-2611", containerCount: 6 },
      ]);
    }
    expect((await page()).data.awaiting).toEqual([]);
    expect((await send({ intent: "create", enrollmentId: "every", labCount: "0", ...list })).errors.enrollmentId).toBe("Every accepted lab already has a shipment.");
    const row = (await page()).data.shipments.find((s: { labName: string }) => s.labName === "Fenmoor Paving Lab");
    expect(row.items).toHaveLength(2);
  });

  it("shows one lab's packing list with where it goes, to the coordinator and the admin only", async () => {
    const shipment = (await db
      .select({ id: shipments.id })
      .from(shipments)
      .innerJoin(enrollments, eq(enrollments.id, shipments.enrollmentId))
      .where(and(eq(enrollments.studyId, testing.id), eq(enrollments.labId, newLabs[0]!.id))))[0]!;
    const open = (cookie: string, id = String(shipment.id)) => call(packingList.loader, get(`/studies/${testing.id}/shipments/${id}/packing-list`, cookie), { ...params(), shipmentId: id });
    const { data } = await open(coordinator);
    expect(data.shipment).toMatchObject({ labName: "Fenmoor Paving Lab", address: "2 Causeway End, Fenmoor", labCode: "L9" });
    expect(data.shipment.items.map((i: { lot: string }) => i.lot)).toEqual(["P-0601", "C-2611"]);
    expect((await open(await demoCookie("admin@ringbatch.example"))).status).toBe(200);
    expect((await open(await demoCookie("analyst1@ringbatch.example"))).status).toBe(404);
    // A shipment of another study is not found through this one.
    const other = await demoStudy("FF-2026-A");
    const foreign = (await db.select({ id: shipments.id }).from(shipments).innerJoin(enrollments, eq(enrollments.id, shipments.enrollmentId)).where(eq(enrollments.studyId, other.id)))[0]!;
    expect((await open(coordinator, String(foreign.id))).status).toBe(404);
    expect((await open(coordinator, "nonsense")).status).toBe(404);
  });
});

describe("a study past its shipping", () => {
  it("offers the coordinator no shipment or invitation controls, and says why; the admin reads without the reason", async () => {
    const published = await demoStudy("FF-2025-D");
    const at = (path: string, cookie: string) => get(`/studies/${published.id}/${path}`, cookie);
    const shipping = await call(shipmentsPage.loader, at("shipments", coordinator), { studyId: String(published.id) });
    expect(shipping.data).toMatchObject({ canEdit: false, closedBecause: expect.stringMatching(/published/i) });
    const open = await call(shipmentsPage.loader, get(`/studies/${testing.id}/shipments`, coordinator), params());
    expect(open.data).toMatchObject({ canEdit: true, closedBecause: null });
    const admin = await call(shipmentsPage.loader, at("shipments", await demoCookie("admin@ringbatch.example")), { studyId: String(published.id) });
    expect(admin.data).toMatchObject({ canEdit: false, closedBecause: null });
    const inviting = await call(labsPage.loader, get(`/studies/${testing.id}/labs`, coordinator), params());
    expect(inviting.data).toMatchObject({ canInvite: false, invitationsClosedBecause: "Labs can be invited only while the study is recruiting." });
  });
});

describe("the migration to itemised shipments", () => {
  it("keeps the free-text contents of earlier shipments, readable, as their note", async () => {
    // The database as it stood before the packing list: migrations up to 0013.
    const folder = mkdtempSync(join(tmpdir(), "ringbatch-migrations-"));
    cpSync("drizzle", folder, { recursive: true });
    const journalPath = join(folder, "meta/_journal.json");
    const journal = JSON.parse(readFileSync(journalPath, "utf8"));
    const full = structuredClone(journal);
    journal.entries = journal.entries.filter((e: { tag: string }) => e.tag < "0014");
    writeFileSync(journalPath, JSON.stringify(journal));
    const client = createClient({ url: `file:${join(folder, "old.db")}` });
    try {
      const old = drizzle(client);
      await migrate(old, { migrationsFolder: folder });
      await client.executeMultiple(`
        INSERT INTO users (email, name, role) VALUES ('ines@ringbatch.example', 'Ines Marlow', 'coordinator');
        INSERT INTO studies (code, title, test_method, replicates_per_cell, owner_id) VALUES ('FF-2024-C', 'Older study', 'Float finishing test', 3, 1);
        INSERT INTO labs (name) VALUES ('Granite Flats Test Lab');
        INSERT INTO enrollments (study_id, lab_id, state) VALUES (1, 1, 'accepted');
        INSERT INTO shipments (enrollment_id, contents) VALUES (1, 'M1: Portland cement lot C-1, river sand lot S-9
M2: fly ash lot F-3');
        INSERT INTO shipments (enrollment_id) VALUES (1);
      `);
      writeFileSync(journalPath, JSON.stringify(full));
      await migrate(old, { migrationsFolder: folder });
      const { rows } = await client.execute("SELECT note FROM shipments ORDER BY id");
      expect(rows.map((r) => r.note)).toEqual(["M1: Portland cement lot C-1, river sand lot S-9\nM2: fly ash lot F-3", ""]);
      const columns = (await client.execute("PRAGMA table_info(shipments)")).rows.map((r) => r.name);
      expect(columns).not.toContain("contents");
    } finally {
      client.close();
    }
  });
});
