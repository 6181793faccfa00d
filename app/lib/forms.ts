import type { z } from "zod";

export type FieldErrors = Record<string, string>;

export type FormResult<T> =
  | { ok: true; data: T; values: Record<string, string> }
  | { ok: false; errors: FieldErrors; values: Record<string, string> };

/**
 * Validates a submitted form with a zod schema. On failure returns the first
 * message per field plus the values as typed, so the page can show each error
 * beside its field and keep what was entered.
 */
export function parseForm<S extends z.ZodType>(schema: S, formData: FormData): FormResult<z.infer<S>> {
  const values: Record<string, string> = {};
  for (const [key, value] of formData) if (typeof value === "string") values[key] = value;
  const parsed = schema.safeParse(values);
  if (parsed.success) return { ok: true, data: parsed.data, values };
  const errors: FieldErrors = {};
  for (const issue of parsed.error.issues) {
    const field = issue.path.join(".") || "form";
    errors[field] ??= issue.message;
  }
  return { ok: false, errors, values };
}
