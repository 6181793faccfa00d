/**
 * What an action hands back to a page with several forms: which form it
 * answers (`intent`), the errors beside its fields and the values as typed.
 */
import { data } from "react-router";
import { FieldRefusal } from "~/lib/field-refusal";
import type { z } from "zod";
import { type FieldErrors, parseForm } from "~/lib/forms";

export type ActionResult = {
  intent: string;
  errors?: FieldErrors;
  values?: Record<string, string>;
  done?: string;
  warnings?: string[];
};

/** The models' one refusal class, so pages on either form style catch the same refusals. */
export { FieldRefusal };

export function refused(intent: string, errors: FieldErrors, values: Record<string, string> = {}, status = 400) {
  return data<ActionResult>({ intent, errors, values }, { status });
}

/**
 * Parses the form with the schema, runs the change, and turns a FieldRefusal
 * into errors beside the field, keeping what was typed.
 */
export async function handleForm<S extends z.ZodType>(
  intent: string,
  schema: S,
  formData: FormData,
  run: (input: z.infer<S>) => Promise<Omit<ActionResult, "intent"> | Response | void>,
) {
  const parsed = parseForm(schema, formData);
  if (!parsed.ok) return refused(intent, parsed.errors, parsed.values);
  try {
    const outcome = await run(parsed.data);
    if (outcome instanceof Response) return outcome;
    return { intent, ...(outcome ?? {}) } satisfies ActionResult;
  } catch (error) {
    if (error instanceof FieldRefusal) return refused(intent, { [error.field]: error.message }, parsed.values);
    throw error;
  }
}

/** The errors and values a form shows, when the last action answered it. */
export function formState(result: ActionResult | undefined, intent: string) {
  const mine = result?.intent === intent ? result : undefined;
  return { errors: mine?.errors ?? {}, values: mine?.values ?? {}, done: mine?.done, warnings: mine?.warnings };
}
