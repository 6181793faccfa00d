/**
 * Forms with Conform: each form is checked in the browser with the same zod
 * schema its action parses, errors appear beside their fields, and what was
 * typed stays after a refusal.
 */
import { type DefaultValue, type FieldMetadata, type FormMetadata, getFormProps, type SubmissionResult, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import type { ReactNode } from "react";
import { Form, useNavigation } from "react-router";
import type { z } from "zod";
import { Button, type ButtonVariant, Field, Notice } from "~/components/ui";

/** What an action returns when it refuses a form (see `refuse` in form-reply.server). */
export type FormReply = { result?: SubmissionResult<string[]> } | undefined | null;

/**
 * One form of a page. Where a page has several forms, `intent` picks which of
 * them the action's last answer belongs to.
 */
export function useSchemaForm<Schema extends z.ZodType<Record<string, unknown>, Record<string, unknown>>>(
  schema: Schema,
  { reply, intent, id, defaultValue }: { reply?: FormReply | unknown; intent?: string; id?: string; defaultValue?: DefaultValue<z.input<Schema>> } = {},
) {
  const result = (reply as FormReply)?.result;
  const mine = intent === undefined || result?.initialValue?.intent === intent;
  return useForm<z.input<Schema>, z.output<Schema>, string[]>({
    id: id ?? intent,
    lastResult: mine ? result : undefined,
    defaultValue,
    constraint: getZodConstraint(schema),
    shouldValidate: "onBlur",
    shouldRevalidate: "onInput",
    onValidate: ({ formData }) => parseWithZod(formData, { schema }),
  });
}

/** The props a Field, TextAreaField or SelectField takes from a Conform field. */
export function fieldProps(meta: FieldMetadata<unknown>) {
  return {
    id: meta.id,
    name: meta.name,
    defaultValue: (meta.initialValue as string | undefined) ?? undefined,
    error: meta.errors?.[0],
    required: meta.required,
    ...(meta.minLength !== undefined && { minLength: meta.minLength }),
    ...(meta.maxLength !== undefined && { maxLength: meta.maxLength }),
    ...(meta.min !== undefined && { min: meta.min }),
    ...(meta.max !== undefined && { max: meta.max }),
  };
}

/** A password chosen twice, so a typo in it is caught before it locks the account out. */
export function NewPasswordFields({ label, password, confirm }: { label: string; password: FieldMetadata<unknown>; confirm: FieldMetadata<unknown> }) {
  return (
    <>
      <Field label={label} type="password" autoComplete="new-password" hint="At least 12 characters" {...fieldProps(password)} />
      <Field label="Repeat the password" type="password" autoComplete="new-password" {...fieldProps(confirm)} />
    </>
  );
}

/**
 * A page's form that posts to its action: hidden fields (an intent, the ids
 * it is about), the form-wide errors, the fields (if any), then the submit button,
 * which waits (and may say so) while the request is on its way. In a grid,
 * `errorsClassName` and `submitClassName` place the errors and the button.
 * A form that carries a file sets `encType="multipart/form-data"`.
 */
export function PostForm<Fields extends Record<string, unknown>>({
  form,
  submitLabel,
  busyLabel = submitLabel,
  submitVariant,
  className = "flex flex-col gap-4",
  encType,
  hidden = {},
  errorsClassName,
  submitClassName,
  children,
}: {
  form: FormMetadata<Fields, string[]>;
  submitLabel: string;
  busyLabel?: string;
  submitVariant?: ButtonVariant;
  className?: string;
  encType?: "multipart/form-data";
  hidden?: Record<string, string | number>;
  errorsClassName?: string;
  submitClassName?: string;
  children?: ReactNode;
}) {
  const busy = useNavigation().state === "submitting";
  const errors = <FormErrors errors={formWideErrors(form)} />;
  return (
    <Form method="post" encType={encType} className={className} {...getFormProps(form)}>
      {Object.entries(hidden).map(([name, value]) => (
        <input key={name} type="hidden" name={name} value={value} />
      ))}
      {errorsClassName ? <div className={errorsClassName}>{errors}</div> : errors}
      {children}
      <div className={submitClassName}>
        <Button type="submit" variant={submitVariant} disabled={busy}>
          {busy ? busyLabel : submitLabel}
        </Button>
      </div>
    </Form>
  );
}

/** Errors of the form as a whole (not of one field). */
export function FormErrors({ errors }: { errors?: string[] }) {
  return errors?.length ? <Notice tone="error">{errors.join(" ")}</Notice> : null;
}

/**
 * Errors of the form as a whole: the schema's own, and a model's refusal of
 * the whole form (a FieldRefusal on the field "form", such as "that shipment
 * is not part of this study").
 */
export function formWideErrors(form: { errors?: string[]; allErrors: Record<string, string[]> }) {
  return [...(form.errors ?? []), ...(form.allErrors.form ?? [])];
}

/**
 * The messages of the last refusal of the button-only forms that post
 * `intent` (remove, close, mark lost …): they have no field of their own to
 * show a message beside, so the page shows it once near the buttons.
 */
export function refusalOf(reply: FormReply | unknown, intent: string): string[] {
  const result = (reply as FormReply)?.result;
  if (result?.initialValue?.intent !== intent) return [];
  return Object.values(result.error ?? {}).flatMap((messages) => messages ?? []);
}

/**
 * The action's last answer when it is about one row of a page with a form per
 * row (its typed `name` is `value`), so only that row's form shows it.
 */
export function replyAbout(reply: FormReply | unknown, name: string, value: string | number): FormReply | undefined {
  const typed = (reply as FormReply)?.result?.initialValue;
  return typed?.[name] === String(value) ? (reply as FormReply) : undefined;
}
