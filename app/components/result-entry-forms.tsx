/**
 * The result entry's forms for after the grid: a replicate's surface photo
 * and the amendments of submitted results and fresh properties. They load in
 * a chunk of their own, after the page (see the result entry route), since
 * they bring the form library the grid does without.
 */
import { getFormProps } from "@conform-to/react";
import { Form, useFetcher } from "react-router";
import { fieldProps, FormErrors, type FormReply, formWideErrors, useSchemaForm } from "~/components/forms";
import { Button, Card, Field } from "~/components/ui";
import { amendFreshSchema, amendSchema, type EntryDraft, photoSchema } from "~/lib/results/entry-forms";
import { FRESH_FIELDS, FRESH_PROPERTY_NAMES } from "~/lib/results/fresh";

/** What an amendment form needs of a response: its id and name, and the version its cell was read at. */
type AmendedResponse = { id: number; name: string; cell?: { version: number } | null };

export function PhotoCell({ replicate, photoId, editable }: { replicate: number; photoId?: number; editable: boolean }) {
  // A fetcher of its own, so a refused photo is named beside its replicate and the grid keeps what was typed.
  const fetcher = useFetcher<FormReply>();
  const [form, fields] = useSchemaForm(photoSchema, { reply: fetcher.data, id: `photo-${replicate}` });
  const error = fields.photo.errors?.[0] ?? formWideErrors(form)[0];
  const id = fields.photo.id;
  return (
    <div className="flex flex-col gap-1">
      {photoId && (
        <a href={`/files/${photoId}`} className="font-semibold text-basalt-700 underline" target="_blank" rel="noreferrer">
          View photo<span className="sr-only"> of replicate {replicate}</span>
        </a>
      )}
      {editable && (
        <fetcher.Form method="post" encType="multipart/form-data" className="flex flex-col gap-1" {...getFormProps(form)}>
          <input type="hidden" name="intent" value="photo" />
          <input type="hidden" name="replicate" value={replicate} />
          <label htmlFor={id} className="sr-only">
            Surface photo of replicate {replicate} (JPEG, PNG or WebP, at most 10 MB)
          </label>
          <input
            id={id}
            name={fields.photo.name}
            type="file"
            accept="image/jpeg,image/png,image/webp"
            className="max-w-48 text-sm"
            aria-invalid={error ? true : undefined}
            aria-describedby={error ? `${id}-error` : undefined}
          />
          <Button type="submit" variant="secondary" className="min-h-9 px-2 py-1 text-sm" disabled={fetcher.state !== "idle"}>
            {fetcher.state !== "idle" ? "Uploading…" : "Upload"}
            <span className="sr-only"> photo of replicate {replicate}</span>
          </Button>
          {error && (
            <p id={`${id}-error`} className="text-sm font-semibold text-signal-700">
              {error}
            </p>
          )}
        </fetcher.Form>
      )}
    </div>
  );
}


export function AmendForm({ response, replicate, reply }: { response: AmendedResponse; replicate: number; reply: unknown }) {
  const target = `${response.id}-${replicate}`;
  const [form, fields] = useSchemaForm(amendSchema, { reply, id: `amend-${target}` });
  // A value outside the plausible range is refused once, beside the value, and recorded when confirmed.
  const unusual = typeof reply === "object" && reply !== null && "unusual" in reply && reply.unusual === true;
  return (
    <details className="flex-1" open={Boolean(reply)}>
      <summary className="cursor-pointer font-semibold text-basalt-700 underline">
        Amend<span className="sr-only"> {response.name}, replicate {replicate}</span>
      </summary>
      <Form method="post" className="mt-2 grid max-w-xl gap-2" {...getFormProps(form)}>
        <input type="hidden" name="intent" value="amend" />
        <input type="hidden" name="responseId" value={response.id} />
        <input type="hidden" name="replicate" value={replicate} />
        <input type="hidden" name="version" value={response.cell?.version ?? 0} />
        <FormErrors errors={formWideErrors(form)} />
        <Field label={`Corrected value, ${response.name.toLowerCase()}, replicate ${replicate}`} inputMode="decimal" {...fieldProps(fields.value)} />
        <Field label="Reason for the change" hint="The coordinator sees the reason, the old and the new value." {...fieldProps(fields.reason)} />
        {unusual ? (
          <Button type="submit" name="confirmUnusual" value="yes">
            Confirm the value and record the amendment
          </Button>
        ) : (
          <Button type="submit">Record amendment</Button>
        )}
      </Form>
    </details>
  );
}

/** Corrected fresh properties of a submitted material, with the reason the coordinator reads in the audit trail. */
export function AmendFreshForm({ fresh, actionData }: { fresh: EntryDraft["fresh"]; actionData: unknown }) {
  const [form, fields] = useSchemaForm(amendFreshSchema, { reply: actionData, intent: "amend-fresh", id: "amend-fresh", defaultValue: fresh });
  return (
    <Card title="Amend fresh properties">
      <p className="mb-3 text-basalt-700">The results are submitted: a corrected reading needs its reason, which the coordinator sees in the audit trail.</p>
      <Form method="post" className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3" {...getFormProps(form)}>
        <input type="hidden" name="intent" value="amend-fresh" />
        <div className="sm:col-span-2 lg:col-span-3">
          <FormErrors errors={formWideErrors(form)} />
        </div>
        {FRESH_PROPERTY_NAMES.map((property) => (
          <Field key={property} label={`${FRESH_FIELDS[property].label} (${FRESH_FIELDS[property].unit})`} inputMode="decimal" {...fieldProps(fields[property])} />
        ))}
        <Field label="Reason for changing the fresh properties" {...fieldProps(fields.reason)} />
        <div className="self-end">
          <Button type="submit">Record the amendment</Button>
        </div>
      </Form>
    </Card>
  );
}
