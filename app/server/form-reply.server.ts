/**
 * What an action answers when a form is refused: Conform's reply, with the
 * errors beside their fields and the values as typed, and status 400.
 */
import type { Submission } from "@conform-to/react";
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
