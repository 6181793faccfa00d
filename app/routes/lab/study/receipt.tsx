import { getFormProps, type SubmissionResult } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, useNavigation } from "react-router";
import type { Route } from "./+types/receipt";
import { PackingItemsTable } from "~/components/packing-list";
import { fieldProps, FormErrors, formWideErrors, useSchemaForm } from "~/components/forms";
import { StateBadge } from "~/components/state-badge";
import type { StudyPageHandle } from "~/components/study-frame";
import { Button, Card, Field, TextAreaField } from "~/components/ui";
import { MaterialsCaution } from "~/components/cautions";
import { FieldRefusal } from "~/lib/field-refusal";
import { formatDate, todayIso } from "~/lib/format";
import { SHIPMENT_STATE } from "~/lib/state-labels";
import { receiptSchema } from "~/lib/study-forms";
import { studyPageMeta } from "~/lib/study-page-meta";
import { confirmReceipt, listEnrollmentShipments, receiptCorrectable } from "~/models/shipment.server";
import { refuse, withRefusals } from "~/server/form-reply.server";
import { requireStudy } from "~/server/study-context.server";
import { redirectWithToast } from "~/server/toast.server";
import { readUploadForm } from "~/server/upload-form.server";
import { IMAGE_TYPES, storeUpload, UploadError } from "~/server/uploads.server";

export const handle = { pageTitle: "Receipt" } satisfies StudyPageHandle;

export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta("Receipt", matches);

const PHOTO_MAX_BYTES = 8 * 1024 * 1024;

export async function loader({ context }: Route.LoaderArgs) {
  const { study, enrollment } = requireStudy(context, ["analyst"]);
  return { shipments: await listEnrollmentShipments(enrollment!.id), correctable: await receiptCorrectable(study, enrollment!.id), today: todayIso() };
}

export async function action({ request, context }: Route.ActionArgs) {
  const { study, enrollment, user } = requireStudy(context, ["analyst"]);
  const upload = await readUploadForm(request, "photo", PHOTO_MAX_BYTES);
  // The body was not read past the photo, so there is nothing typed to show again.
  if (upload.tooLarge) return data({ result: { status: "error", error: { photo: ["The photo is larger than 8 MB."] } } as SubmissionResult<string[]> }, { status: 400 });
  const submission = parseWithZod(upload.formData, { schema: receiptSchema });
  if (submission.status !== "success") return refuse(submission);
  const outcome = await withRefusals(submission, async () => {
    let photoAttachmentId: number | null = null;
    if (upload.file) {
      try {
        photoAttachmentId = (await storeUpload(upload.file, { allowed: IMAGE_TYPES, maxBytes: PHOTO_MAX_BYTES, uploadedBy: user.id })).id;
      } catch (error) {
        if (error instanceof UploadError) throw new FieldRefusal("photo", error.message);
        throw error;
      }
    }
    return confirmReceipt(study, enrollment!, { ...submission.value, photoAttachmentId }, user.id);
  });
  if (!outcome.ok) return outcome.reply;
  return redirectWithToast(
    `/lab/studies/${study.id}/receipt`,
    outcome.value === "confirmed" ? "Receipt confirmed. Thank you." : "Receipt corrected; the earlier entry stays in the audit trail.",
  );
}

type Shipment = Route.ComponentProps["loaderData"]["shipments"][number];

export default function Receipt({ loaderData, actionData }: Route.ComponentProps) {
  const { shipments, today, correctable } = loaderData;
  return (
    <div className="flex flex-col gap-6">
      <MaterialsCaution packing={false} />
      {shipments.length === 0 && <p>No shipment has been sent to your lab yet.</p>}
      {shipments.map((s) => (
        <Card key={s.id} title={`Shipment ${s.shippedOn ? `of ${formatDate(s.shippedOn)}` : "being prepared"}`}>
          <p className="mb-2">
            <StateBadge view={SHIPMENT_STATE[s.status]} /> {s.carrier && <>· {s.carrier}</>} {s.trackingNumber && <>· tracking {s.trackingNumber}</>}
          </p>
          <div className="mb-4">
            <PackingItemsTable caption={`Contents of shipment ${s.id}`} items={s.items} note={s.note} />
          </div>
          {s.status === "received" && (
            <p>
              Received {formatDate(s.receivedOn)}, condition {s.condition}. {s.receiptNotes}
            </p>
          )}
          {s.status === "received" && correctable && <p className="mt-2 text-basalt-700">Until your lab records its first result you can correct this receipt below; the earlier entry stays in the audit trail.</p>}
          {s.status === "received" && !correctable && <p className="mt-2 text-basalt-700">The receipt is fixed now that your lab has recorded results; write to the coordinator if it is wrong.</p>}
          {(s.status === "shipped" || (s.status === "received" && correctable)) && <ReceiptForm shipment={s} today={today} actionData={actionData} />}
        </Card>
      ))}
    </div>
  );
}

function ReceiptForm({ shipment, today, actionData }: { shipment: Shipment; today: string; actionData: Route.ComponentProps["actionData"] }) {
  const busy = useNavigation().state === "submitting";
  const answered = actionData?.result?.initialValue;
  // A refused photo arrives without the form's values: it answers the only form there is to answer.
  const mine = !answered || answered.shipmentId === String(shipment.id);
  const [form, fields] = useSchemaForm(receiptSchema, {
    reply: mine ? actionData : undefined,
    id: `receipt-${shipment.id}`,
    // The condition is not pre-selected: the lab looks at the box before choosing.
    defaultValue: { receivedOn: shipment.receivedOn ?? today, condition: shipment.condition ?? undefined, receiptNotes: shipment.receiptNotes ?? "" },
  });
  const conditionError = fields.condition.errors?.[0];
  const photoError = form.allErrors.photo?.[0];
  return (
    <Form method="post" encType="multipart/form-data" className="grid gap-4 md:grid-cols-2" {...getFormProps(form)}>
      <input type="hidden" name="shipmentId" value={shipment.id} />
      <div className="md:col-span-2">
        <FormErrors errors={formWideErrors(form)} />
      </div>
      <Field label="Received on" type="date" max={today} min={shipment.shippedOn ?? undefined} {...fieldProps(fields.receivedOn)} />
      <fieldset className="flex flex-col gap-1" aria-describedby={conditionError ? `${fields.condition.id}-error` : undefined}>
        <legend className="font-semibold text-basalt-800">Condition</legend>
        {(["good", "damaged"] as const).map((c) => (
          <label key={c} className="flex items-center gap-2">
            <input type="radio" name={fields.condition.name} value={c} defaultChecked={fields.condition.initialValue === c} />
            {c === "good" ? "Good: everything arrived intact" : "Damaged: something is broken, wet or missing"}
          </label>
        ))}
        {conditionError && (
          <p id={`${fields.condition.id}-error`} className="text-sm font-semibold text-signal-700">
            {conditionError}
          </p>
        )}
      </fieldset>
      <div className="md:col-span-2">
        <TextAreaField label="Notes" {...fieldProps(fields.receiptNotes)} />
      </div>
      <Field label="Photo (JPEG, PNG or WebP, optional)" name="photo" id={`receipt-${shipment.id}-photo`} type="file" accept="image/jpeg,image/png,image/webp" error={photoError} />
      <div className="self-end">
        <Button type="submit" disabled={busy}>
          {shipment.status === "received" ? "Correct the receipt" : "Confirm receipt"}
        </Button>
      </div>
    </Form>
  );
}
