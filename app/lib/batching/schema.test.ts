import { describe, expect, it } from "vitest";
import { inventedPavingMix } from "./paving.fixture";
import { constituentSchema, mixtureDesignSchema } from "./schema";

/** Messages of a failed parse, by field path. */
function messages(result: {
  success: boolean;
  error?: { issues: { path: PropertyKey[]; message: string }[] };
}) {
  expect(result.success).toBe(false);
  return result.error!.issues.map((i) => [i.path.join("."), i.message]);
}

const sand = {
  kind: "fine_aggregate",
  name: "Natural concrete sand",
  ssdMassKgPerM3: 720,
  relativeDensity: 2.62,
  absorptionPercent: 1.2,
};

describe("constituent row", () => {
  it("accepts every row of the invented paving mixture", () => {
    for (const row of inventedPavingMix.constituents) {
      expect(constituentSchema.safeParse(row).success).toBe(true);
    }
  });

  it("explains a relative density out of range", () => {
    expect(messages(constituentSchema.safeParse({ ...sand, relativeDensity: 26.2 }))).toEqual([
      ["relativeDensity", "Relative density must be between 1.0 and 4.0"],
    ]);
    expect(messages(constituentSchema.safeParse({ ...sand, relativeDensity: 0.9 }))).toEqual([
      ["relativeDensity", "Relative density must be between 1.0 and 4.0"],
    ]);
  });

  it("explains missing or mistyped fields", () => {
    const { absorptionPercent: _, ...noAbsorption } = sand;
    expect(
      messages(constituentSchema.safeParse({ ...noAbsorption, name: "  ", ssdMassKgPerM3: "720" })),
    ).toEqual([
      ["name", "Name is required"],
      ["ssdMassKgPerM3", "Mass must be a number"],
      ["absorptionPercent", "Absorption must be a number"],
    ]);
  });

  it("explains each range in the field's unit", () => {
    expect(
      messages(constituentSchema.safeParse({ ...sand, ssdMassKgPerM3: 0, absorptionPercent: 35 })),
    ).toEqual([
      ["ssdMassKgPerM3", "Mass must be more than 0 and at most 2500 kg/m³"],
      ["absorptionPercent", "Absorption must be between 0 and 30 % of oven-dry mass"],
    ]);
    expect(
      messages(
        constituentSchema.safeParse({
          kind: "admixture",
          name: "Retarder",
          dosagePer100kgCementitious: 0,
        }),
      ),
    ).toEqual([
      [
        "dosagePer100kgCementitious",
        "Dosage must be more than 0 and at most 5000 mL per 100 kg of cementitious material",
      ],
    ]);
    expect(
      messages(
        constituentSchema.safeParse({
          kind: "fiber",
          name: "Steel fiber",
          volumeFractionPercent: 6,
          fiberDensity: 78.5,
        }),
      ),
    ).toEqual([
      [
        "volumeFractionPercent",
        "Fiber volume must be more than 0 and at most 5 % of the concrete volume",
      ],
      ["fiberDensity", "Fiber density must be between 800 and 8000 kg/m³"],
    ]);
    expect(
      messages(constituentSchema.safeParse({ kind: "air", name: "Air", airContentPercent: -1 })),
    ).toEqual([
      ["airContentPercent", "Air content must be between 0 and 15 % of the concrete volume"],
    ]);
  });

  it("explains an unknown kind", () => {
    expect(messages(constituentSchema.safeParse({ ...sand, kind: "sand" }))).toEqual([
      [
        "kind",
        "Kind must be one of cement, SCM, water, coarse aggregate, fine aggregate, admixture, fiber, air",
      ],
    ]);
  });

  it("trims the name and keeps an optional lot", () => {
    const parsed = constituentSchema.parse({
      ...sand,
      name: " Natural concrete sand ",
      lot: "FA-3",
    });
    expect(parsed).toMatchObject({ name: "Natural concrete sand", lot: "FA-3" });
  });
});

describe("mixture design", () => {
  it("accepts the invented paving mixture", () => {
    expect(mixtureDesignSchema.safeParse(inventedPavingMix).success).toBe(true);
  });

  it("explains rules that span rows", () => {
    const air = { kind: "air", name: "Air", airContentPercent: 6 };
    expect(
      messages(
        mixtureDesignSchema.safeParse({
          name: "Sand only (invented)",
          constituents: [sand, air, air],
        }),
      ),
    ).toEqual([
      ["constituents", "A mixture design needs exactly one water row"],
      ["constituents", "A mixture design needs at least one cement or SCM row"],
      ["constituents", "A mixture design may have at most one air row"],
    ]);
    expect(messages(mixtureDesignSchema.safeParse({ name: "Empty", constituents: [] }))).toEqual([
      ["constituents", "Add at least one constituent"],
      ["constituents", "A mixture design needs exactly one water row"],
      ["constituents", "A mixture design needs at least one cement or SCM row"],
    ]);
  });

  it("points at the bad row", () => {
    const constituents = inventedPavingMix.constituents.map((c, i) =>
      i === 1 ? { ...c, relativeDensity: 25 } : c,
    );
    expect(messages(mixtureDesignSchema.safeParse({ ...inventedPavingMix, constituents }))).toEqual(
      [["constituents.1.relativeDensity", "Relative density must be between 1.0 and 4.0"]],
    );
  });
});
