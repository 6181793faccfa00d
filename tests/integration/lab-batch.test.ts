import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { materials, mixtureConstituents, studies } from "~/db/schema";
import * as batchPage from "~/routes/lab/study/batch-sheet";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "../support/database";
import { demoCookie } from "../support/demo";
import { call, get, post } from "../support/routes";
import { errorsOf, toastOf } from "../support/replies";

let studyId: string;
let materialId: string;
let ids: { coarse: number; fine: number };

// A design built around the check values of /work/shared/design/batching.md
// ("Check values a test can use"): aggregates of 1000 kg SSD per m³ with 1 %
// absorption, and 0.5 % by volume of a 910 kg/m³ polypropylene fiber.
beforeAll(async () => {
  await useFreshDatabase();
  await seedDemo(db);
  const study = await db.query.studies.findFirst({ where: eq(studies.code, "FF-2026-B") });
  studyId = String(study!.id);
  const [material] = await db.insert(materials).values({ studyId: study!.id, code: "CHK", description: "Check-value mixture", sortOrder: 9 }).returning();
  materialId = String(material!.id);
  const rows = await db
    .insert(mixtureConstituents)
    .values([
      { materialId: material!.id, kind: "cement", name: "Cement", ssdMassKgPerM3: 300, relativeDensity: 3.15, sortOrder: 0 },
      { materialId: material!.id, kind: "water", name: "Water", ssdMassKgPerM3: 200, relativeDensity: 1, sortOrder: 1 },
      { materialId: material!.id, kind: "coarse_aggregate", name: "Coarse", ssdMassKgPerM3: 1000, relativeDensity: 2.7, absorptionPercent: 1, sortOrder: 2 },
      { materialId: material!.id, kind: "fine_aggregate", name: "Fine", ssdMassKgPerM3: 1000, relativeDensity: 2.65, absorptionPercent: 1, sortOrder: 3 },
      { materialId: material!.id, kind: "fiber", name: "Polypropylene fiber", volumeFractionPercent: 0.5, fiberDensityKgPerM3: 910, sortOrder: 4 },
      { materialId: material!.id, kind: "admixture", name: "Water reducer", dosageMlPer100Kg: 300, sortOrder: 5 },
    ])
    .returning();
  ids = { coarse: rows[2]!.id, fine: rows[3]!.id };
});

const path = () => `/lab/studies/${studyId}/batch/${materialId}`;
const amountOf = (sheet: { rows: { name: string; amount: number }[] }, name: string) => sheet.rows.find((r) => r.name === name)!.amount;

describe("batch sheet page", () => {
  it("suggests the batch volume from the float finishing specimen, with its arithmetic", async () => {
    const cookie = await demoCookie("analyst5@ringbatch.example");
    const page = await call(batchPage.loader, get(path(), cookie), { studyId, materialId });
    expect(page.status).toBe(200);
    // batching.md: specimen 3 ft × 2 ft × 3 in = 0.0425 m³; 3 replicates × 0.0425 × 1.10 + 0.010 = 0.15025 m³.
    expect(page.data.computed.suggestion.volumeM3).toBeCloseTo(0.15025, 10);
    expect(page.data.computed.suggestion.summary).toBe("3 specimens × 0.0425 m³ × 1.10 + 0.010 m³ = 0.1503 m³");
    expect(page.data.computed.sheet).toBeNull();
    expect(page.data.computed.missingMoisture).toEqual(["Coarse", "Fine"]);
  });

  it("saves today's moisture and returns the sheet with batching.md's check values", async () => {
    const cookie = await demoCookie("analyst5@ringbatch.example");
    const fields = { batchVolume: "1", [`moisture-${ids.coarse}`]: "3", [`moisture-${ids.fine}`]: "0.5" };
    const saved = await call(batchPage.action, post(path(), fields, cookie), { studyId, materialId });
    expect(await toastOf(saved)).toBe("Saved: this sheet is kept for your batch of CHK.");
    const page = await call(batchPage.loader, get(path(), cookie), { studyId, materialId });
    for (const sheet of [page.data.computed.sheet]) {
      const coarse = sheet.rows.find((r: { name: string }) => r.name === "Coarse");
      const fine = sheet.rows.find((r: { name: string }) => r.name === "Fine");
      // batching.md: SSD 1000 kg, MC 3 %, Abs 1 % → wet 1019.80 kg, free water 19.80 kg.
      expect(coarse.amount).toBeCloseTo(1019.8, 2);
      expect(coarse.aggregate.freeWaterKg).toBeCloseTo(19.8, 2);
      // batching.md: SSD 1000 kg, MC 0.5 %, Abs 1 % → wet 995.05 kg, free water −4.95 kg.
      expect(fine.amount).toBeCloseTo(995.05, 2);
      expect(fine.aggregate.freeWaterKg).toBeCloseTo(-4.95, 2);
      // batch water = design water × V − Σ free water = 200 − (19.80 − 4.95) = 185.15 kg (batching.md formula).
      expect(amountOf(sheet, "Water")).toBeCloseTo(185.15, 2);
      // batching.md: 0.5 % by volume of a 910 kg/m³ fiber → 4.55 kg/m³, so 4.55 kg in 1 m³.
      expect(amountOf(sheet, "Polypropylene fiber")).toBeCloseTo(4.55, 10);
      // admixture volume = dosage × cementitious / 100 = 300 × 300 / 100 = 900 mL (batching.md formula).
      expect(amountOf(sheet, "Water reducer")).toBeCloseTo(900, 10);
    }
  });

  it("refuses an impossible moisture content beside its field and keeps what was stored", async () => {
    const cookie = await demoCookie("analyst5@ringbatch.example");
    const refused = await call(batchPage.action, post(path(), { batchVolume: "0.15", [`moisture-${ids.coarse}`]: "-2", [`moisture-${ids.fine}`]: "0.5" }, cookie), { studyId, materialId });
    expect(refused.status).toBe(400);
    expect(errorsOf(refused)[`moisture-${ids.coarse}`]).toMatch(/moisture content of Coarse/);
    const page = await call(batchPage.loader, get(path(), cookie), { studyId, materialId });
    expect(page.data.saved.batchVolumeM3).toBe(1);
  });

  it("answers 404 for a material of another study", async () => {
    const cookie = await demoCookie("analyst5@ringbatch.example");
    const other = await db.query.materials.findFirst({ where: and(eq(materials.code, "M1")) });
    expect((await call(batchPage.loader, get("/", cookie), { studyId, materialId: String(other!.id) })).status).toBe(404);
  });
});
