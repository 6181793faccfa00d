/**
 * The result entry's forms for after the grid: a replicate's surface photo
 * and the amendments of submitted results and fresh properties. They load in
 * a chunk of their own, after the page (see the result entry route), since
 * they bring the form library the grid does without.
 */
import { getFormProps } from "@conform-to/react";
import { type FormEvent, useState } from "react";
import { Form, useFetcher, useLocation, useRevalidator } from "react-router";
import { fieldProps, FormErrors, type FormReply, formWideErrors, useSchemaForm } from "~/components/forms";
import { Button, Card, Field } from "~/components/ui";
import { PhotoThumbnail } from "~/components/photo-thumbnail";
import { amendFreshSchema, amendSchema, type EntryDraft, PHOTO_RULE, PHOTO_TOO_LARGE, type PhotoUploadReply, photoSchema } from "~/lib/results/entry-forms";
import { FRESH_FIELDS, FRESH_PROPERTY_NAMES } from "~/lib/results/fresh";

/** Said beside a replicate when its photo never reached the server: an upload never fails without a word. */
const PHOTO_NOT_SENT = "The photo did not reach the server. Check the connection, then upload it again.";

type Progress = { sent: number; total: number };

const megabytes = (bytes: number) => (bytes / 1_000_000).toFixed(1);

/**
 * Sends the photo form with XMLHttpRequest, whose upload reports the bytes
 * sent (fetch does not), and resolves with the refusal to show beside the
 * replicate, or null once the photo is stored.
 */
function sendPhoto(url: string, body: FormData, onProgress: (progress: Progress) => void) {
  return new Promise<string | null>((resolve) => {
    const request = new XMLHttpRequest();
    request.open("POST", url);
    request.responseType = "json";
    request.upload.onprogress = (event) => {
      if (event.lengthComputable) onProgress({ sent: event.loaded, total: event.total });
    };
    request.onload = () => {
      const reply = request.response as PhotoUploadReply | null;
      if (reply && "stored" in reply) resolve(null);
      // The front door's body cap answers before the app, without JSON.
      else resolve(reply?.refusal ?? (request.status === 413 ? PHOTO_TOO_LARGE : `The server did not store the photo (status ${request.status}). Try again.`));
    };
    request.onerror = () => resolve(PHOTO_NOT_SENT);
    request.send(body);
  });
}

/** What an amendment form needs of a response: its id and name, and the version its cell was read at. */
type AmendedResponse = { id: number; name: string; cell?: { version: number } | null };

export function PhotoCell({ replicate, photoId, editable, label }: { replicate: number; photoId?: number; editable: boolean; label: string }) {
  // A fetcher of its own, so a refused photo is named beside its replicate and the grid keeps what was typed.
  const fetcher = useFetcher<FormReply | { offline: true }>();
  const [form, fields] = useSchemaForm(photoSchema, { reply: fetcher.data, id: `photo-${replicate}` });
  // A photo that never reached the server is said so too: an upload never fails without a word.
  const notSent = fetcher.state === "idle" && fetcher.data && "offline" in fetcher.data ? PHOTO_NOT_SENT : undefined;
  // With scripts the photo goes with its progress to the upload route beside the page; the fetcher is the form's way without them.
  const uploadUrl = `${useLocation().pathname.replace(/\/$/, "")}/photo`;
  const revalidator = useRevalidator();
  const [progress, setProgress] = useState<Progress | null>(null);
  const [refusal, setRefusal] = useState<string | null>(null);
  const formProps = getFormProps(form);
  const upload = (event: FormEvent<HTMLFormElement>) => {
    // Conform checks the type and size first, and stops the submission when they are wrong.
    formProps.onSubmit(event);
    if (event.defaultPrevented) return;
    event.preventDefault();
    setRefusal(null);
    setProgress({ sent: 0, total: 0 });
    void sendPhoto(uploadUrl, new FormData(event.currentTarget), setProgress).then(async (refused) => {
      // Reloaded before the bar goes, so the thumbnail replaces the bar in one step.
      if (!refused) await revalidator.revalidate();
      setRefusal(refused);
      setProgress(null);
    });
  };
  const error = fields.photo.errors?.[0] ?? formWideErrors(form)[0] ?? refusal ?? notSent;
  const id = fields.photo.id;
  const uploading = fetcher.state !== "idle" || progress !== null;
  const describedBy = [`${id}-rule`, error ? `${id}-error` : null].filter(Boolean).join(" ");
  return (
    <div className="flex min-w-0 flex-col gap-1">
      {photoId && <PhotoThumbnail photoId={photoId} replicate={replicate} label={label} />}
      {editable && (
        // Keyed by the stored photo, so the chooser empties once a photo is added.
        <fetcher.Form key={photoId ?? "none"} method="post" encType="multipart/form-data" className="flex min-w-0 flex-col gap-1" {...formProps} onSubmit={upload}>
          <input type="hidden" name="intent" value="photo" />
          <input type="hidden" name="replicate" value={replicate} />
          <label htmlFor={id} className="text-sm font-semibold sm:sr-only">
            {photoId ? `Replace the ${label.toLowerCase()}` : label} of replicate {replicate}
          </label>
          <input
            id={id}
            name={fields.photo.name}
            type="file"
            accept="image/jpeg,image/png,image/webp"
            className="w-full max-w-44 text-sm file:mr-2 file:rounded file:border file:border-basalt-200 file:bg-white file:px-2 file:py-1"
            aria-invalid={error ? true : undefined}
            aria-describedby={describedBy}
          />
          <p id={`${id}-rule`} className="text-xs text-basalt-700">
            {PHOTO_RULE}
          </p>
          {uploading ? (
            <div>
              <label htmlFor={`${id}-progress`} className="text-sm tabular-nums">
                {progress && progress.total > 0
                  ? `Uploading: ${megabytes(progress.sent)} of ${megabytes(progress.total)} MB (${Math.round((100 * progress.sent) / progress.total)} %)`
                  : "Uploading the photo…"}
              </label>
              <progress
                id={`${id}-progress`}
                className="block h-2 w-full max-w-48"
                {...(progress && progress.total > 0 ? { value: progress.sent, max: progress.total } : {})}
              />
            </div>
          ) : (
            <Button type="submit" variant="secondary" className="min-h-9 w-fit px-2 py-1 text-sm">
              Upload<span className="sr-only"> photo of replicate {replicate}</span>
            </Button>
          )}
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
