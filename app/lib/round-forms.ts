/**
 * Form schemas of the proficiency round pages, shared by the actions and the
 * browser's checks as one types.
 */
import { z } from "zod";
import { ASSIGNED_VALUE_METHODS, SIGMA_PT_METHODS } from "~/db/values";
import { REPLICATES_BY_KIND, replicatesProblem, studyCodeField } from "~/lib/study-forms";
import { optionalText } from "~/lib/validation";

const ROUND_REPLICATES = REPLICATES_BY_KIND.proficiency.message;

const blankToNull = (v: string) => (v.trim() === "" ? null : v.trim());

/** A number typed in a form (a decimal comma is accepted); blank becomes null. */
const optionalNumber = (message: string) =>
  z
    .string()
    .optional()
    .transform((v, ctx) => {
      const text = blankToNull(v ?? "");
      if (text === null) return null;
      const n = Number(text.replace(",", "."));
      if (!Number.isFinite(n)) {
        ctx.addIssue({ code: "custom", message });
        return z.NEVER;
      }
      return n;
    });

const MATERIAL_LINE = /^([A-Za-z0-9][A-Za-z0-9-]{0,11})(?:\s+(.*))?$/;

export const newRoundSchema = z.object({
  code: studyCodeField,
  title: z.string().trim().min(1, { message: "Enter a title." }).max(200, { message: "Keep the title to 200 characters or fewer." }),
  sourceStudyId: z
    .string()
    .optional()
    .transform((v, ctx) => {
      if (!v) return null;
      const id = Number(v);
      if (!Number.isSafeInteger(id) || id <= 0) {
        ctx.addIssue({ code: "custom", message: "Choose a published study from the list." });
        return z.NEVER;
      }
      return id;
    }),
  testMethod: optionalText(200, "Keep the test method to 200 characters or fewer."),
  replicatesPerCell: z.coerce
    .number({ message: ROUND_REPLICATES })
    .int({ message: ROUND_REPLICATES })
    .refine((n) => replicatesProblem("proficiency", n) === null, { message: ROUND_REPLICATES }),
  materials: z
    .string({ message: "List one to three materials, one per line." })
    .transform((text, ctx) => {
      const lines = text.split(/\r?\n/).map((line) => line.trim()).filter(Boolean);
      if (lines.length < 1 || lines.length > 3) {
        ctx.addIssue({ code: "custom", message: "List one to three materials, one per line." });
        return z.NEVER;
      }
      const parsed = [];
      for (const [index, line] of lines.entries()) {
        const match = MATERIAL_LINE.exec(line);
        if (!match) {
          ctx.addIssue({ code: "custom", message: `Line ${index + 1}: start with a code of up to 12 letters, digits and hyphens, such as M1, then the description.` });
          return z.NEVER;
        }
        parsed.push({ code: match[1]!.toUpperCase(), description: (match[2] ?? "").slice(0, 300) });
      }
      if (new Set(parsed.map((m) => m.code)).size !== parsed.length) {
        ctx.addIssue({ code: "custom", message: "Give each material its own code." });
        return z.NEVER;
      }
      return parsed;
    }),
  resultsDue: z
    .union([z.literal(""), z.iso.date({ message: "Enter the date as YYYY-MM-DD." })])
    .optional()
    .transform((v) => v || null),
});

export const assignmentSchema = z
  .object({
    intent: z.literal("assignment"),
    materialId: z.coerce.number().int().positive(),
    responseId: z.coerce.number().int().positive(),
    assignedMethod: z.enum(ASSIGNED_VALUE_METHODS, { message: "Choose how the assigned value is set." }),
    referenceValue: optionalNumber("Enter the reference value as a number."),
    referenceUncertainty: optionalNumber("Enter the standard uncertainty as a number."),
    sigmaMethod: z.enum(SIGMA_PT_METHODS, { message: "Choose where σ_pt comes from." }),
    fixedSigma: optionalNumber("Enter σ_pt as a number."),
  })
  .superRefine((v, ctx) => {
    if (v.assignedMethod === "reference") {
      if (v.referenceValue === null) ctx.addIssue({ code: "custom", path: ["referenceValue"], message: "Enter the reference value." });
      if (v.referenceUncertainty === null || v.referenceUncertainty < 0) {
        ctx.addIssue({ code: "custom", path: ["referenceUncertainty"], message: "Enter the reference value's standard uncertainty (0 or more)." });
      }
    }
    if (v.sigmaMethod === "fixed" && !(v.fixedSigma !== null && v.fixedSigma > 0)) {
      ctx.addIssue({ code: "custom", path: ["fixedSigma"], message: "Enter a σ_pt greater than 0." });
    }
  });

const numberLines = (text: string) =>
  text
    .split(/\r?\n/)
    .map((line) => line.trim())
    .filter(Boolean)
    .map((line) => line.split(/[\s;]+/).map((token) => Number(token.replace(",", "."))));

export const checksSchema = z.object({
  intent: z.literal("checks"),
  materialId: z.coerce.number().int().positive(),
  responseId: z.coerce.number().int().positive(),
  homogeneity: z
    .string()
    .optional()
    .transform((text = "", ctx) => {
      const lines = numberLines(text);
      const bad = lines.findIndex((values) => values.length !== 2 || values.some((n) => !Number.isFinite(n)));
      if (bad >= 0) {
        ctx.addIssue({ code: "custom", message: `Line ${bad + 1}: give the sample's two results, such as "12 13".` });
        return z.NEVER;
      }
      if (lines.length === 1) {
        ctx.addIssue({ code: "custom", message: "Enter at least 2 samples (ISO 13528 asks for 10 or more), or none yet." });
        return z.NEVER;
      }
      return lines as [number, number][];
    }),
  stability: z
    .string()
    .optional()
    .transform((text = "", ctx) => {
      const values = numberLines(text).flat();
      if (values.some((n) => !Number.isFinite(n))) {
        ctx.addIssue({ code: "custom", message: "Enter one number per line (or several separated by spaces)." });
        return z.NEVER;
      }
      return values;
    }),
  justification: optionalText(2000, "Keep the justification to 2000 characters or fewer."),
});

export const roundTransitionSchema = z.object({
  intent: z.literal("transition"),
  to: z.enum(["recruiting", "testing", "checking"], { message: "Choose a state." }),
});

export const publishRoundSchema = z.object({
  intent: z.literal("publish"),
  confirm: z.literal("yes", { message: "Tick the box to confirm that the scores are final." }),
});

export const uncertaintySchema = z.object({
  intent: z.literal("uncertainty"),
  materialId: z.coerce.number().int().positive(),
  responseId: z.coerce.number().int().positive(),
  standardUncertainty: optionalNumber("Enter the standard uncertainty as a number, or leave it blank.").refine((v) => v === null || v > 0, {
    message: "Enter a standard uncertainty above 0, or leave it blank.",
  }),
});
