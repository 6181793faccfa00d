/**
 * A shipment's packing list: what goes in the boxes, line by line. Browser-safe:
 * the shipments page checks the list as it is typed with the same schema the
 * action parses.
 */
import { z } from "zod";
import { type CONSTITUENT_KINDS, SHIPMENT_UNITS } from "~/db/values";
import { refuseUnsafeCharacters } from "~/lib/text-hygiene";

export const UNIT_CHOICES = SHIPMENT_UNITS.map((unit) => ({ value: unit, label: unit }));

const text = (max: number, label: string) =>
  z.string().trim().max(max, { message: `Keep the ${label} to ${max} characters or fewer.` }).superRefine(refuseUnsafeCharacters());

/** A number typed in a form, with a decimal comma allowed. */
const typedNumber = (message: string) =>
  z.preprocess((v) => (typeof v === "string" ? v.trim().replace(",", ".") : v), z.coerce.number({ message }).refine(Number.isFinite, { message }));

export const packingItemSchema = z.object({
  description: text(120, "description").min(1, { message: "Name the material or constituent." }),
  quantity: typedNumber("Enter the quantity as a number.").pipe(z.number().positive({ message: "Enter a quantity above zero." }).max(100000, { message: "Enter a quantity of at most 100000." })),
  unit: z.enum(SHIPMENT_UNITS, { message: `Choose a unit: ${SHIPMENT_UNITS.join(", ")}.` }),
  lot: text(60, "lot").optional().default(""),
  containerCount: typedNumber("Enter the number of containers as a whole number.").pipe(
    z.number().int({ message: "Enter the number of containers as a whole number." }).min(1, { message: "Pack at least one container." }).max(999, { message: "Use at most 999 containers per line." }),
  ),
});

export const packingListSchema = z
  .array(packingItemSchema, { message: "List at least one item." })
  .min(1, { message: "List at least one item." })
  .max(40, { message: "Keep the packing list to 40 lines or fewer." });

export type PackingItem = z.output<typeof packingItemSchema>;

type ConstituentForList = { materialCode: string; kind: (typeof CONSTITUENT_KINDS)[number]; name: string; lot: string };

/** Mixing water comes from the lab's own tap and entrained air is not shipped. */
const NOT_SHIPPED = new Set<ConstituentForList["kind"]>(["water", "air"]);

/**
 * The packing list a study starts from: one line per constituent lot, shared by
 * the materials that use it ("Portland cement (F1, F2)"), admixtures in litres,
 * the rest in kilograms. Quantities are left for the coordinator, who knows the
 * batch size each lab mixes.
 */
export function startingPackingList(constituents: ConstituentForList[]) {
  const lines = new Map<string, { name: string; lot: string; unit: PackingItem["unit"]; materials: string[] }>();
  for (const c of constituents) {
    if (NOT_SHIPPED.has(c.kind)) continue;
    const key = `${c.name}\u0000${c.lot}`;
    const line = lines.get(key) ?? { name: c.name, lot: c.lot, unit: c.kind === "admixture" ? "L" : "kg", materials: [] };
    if (!line.materials.includes(c.materialCode)) line.materials.push(c.materialCode);
    lines.set(key, line);
  }
  return [...lines.values()].map((line) => ({
    description: `${line.name} (${line.materials.join(", ")})`.slice(0, 120),
    unit: line.unit,
    lot: line.lot,
    containerCount: "1",
  }));
}

/** "4 items, 11 containers": the compact row's summary of a list. */
export function packingSummary(items: Pick<PackingItem, "containerCount">[]) {
  const containers = items.reduce((sum, item) => sum + item.containerCount, 0);
  return `${items.length} ${items.length === 1 ? "item" : "items"}, ${containers} ${containers === 1 ? "container" : "containers"}`;
}

/** A quantity as the packing list prints it: no float noise, no trailing zeros. */
export function formatQuantity(quantity: number, unit: string) {
  return `${Number(quantity.toPrecision(6))} ${unit}`;
}
