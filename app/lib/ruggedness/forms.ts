/** Form schemas of the ruggedness pages, shared by the pages (checks in the browser) and their actions. */
import { z } from "zod";
import { studyCodeField } from "~/lib/study-forms";
import { maxFactors } from "./designs";

const text = (max: number, message: string) => z.string({ message }).trim().min(1, message).max(max, `Keep it to ${max} characters or fewer.`);

export const newRuggednessSchema = z
  .object({
    code: studyCodeField,
    title: text(200, "Enter a title."),
    template: z.enum(["float_finishing", "custom"], { message: "Choose the test method." }),
    testMethod: z.string().trim().max(200, "Keep the test method to 200 characters or fewer.").optional(),
    responseName: z.string().trim().max(120, "Keep the name to 120 characters or fewer.").optional(),
    responseUnit: z.string().trim().max(30, "Keep the unit to 30 characters or fewer.").optional(),
    notes: z.string().trim().max(4000, "Keep the notes to 4000 characters or fewer.").optional(),
  })
  .superRefine((input, ctx) => {
    if (input.template !== "custom") return;
    if (!input.testMethod) ctx.addIssue({ code: "custom", path: ["testMethod"], message: "Name the test method." });
    if (!input.responseName) ctx.addIssue({ code: "custom", path: ["responseName"], message: "Name the response the test measures." });
  });

export const MAX_FACTORS = maxFactors(12);
export const MIN_FACTORS = 2;

const factorRow = z
  .object({
    name: z.string().trim().max(120, "Keep the name to 120 characters or fewer.").optional(),
    unit: z.string().trim().max(30, "Keep the unit to 30 characters or fewer.").optional(),
    low: z.string().trim().max(60, "Keep the setting to 60 characters or fewer.").optional(),
    high: z.string().trim().max(60, "Keep the setting to 60 characters or fewer.").optional(),
  })
  .optional();

export const factorsSchema = z.object({
  replicates: z.coerce.number({ message: "Choose one or two results per run." }).pipe(z.union([z.literal(1), z.literal(2)], { message: "Choose one or two results per run." })),
  factors: z
    .array(factorRow)
    .optional()
    .superRefine((rows = [], ctx) => {
      const names = new Set<string>();
      rows.forEach((row, i) => {
        if (!row || (!row.name && !row.low && !row.high && !row.unit)) return;
        if (!row.name) ctx.addIssue({ code: "custom", path: [i, "name"], message: "Name the factor." });
        if (!row.low) ctx.addIssue({ code: "custom", path: [i, "low"], message: "Give the low setting." });
        if (!row.high) ctx.addIssue({ code: "custom", path: [i, "high"], message: "Give the high setting." });
        if (row.low && row.high && row.low === row.high) ctx.addIssue({ code: "custom", path: [i, "high"], message: "The high setting must differ from the low one." });
        if (row.name) {
          if (names.has(row.name.toLowerCase())) ctx.addIssue({ code: "custom", path: [i, "name"], message: "Another factor has this name." });
          names.add(row.name.toLowerCase());
        }
      });
      const filled = rows.filter((row) => row?.name || row?.low || row?.high || row?.unit).length;
      if (filled < MIN_FACTORS) ctx.addIssue({ code: "custom", message: `Enter at least ${MIN_FACTORS} factors (up to ${MAX_FACTORS}).` });
    })
    .transform((rows = []) =>
      rows.flatMap((row) => (row?.name && row.low && row.high ? [{ name: row.name, unit: row.unit ?? "", low: row.low, high: row.high }] : [])),
    ),
});

export type FactorsInput = z.output<typeof factorsSchema>;

/** The name of the field that holds one result: run (design row), replicate, response key. */
export const resultFieldName = (run: number, replicate: number, response: string) => `r${run}_${replicate}_${response}`;

/**
 * The results form of one plan: one optional field per run, replicate and
 * response; counts must be whole numbers of 0 or more.
 */
export function ruggednessResultsSchema(runs: number, replicates: number, responses: readonly { key: string; kind: "count" | "continuous" }[]) {
  const shape: Record<string, z.ZodType<number | undefined>> = {};
  for (let run = 1; run <= runs; run++) {
    for (let replicate = 1; replicate <= replicates; replicate++) {
      for (const response of responses) {
        const number = z.coerce.number({ message: "Enter a number." }).refine(Number.isFinite, "Enter a number.");
        shape[resultFieldName(run, replicate, response.key)] = (
          response.kind === "count" ? number.pipe(z.number().int("A pass count is a whole number.").min(0, "A pass count cannot be negative.")) : number
        ).optional();
      }
    }
  }
  return z.object(shape);
}
