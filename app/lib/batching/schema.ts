import * as z from "zod";
import type { Constituent, MixtureDesign } from "./types";

// One schema for the server action and the browser form, so both refuse the
// same rows with the same words. Ranges are wide plausibility bounds of the
// trade (common practice), meant to catch typing and unit slips, not to judge a design.

/** A number field with a type message and one range message for both bounds. */
function ranged(label: string, min: number, max: number, message: string, minExclusive = false) {
  const base = z.number({ error: `${label} must be a number` });
  return (minExclusive ? base.gt(min, message) : base.min(min, message)).max(max, message);
}

const common = {
  name: z
    .string({ error: "Name is required" })
    .trim()
    .min(1, "Name is required")
    .max(120, "Name must be at most 120 characters"),
  lot: z.string().trim().max(60, "Lot must be at most 60 characters").optional(),
};

const ssdMass = ranged("Mass", 0, 2500, "Mass must be more than 0 and at most 2500 kg/m³", true);
const relativeDensity = ranged(
  "Relative density",
  1,
  4,
  "Relative density must be between 1.0 and 4.0",
);

const powderOrWaterSchema = z.object({
  ...common,
  kind: z.enum(["cement", "scm", "water"]),
  ssdMassKgPerM3: ssdMass,
  relativeDensity,
});

const aggregateSchema = z.object({
  ...common,
  kind: z.enum(["coarse_aggregate", "fine_aggregate"]),
  ssdMassKgPerM3: ssdMass,
  relativeDensity,
  absorptionPercent: ranged(
    "Absorption",
    0,
    30,
    "Absorption must be between 0 and 30 % of oven-dry mass",
  ),
});

const admixtureSchema = z.object({
  ...common,
  kind: z.literal("admixture"),
  dosagePer100kgCementitious: ranged(
    "Dosage",
    0,
    5000,
    "Dosage must be more than 0 and at most 5000 mL per 100 kg of cementitious material",
    true,
  ),
});

const fiberSchema = z.object({
  ...common,
  kind: z.literal("fiber"),
  volumeFractionPercent: ranged(
    "Fiber volume",
    0,
    5,
    "Fiber volume must be more than 0 and at most 5 % of the concrete volume",
    true,
  ),
  fiberDensity: ranged(
    "Fiber density",
    800,
    8000,
    "Fiber density must be between 800 and 8000 kg/m³",
  ),
});

const airSchema = z.object({
  ...common,
  kind: z.literal("air"),
  airContentPercent: ranged(
    "Air content",
    0,
    15,
    "Air content must be between 0 and 15 % of the concrete volume",
  ),
});

/** One constituent row of a mixture design. */
export const constituentSchema: z.ZodType<Constituent> = z.discriminatedUnion(
  "kind",
  [powderOrWaterSchema, aggregateSchema, admixtureSchema, fiberSchema, airSchema],
  {
    error:
      "Kind must be one of cement, SCM, water, coarse aggregate, fine aggregate, admixture, fiber, air",
  },
);

function count(constituents: Constituent[], kinds: Constituent["kind"][]): number {
  return constituents.filter((c) => kinds.includes(c.kind)).length;
}

/** A mixture design per m³: the rows plus the rules that span rows. */
export const mixtureDesignSchema: z.ZodType<MixtureDesign> = z
  .object({
    name: common.name,
    constituents: z.array(constituentSchema).min(1, "Add at least one constituent"),
  })
  .superRefine((design, ctx) => {
    const problems: [boolean, string][] = [
      [count(design.constituents, ["water"]) !== 1, "A mixture design needs exactly one water row"],
      [
        count(design.constituents, ["cement", "scm"]) === 0,
        "A mixture design needs at least one cement or SCM row",
      ],
      [count(design.constituents, ["air"]) > 1, "A mixture design may have at most one air row"],
    ];
    for (const [failed, message] of problems) {
      if (failed) ctx.addIssue({ code: "custom", message, path: ["constituents"] });
    }
  });
