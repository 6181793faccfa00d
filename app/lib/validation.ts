import { z } from "zod";
import { refuseUnsafeCharacters } from "~/lib/text-hygiene";

export const emailField = z.email({ message: "Enter an e-mail address such as name@example.org." }).trim().max(254);

export const nameField = z
  .string({ message: "Enter a name." })
  .trim()
  .min(1, { message: "Enter a name." })
  .max(120, { message: "Keep the name to 120 characters or fewer." })
  .superRefine(refuseUnsafeCharacters());

export const newPasswordField = z
  .string({ message: "Use at least 12 characters." })
  .min(12, { message: "Use at least 12 characters." })
  .max(256, { message: "Keep the password to 256 characters or fewer." });

export const idField = z.coerce.number().int().positive();

/** Text a form may leave out: Conform turns an empty field into undefined, which is stored as "". */
export const optionalText = (max: number, message: string) => z.string().trim().max(max, { message }).optional().transform((v) => v ?? "");
