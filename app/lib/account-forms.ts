import { z } from "zod";

/** The sign-in form. Lengths are capped so a huge post is refused before any password hashing. */
export const signInSchema = z.object({
  email: z.string({ message: "Enter your e-mail address." }).trim().min(1, { message: "Enter your e-mail address." }).max(254),
  password: z.string({ message: "Enter your password." }).min(1, { message: "Enter your password." }).max(1024),
});
