/** The comparison form's schema, shared by the page (checks in the browser) and its action. */
import { z } from "zod";
import { COMPARISON_SETTINGS } from "~/db/values";

export const MAX_RESULTS_PER_MIXTURE = 20;

/** "13, 14, 13" or "13 14 13" to numbers; a message naming what is wrong otherwise. */
const resultList = (mixture: string) =>
  z
    .string({ message: `Enter the ${mixture}'s results.` })
    .trim()
    .transform((text, ctx) => {
      const parts = text.split(/[\s,;]+/).filter(Boolean);
      const bad = parts.find((p) => !/^[+-]?(\d+\.?\d*|\.\d+)$/.test(p));
      if (bad !== undefined) {
        ctx.addIssue({ code: "custom", message: `"${bad}" is not a number; separate results with commas or spaces.` });
        return z.NEVER;
      }
      const values = parts.map(Number);
      if (values.length === 0) {
        ctx.addIssue({ code: "custom", message: `Enter at least one result for the ${mixture}.` });
        return z.NEVER;
      }
      if (values.length > MAX_RESULTS_PER_MIXTURE) {
        ctx.addIssue({ code: "custom", message: `At most ${MAX_RESULTS_PER_MIXTURE} results per mixture.` });
        return z.NEVER;
      }
      return values;
    });

const label = (which: string) => z.string({ message: `Name the ${which}.` }).trim().min(1, `Name the ${which}.`).max(120, "Keep the name under 120 characters.");

export const comparisonSchema = z.object({
  /** `<statement id>:<response key>` */
  basis: z.string({ message: "Choose the precision statement and response." }).regex(/^\d+:[\w-]+$/, "Choose the precision statement and response."),
  setting: z.enum(COMPARISON_SETTINGS, { message: "Choose where the two mixtures were tested." }),
  referenceLabel: label("reference mixture"),
  referenceValues: resultList("reference mixture"),
  trialLabel: label("trial mixture"),
  trialValues: resultList("trial mixture"),
  notes: z.string().trim().max(2000, "Keep the notes under 2000 characters.").optional(),
});

export type ComparisonInput = z.output<typeof comparisonSchema>;
