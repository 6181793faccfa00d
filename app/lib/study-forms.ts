/**
 * Form schemas of the coordinator's pages. The same schemas run in the action
 * and, where a page checks as one types, in the browser.
 */
import { z } from "zod";
import { RESPONSE_KINDS, STUDY_STATES, type StudyKind } from "~/db/values";
import { refuseUnsafeCharacters } from "~/lib/text-hygiene";
import { emailField, nameField } from "~/lib/validation";
import { packingListSchema } from "~/lib/packing-list";

// Conform hands a blank field to the schema as undefined; the older forms still send "". Both mean "left blank".

const optionalText = (max: number, label: string) =>
  z.string().trim().max(max, { message: `Keep the ${label} to ${max} characters or fewer.` }).superRefine(refuseUnsafeCharacters({ multiline: true })).default("");

const optionalDate = z
  .union([z.literal(""), z.iso.date({ message: "Enter a date as YYYY-MM-DD." })])
  .optional()
  .transform((v) => v || null);

/** A number typed in a form; blank becomes null. */
const optionalNumber = (message: string) =>
  z
    .string()
    .trim()
    .optional()
    .transform((v, ctx) => {
      if (!v) return null;
      const n = Number(v.replace(",", "."));
      if (!Number.isFinite(n)) {
        ctx.addIssue({ code: "custom", message });
        return z.NEVER;
      }
      return n;
    });

export const studyCodeField = z
  .string({ message: "Use 2–30 letters, digits and hyphens, such as FF-2027-A." })
  .trim()
  .toUpperCase()
  .regex(/^[A-Z0-9][A-Z0-9-]{1,29}$/, { message: "Use 2–30 letters, digits and hyphens, such as FF-2027-A." });

const studyFieldsShape = z.object({
    code: studyCodeField,
    title: z.string({ message: "Enter a title." }).trim().min(1, { message: "Enter a title." }).max(200, { message: "Keep the title to 200 characters or fewer." }).superRefine(refuseUnsafeCharacters()),
    testMethod: z.string({ message: "Name the test method." }).trim().min(1, { message: "Name the test method." }).max(200, { message: "Keep the test method to 200 characters or fewer." }).superRefine(refuseUnsafeCharacters()),
    // How few a study takes depends on its kind: replicatesProblem below.
    replicatesPerCell: z.coerce
      .number({ message: "Enter a whole number of replicates." })
      .int({ message: "Enter a whole number of replicates." })
      .max(10, { message: "Use at most 10 replicates per cell." }),
    significanceLevel: z.coerce
      .number({ message: "Enter the significance level as a number such as 0.005." })
      .min(0.0005, { message: "Use a significance level between 0.0005 and 0.1." })
      .max(0.1, { message: "Use a significance level between 0.0005 and 0.1." }),
    targetSurfaceRating: z
      .enum(["", "1", "2", "3"], { message: "Choose a rating of 1, 2 or 3, or none." })
      .optional()
      .transform((v) => (v ? Number(v) : null)),
    // What one specimen of the test method takes, for the lab's suggested batch volume; blank until the coordinator knows it.
    specimenVolumeM3: optionalNumber("Enter the specimen volume in m³, such as 0.0425, or leave it blank.").refine((v) => v === null || (v > 0 && v <= 1), {
      message: "Enter a specimen volume above 0 and at most 1 m³.",
    }),
    wastePercent: optionalNumber("Enter the waste allowance in %, such as 10, or leave it blank.").refine((v) => v === null || (v >= 0 && v <= 100), {
      message: "Enter a waste allowance from 0 to 100 %.",
    }),
    enrollmentDeadline: optionalDate,
    shipDate: optionalDate,
    resultsDue: optionalDate,
    notes: optionalText(2000, "notes"),
});

/** The study's dates come in order: enrollment closes, materials ship, results are due. */
function datesInOrder(v: z.output<typeof studyFieldsShape>, ctx: z.RefinementCtx) {
    // ISO dates compare correctly as text.
    if (v.enrollmentDeadline && v.shipDate && v.shipDate < v.enrollmentDeadline) {
      ctx.addIssue({ code: "custom", path: ["shipDate"], message: "Ship after the enrollment deadline." });
    }
    const start = v.shipDate ?? v.enrollmentDeadline;
    if (start && v.resultsDue && v.resultsDue <= start) {
    ctx.addIssue({ code: "custom", path: ["resultsDue"], message: "Results are due after the materials ship." });
  }
}

/**
 * Replicates per cell each kind of study takes: a precision study at least 2
 * (E691 and ISO 5725-2 estimate repeatability from them); a proficiency round
 * 1 or 2 (each lab is scored on its average); a ruggedness study 1 or 2
 * results per run.
 */
export const REPLICATES_BY_KIND: Record<StudyKind, { min: number; max: number; message: string }> = {
  precision: { min: 2, max: 10, message: "Use at least 2 replicates per cell (repeatability needs two)." },
  proficiency: { min: 1, max: 2, message: "A round takes 1 or 2 replicates per lab and material." },
  ruggedness: { min: 1, max: 2, message: "A ruggedness study takes 1 or 2 results per run." },
};

/** The sentence to show beside the replicates field, or null when `n` suits the kind of study. */
export function replicatesProblem(kind: StudyKind, n: number): string | null {
  const range = REPLICATES_BY_KIND[kind];
  return n >= range.min && n <= range.max ? null : range.message;
}

export const studyFields = studyFieldsShape.superRefine(datesInOrder);

export const STUDY_TEMPLATES = ["float_finishing", "custom"] as const;

/** Refuses, beside the field, a number of replicates the kind of study does not take. */
const replicatesFor = (kind: StudyKind) => (v: { replicatesPerCell: number }, ctx: z.RefinementCtx) => {
  const problem = replicatesProblem(kind, v.replicatesPerCell);
  if (problem) ctx.addIssue({ code: "custom", path: ["replicatesPerCell"], message: problem });
};

export const newStudySchema = studyFieldsShape
  .extend({ template: z.enum(STUDY_TEMPLATES, { message: "Choose a template." }) })
  .superRefine(datesInOrder)
  .superRefine(replicatesFor("precision"));

export const responseSchema = z
  .object({
    key: z
      .string({ message: "Use a short key of lower-case letters, digits and _, starting with a letter." })
      .trim()
      .regex(/^[a-z][a-z0-9_]{0,29}$/, { message: "Use a short key of lower-case letters, digits and _, starting with a letter." }),
    name: z.string({ message: "Name the response." }).trim().min(1, { message: "Name the response." }).max(120, { message: "Keep the name to 120 characters or fewer." }).superRefine(refuseUnsafeCharacters()),
    unit: optionalText(30, "unit"),
    kind: z.enum(RESPONSE_KINDS, { message: "Choose count or continuous." }),
    decimals: z.coerce
      .number({ message: "Enter a whole number of decimals." })
      .int({ message: "Enter a whole number of decimals." })
      .min(0, { message: "Use 0 to 6 decimals." })
      .max(6, { message: "Use 0 to 6 decimals." }),
    plausibleMin: optionalNumber("Enter the lowest plausible value as a number, or leave it blank."),
    plausibleMax: optionalNumber("Enter the highest plausible value as a number, or leave it blank."),
  })
  .superRefine((v, ctx) => {
    if (v.kind === "count" && v.decimals !== 0) ctx.addIssue({ code: "custom", path: ["decimals"], message: "Counts have 0 decimals." });
    if (v.plausibleMin !== null && v.plausibleMax !== null && v.plausibleMax <= v.plausibleMin) {
      ctx.addIssue({ code: "custom", path: ["plausibleMax"], message: "The highest plausible value must be above the lowest." });
    }
  });

export const freshTargetsSchema = z
  .object({
    slumpTarget: optionalNumber("Enter the slump as a number, or leave it blank."),
    slumpUnit: z.enum(["mm", "in"], { message: "Choose mm or in." }),
    slumpTolerance: optionalNumber("Enter the tolerance as a number, or leave it blank for the usual one."),
    airTarget: optionalNumber("Enter the air content as a number, or leave it blank."),
    airTolerance: optionalNumber("Enter the tolerance as a number, or leave it blank for the usual one."),
  })
  .superRefine((v, ctx) => {
    const slumpMax = v.slumpUnit === "mm" ? 300 : 12;
    if (v.slumpTarget !== null && (v.slumpTarget <= 0 || v.slumpTarget > slumpMax)) {
      ctx.addIssue({ code: "custom", path: ["slumpTarget"], message: `Enter a slump above 0 and at most ${slumpMax} ${v.slumpUnit}.` });
    }
    if (v.slumpTolerance !== null && v.slumpTolerance <= 0) {
      ctx.addIssue({ code: "custom", path: ["slumpTolerance"], message: "A tolerance is above 0." });
    }
    if (v.airTarget !== null && (v.airTarget < 0 || v.airTarget > 15)) {
      ctx.addIssue({ code: "custom", path: ["airTarget"], message: "Enter an air content between 0 and 15 %." });
    }
    if (v.airTolerance !== null && v.airTolerance <= 0) {
      ctx.addIssue({ code: "custom", path: ["airTolerance"], message: "A tolerance is above 0." });
    }
  });

export const personSchema = z.object({ email: emailField });

export const materialSchema = z.object({
  code: z
    .string({ message: "Use up to 12 letters, digits and hyphens, such as M1." })
    .trim()
    .toUpperCase()
    .regex(/^[A-Z0-9][A-Z0-9-]{0,11}$/, { message: "Use up to 12 letters, digits and hyphens, such as M1." }),
  description: optionalText(300, "description"),
});

/** The material page's own fields; its mixture design rows are checked by `parseDesignRows` (`~/lib/mixture-form`). */
export const materialEditorSchema = materialSchema.extend({ units: z.enum(["si", "us"], { message: "Choose SI or US customary units." }).default("si") });

export const transitionSchema = z.object({ to: z.enum(STUDY_STATES, { message: "Choose a state." }) });

const requiredDate = (what: string) => z.iso.date({ message: `Enter the ${what} date as YYYY-MM-DD.` });

/** One of the study's labs, chosen from a list of its enrollments. */
const enrollmentChoice = z.coerce.number({ message: "Choose a lab." }).int().positive({ message: "Choose a lab." });

/**
 * A packing list for one lab, or for every accepted lab without a shipment
 * (`enrollmentId` "every"); `labCount` is how many labs the page offered, so a
 * list is not copied to a different number of labs than the coordinator confirmed.
 */
export const shipmentCreateSchema = z.object({
  enrollmentId: z.union([z.literal("every"), enrollmentChoice], { message: "Choose a lab." }),
  labCount: z.coerce.number().int().min(0).optional(),
  items: packingListSchema,
  note: optionalText(2000, "note"),
  carrier: optionalText(120, "carrier"),
  trackingNumber: optionalText(120, "tracking number"),
});

export const shipSchema = z.object({
  shipmentId: z.coerce.number().int().positive(),
  shippedOn: requiredDate("ship"),
  carrier: z.string({ message: "Name the carrier." }).trim().min(1, { message: "Name the carrier." }).max(120, { message: "Keep the carrier to 120 characters or fewer." }).superRefine(refuseUnsafeCharacters()),
  trackingNumber: optionalText(120, "tracking number"),
});

export const receiptSchema = z.object({
  shipmentId: z.coerce.number().int().positive(),
  receivedOn: requiredDate("receipt"),
  condition: z.enum(["good", "damaged"], { message: "Say whether the materials arrived in good condition or damaged." }),
  receiptNotes: optionalText(2000, "notes"),
});

export const withdrawalSchema = z.object({
  enrollmentId: enrollmentChoice,
  reason: z.string({ message: "Give the reason for withdrawing the lab." }).trim().min(1, { message: "Give the reason for withdrawing the lab." }).max(500, { message: "Keep the reason to 500 characters or fewer." }).superRefine(refuseUnsafeCharacters({ multiline: true })),
});

/** The row a remove or change button acts on. */
const rowId = z.coerce.number({ message: "That row is missing; reload the page." }).int().positive({ message: "That row is missing; reload the page." });

/** Which of a page's forms was sent: the hidden `intent` field. */
const intent = <const Name extends string>(name: Name) => ({ intent: z.literal(name) });

/** Every form of the setup page, by intent; the action parses them as one union. */
export const setupForms = {
  responseAdd: responseSchema.safeExtend(intent("response-add")),
  responseRemove: z.object({ ...intent("response-remove"), id: rowId }),
  targets: freshTargetsSchema.safeExtend(intent("targets")),
  coordinatorAdd: personSchema.extend(intent("coordinator-add")),
  reviewerAdd: personSchema.extend(intent("reviewer-add")),
  coordinatorRemove: z.object({ ...intent("coordinator-remove"), id: rowId }),
  reviewerRemove: z.object({ ...intent("reviewer-remove"), id: rowId }),
  materialAdd: materialSchema.extend(intent("material-add")),
  materialRemove: z.object({ ...intent("material-remove"), id: rowId }),
  transition: transitionSchema.extend(intent("transition")),
};

const UNKNOWN_FORM = { error: "Unknown action." };

const studyDetailsForm = (kind: StudyKind) => studyFields.safeExtend(intent("study")).superRefine(replicatesFor(kind));

/** The details form of the setup page for each kind of study (precision studies and rounds share the page). */
export const studyDetailsForms = {
  precision: studyDetailsForm("precision"),
  proficiency: studyDetailsForm("proficiency"),
  ruggedness: studyDetailsForm("ruggedness"),
} satisfies Record<StudyKind, unknown>;

const setupSchemaOf = (kind: StudyKind) =>
  z.discriminatedUnion(
    "intent",
    [
      studyDetailsForms[kind],
      setupForms.responseAdd,
      setupForms.responseRemove,
      setupForms.targets,
      setupForms.coordinatorAdd,
      setupForms.reviewerAdd,
      setupForms.coordinatorRemove,
      setupForms.reviewerRemove,
      setupForms.materialAdd,
      setupForms.materialRemove,
      setupForms.transition,
    ],
    UNKNOWN_FORM,
  );

/** Every form of the setup page, for a study of `kind`. */
export const setupSchemas = {
  precision: setupSchemaOf("precision"),
  proficiency: setupSchemaOf("proficiency"),
  ruggedness: setupSchemaOf("ruggedness"),
} satisfies Record<StudyKind, unknown>;

/** The protocol upload, checked in the browser; the server checks the file's bytes too. */
export const PROTOCOL_MAX_BYTES = 10 * 1024 * 1024;
export const protocolSchema = z.object({
  ...intent("protocol"),
  protocol: z
    .file({ message: "Choose a PDF file to upload." })
    .max(PROTOCOL_MAX_BYTES, { message: "The file is larger than 10 MB." })
    .mime("application/pdf", { message: "Choose a PDF file." }),
});

/** The forms of the labs page. */
export const labsForms = {
  invite: z.object({ ...intent("invite"), labId: z.coerce.number({ message: "Choose a lab from the directory." }).int().positive({ message: "Choose a lab from the directory." }) }),
  withdraw: withdrawalSchema.extend(intent("withdraw")),
  /** A lab that is not in the directory yet: it is added when its contact accepts. */
  inviteOutside: z.object({
    ...intent("invite-outside"),
    labName: nameField,
    contactName: nameField,
    contactEmail: emailField,
  }),
};
export const labsSchema = z.discriminatedUnion("intent", [labsForms.invite, labsForms.withdraw, labsForms.inviteOutside], UNKNOWN_FORM);

/** The forms of the shipments page. */
export const shipmentForms = {
  create: shipmentCreateSchema.extend(intent("create")),
  ship: shipSchema.extend(intent("ship")),
  lost: z.object({ ...intent("lost"), shipmentId: rowId }),
};
export const shipmentsSchema = z.discriminatedUnion("intent", [shipmentForms.create, shipmentForms.ship, shipmentForms.lost], UNKNOWN_FORM);
