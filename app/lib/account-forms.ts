import { z } from "zod";
import { ROLES } from "~/db/values";
import { emailField, idField, nameField, newPasswordField, optionalText } from "~/lib/validation";

/** The sign-in form. Lengths are capped so a huge post is refused before any password hashing. */
export const signInSchema = z.object({
  email: z.string({ message: "Enter your e-mail address." }).trim().min(1, { message: "Enter your e-mail address." }).max(254),
  password: z.string({ message: "Enter your password." }).min(1, { message: "Enter your password." }).max(1024),
});

/** A new password typed twice (first password of a welcome link, a new account from an invitation). */
const passwordTwice = { password: newPasswordField, confirm: z.string({ message: "Repeat the password." }) };
const samePassword = (v: { password: string; confirm: string }) => v.password === v.confirm;
const PASSWORDS_DIFFER = { path: ["confirm"], message: "The two passwords differ." };

export const firstPasswordSchema = z.object(passwordTwice).refine(samePassword, PASSWORDS_DIFFER);

// An invitation is accepted (with a new account's name and password when the invited address has none) or declined.
export const acceptInvitationSchema = z.object({ intent: z.literal("accept") });
export const declineInvitationSchema = z.object({ intent: z.literal("decline") });
export const invitationAnswerSchema = z.discriminatedUnion("intent", [acceptInvitationSchema, declineInvitationSchema]);
/** A signed-in analyst answers their lab's invitation on the lab home; the buttons carry the intent. */
export const labInvitationAnswerSchema = z.object({ intent: z.enum(["accept", "decline"]), enrollmentId: z.coerce.number().int().positive() });
export const invitationAccountSchema = z.object({ intent: z.literal("accept"), name: nameField, ...passwordTwice }).refine(samePassword, PASSWORDS_DIFFER);

// The account page: one form per intent, told apart by the hidden `intent` field.
export const profileSchema = z.object({ intent: z.literal("profile"), name: nameField });

export const passwordChangeSchema = z
  .object({
    intent: z.literal("password"),
    currentPassword: z.string({ message: "Enter your current password." }).min(1, { message: "Enter your current password." }).max(1024),
    newPassword: newPasswordField,
    confirmPassword: z.string({ message: "Repeat the new password." }),
  })
  .refine((v) => v.newPassword === v.confirmPassword, { path: ["confirmPassword"], message: "The two new passwords differ." });

export const signOutEverywhereSchema = z.object({ intent: z.literal("sign-out-everywhere") });

export const colleagueSchema = z.object({ intent: z.literal("add-colleague"), labId: idField, email: emailField, name: nameField });

export const removeColleagueSchema = z.object({ intent: z.literal("remove-colleague"), labId: idField, userId: idField });

// The target is "enrollment:<id>" for results:write or "study:<id>" for study:read.
export const tokenSchema = z.object({
  intent: z.literal("create-token"),
  tokenName: nameField,
  target: z.string({ message: "Choose what the token may reach." }).regex(/^(enrollment|study):\d+$/, { message: "Choose what the token may reach." }),
});

export const revokeTokenSchema = z.object({ intent: z.literal("revoke-token"), tokenId: idField });

/** A ticked box posts "on"; an unticked one posts nothing, which turns the notice off. */
const noticeBox = z.literal("on", { message: "Tick the box or leave it empty." }).optional().transform((v) => v === "on");

/** The optional e-mails a person may turn off; notices about damaged or lost shipments always go out. */
export const noticePreferencesSchema = z.object({ intent: z.literal("notices"), resultReminders: noticeBox, enrollmentAnswers: noticeBox });

export const accountSchema = z.discriminatedUnion("intent", [
  profileSchema,
  passwordChangeSchema,
  signOutEverywhereSchema,
  colleagueSchema,
  removeColleagueSchema,
  tokenSchema,
  revokeTokenSchema,
  noticePreferencesSchema,
]);

// The administrator's account list. Roles are ticked boxes: one or more.
const rolesField = z.array(z.enum(ROLES, { message: "Choose a role." }), { message: "Choose at least one role." }).min(1, { message: "Choose at least one role." });
const labChoice = idField.optional().transform((v) => v ?? null);
const contactBox = z.literal("on").optional();

/** A new account has no password: the person sets their own from the e-mailed link. */
export const createUserSchema = z.object({
  intent: z.literal("create"),
  email: emailField,
  name: nameField,
  roles: rolesField,
  labId: labChoice,
  isContact: contactBox,
});

export const updateUserSchema = z.object({ intent: z.literal("update"), userId: idField, roles: rolesField, labId: labChoice, isContact: contactBox });

export const disableUserSchema = z.object({ intent: z.literal("disable"), userId: idField, disabled: z.enum(["true", "false"]) });

export const adminUserSchema = z.discriminatedUnion("intent", [createUserSchema, updateUserSchema, disableUserSchema]);

/** The account list's filter (query parameters); anything unreadable means "any". */
export const userFilterSchema = z.object({
  q: z.string().trim().max(254).catch(""),
  role: z.enum(ROLES).nullable().catch(null),
  lab: idField.nullable().catch(null),
});

// "Forgot your password?": the address, then the new password from the e-mailed link.
export const passwordResetRequestSchema = z.object({
  email: z.string({ message: "Enter your e-mail address." }).trim().min(1, { message: "Enter your e-mail address." }).max(254, { message: "Enter your e-mail address." }),
});

// The lab directory.
export const labSchema = z.object({
  labId: idField.optional(),
  name: nameField,
  address: optionalText(300, "Keep the address to 300 characters."),
  contactName: optionalText(120, "Keep the contact's name to 120 characters."),
  contactEmail: emailField.optional().transform((v) => v ?? ""),
  accreditationNumber: optionalText(60, "Keep the accreditation number to 60 characters."),
});

/** Merging a lab into another lab of the directory (its enrollments and people move). */
export const labMergeSchema = z.object({
  intent: z.literal("merge"),
  labId: idField,
  intoLabId: z.coerce.number({ message: "Choose the lab to merge into." }).int().positive({ message: "Choose the lab to merge into." }),
});

/** An administrator has looked and found no duplicate: the lab loses its "new" mark. */
export const labCheckedSchema = z.object({ intent: z.literal("checked"), labId: idField });

