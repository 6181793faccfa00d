import { z } from "zod";
import { emailField, nameField, newPasswordField } from "~/lib/validation";

/** The form that creates a database's first administrator through the one-time setup link. */
export const firstAdminSchema = z
  .object({ name: nameField, email: emailField, password: newPasswordField, confirm: z.string({ message: "Repeat the password." }) })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ." });

/** How long the one-time setup link works. */
export const SETUP_LINK_MINUTES = 30;
