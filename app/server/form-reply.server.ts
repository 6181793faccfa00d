/**
 * What an action answers when a form is refused: Conform's reply, with the
 * errors beside their fields and the values as typed, and status 400.
 */
import type { Submission } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import type { z, ZodType } from "zod";
import { data } from "react-router";
import { FieldRefusal } from "~/lib/field-refusal";

export function refuse(submission: Submission<unknown>, fieldErrors?: Record<string, string[]>, status = 400) {
  return data({ result: submission.reply(fieldErrors ? { fieldErrors } : undefined) }, { status });
}

/**
 * Runs a model's change; a FieldRefusal it throws becomes a reply beside its
 * field (409 where the refusal is a conflict with the record's state).
 */
export async function withRefusals<T>(submission: Submission<unknown>, change: () => Promise<T>, status = 400) {
  try {
    return { ok: true as const, value: await change() };
  } catch (error) {
    if (error instanceof FieldRefusal) return { ok: false as const, reply: refuse(submission, { [error.field]: [error.message] }, status) };
    throw error;
  }
}

/**
 * The whole action of a page with one form: parse the form with its schema,
 * refuse it beside the fields, or run the model's change and answer with what
 * `done` makes of its result (usually a redirect with a toast).
 */
export async function submitForm<Schema extends ZodType, T>(
  request: Request,
  schema: Schema,
  change: (value: z.output<Schema>) => Promise<T>,
  done: (saved: T) => Response | Promise<Response>,
) {
  const submission = parseWithZod(await request.formData(), { schema });
  if (submission.status !== "success") return refuse(submission);
  const saved = await withRefusals(submission, () => change(submission.value));
  if (!saved.ok) return saved.reply;
  return done(saved.value);
}
