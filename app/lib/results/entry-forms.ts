/**
 * The forms of the result entry page, one schema each, shared by the page in
 * the browser and its action: the autosaved draft (what changed of it is sent
 * as JSON), submitting a material, amending a submitted result or the fresh
 * properties of a submitted material, and a replicate's surface photo.
 */
import { z } from "zod";
import { FRESH_PROPERTY_NAMES, type FreshProperty } from "./fresh";

const DRAFT_UNREADABLE = "The form could not be read; reload the page.";

/** What the grid holds: values keyed `response:replicate`, per-replicate date and operator, the batch's fresh properties, and the version each value was read at. */
export const entryDraftSchema = z.object({
  values: z.record(z.string(), z.string().max(40, { message: "Keep the value to 40 characters or fewer." })),
  testedOn: z.record(z.string(), z.string().max(20, { message: "Enter the test date as YYYY-MM-DD." })),
  operator: z.record(z.string(), z.string().max(200, { message: "Keep the operator's name to 120 characters or fewer." })),
  fresh: z.partialRecord(z.enum(FRESH_PROPERTY_NAMES as [FreshProperty, ...FreshProperty[]]), z.string().max(20, { message: "Enter a number." })),
  batchedAt: z.string().max(20, { message: "Enter the time of batching." }),
  versions: z.record(z.string(), z.number().int().min(0)),
});

export type EntryDraft = z.infer<typeof entryDraftSchema>;

/** The grid's key of the field a problem of the draft belongs to: `holes:2`, `operator:3`, `fresh:slump`, `fresh:batchedAt`. */
function problemKey(path: PropertyKey[]) {
  const [part, key] = path.map(String);
  if (part === "values") return key!;
  if (part === "batchedAt") return "fresh:batchedAt";
  return `${part}:${key}`;
}

/** The draft's problems beside their fields, as the schema finds them (empty when the draft may be sent). */
export function draftProblems(draft: EntryDraft): Record<string, string> {
  const parsed = entryDraftSchema.safeParse(draft);
  if (parsed.success) return {};
  const problems: Record<string, string> = {};
  for (const issue of parsed.error.issues) problems[problemKey(issue.path)] ??= issue.message;
  return problems;
}

/** What an autosave or a submission sends: the changed replicates with the version each was read at, and the changed fresh properties. */
export const draftChangesSchema = z.object({
  rows: z
    .array(
      z.object({
        response: z.string().max(40),
        replicate: z.number().int(),
        value: z.string().max(40),
        testedOn: z.string().max(20),
        operator: z.string().max(200),
        readVersion: z.number().int().min(0),
      }),
    )
    .max(1000),
  fresh: z.partialRecord(z.enum(FRESH_PROPERTY_NAMES as [FreshProperty, ...FreshProperty[]]), z.string().max(20)),
  batchedAt: z.string().max(20).optional(),
});

export type DraftChanges = z.infer<typeof draftChangesSchema>;

// The changes are checked inside the transform, so a form library's handling of blank fields ("" to undefined) never reaches the JSON's blanks.
const draftField = z.string({ message: DRAFT_UNREADABLE }).transform((text, ctx): DraftChanges => {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch {
    json = undefined;
  }
  const changes = draftChangesSchema.safeParse(json);
  if (!changes.success) {
    ctx.addIssue({ code: "custom", message: DRAFT_UNREADABLE });
    return z.NEVER;
  }
  return changes.data;
});

export const draftSaveSchema = z.object({ intent: z.literal("draft"), draft: draftField });

/** `confirmUnusual` comes from the button that confirms values outside the plausible range. */
export const submitMaterialSchema = z.object({ intent: z.literal("submit"), draft: draftField, confirmUnusual: z.literal("yes").optional() });

const REASON_MESSAGE = "Give the reason for the change (at least 5 characters).";

export const amendSchema = z.object({
  intent: z.literal("amend"),
  responseId: z.coerce.number().int(),
  replicate: z.coerce.number().int(),
  version: z.coerce.number().int(),
  value: z
    .string({ message: "Enter the corrected value." })
    .trim()
    .min(1, { message: "Enter the corrected value." })
    .max(40, { message: "Keep the value to 40 characters or fewer." }),
  reason: z.string({ message: REASON_MESSAGE }).trim().min(5, { message: REASON_MESSAGE }).max(1000, { message: "Keep the reason to 1000 characters or fewer." }),
  confirmUnusual: z.literal("yes").optional(),
});

/** Corrected fresh properties of a submitted material; the model asks for the reason beside its field. */
export const amendFreshSchema = z.object({
  intent: z.literal("amend-fresh"),
  reason: z.string().max(1000, { message: "Keep the reason to 1000 characters or fewer." }).optional(),
  ...(Object.fromEntries(FRESH_PROPERTY_NAMES.map((p) => [p, z.string().max(20, { message: "Enter a number." }).optional()])) as Record<FreshProperty, z.ZodOptional<z.ZodString>>),
});

/** The largest surface photo the entry page takes; the server's body cap sits a little above it (deployment.server). */
export const PHOTO_MAX_BYTES = 10 * 1024 * 1024;
/** What the page says before a photo is chosen. */
export const PHOTO_RULE = "JPEG, PNG or WebP, at most 10 MB";
export const PHOTO_TOO_LARGE = "The photo is larger than 10 MB. Choose a smaller one, or save it from the camera at a lower resolution.";

/** What the photo upload route answers the page's script. */
export type PhotoUploadReply = { stored: true } | { refusal: string };

export const photoAdded = (replicate: number) => `Photo of replicate ${replicate} added.`;

export const photoSchema = z.object({
  intent: z.literal("photo"),
  replicate: z.coerce.number().int().positive(),
  photo: z
    .instanceof(File, { message: "Choose a photo to upload." })
    .refine((file) => file.size > 0, { message: "Choose a photo to upload." })
    // Checked in the browser too, so a large photo is refused before it is sent.
    .refine((file) => file.size <= PHOTO_MAX_BYTES, { message: PHOTO_TOO_LARGE }),
});

export const resultEntrySchema = z.discriminatedUnion("intent", [draftSaveSchema, submitMaterialSchema, amendSchema, amendFreshSchema, photoSchema]);
