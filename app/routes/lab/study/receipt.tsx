import { Form, useNavigation } from "react-router";
import type { Route } from "./+types/receipt";
import { Badge, Button, Card, Field, Notice, PageHeader, TextAreaField } from "~/components/ui";
import { type ActionResult, FieldRefusal, formState, handleForm, refused } from "~/lib/form-results";
import { requireStudy } from "~/server/study-context.server";
import { todayIso } from "~/lib/format";
import { receiptSchema } from "~/lib/study-forms";
import { useSchemaCheck } from "~/lib/use-schema-check";
import { readUploadForm } from "~/server/upload-form.server";
import { IMAGE_TYPES, storeUpload, UploadError } from "~/server/uploads.server";
import { confirmReceipt, listEnrollmentShipments, receiptCorrectable } from "~/models/shipment.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Receipt ${data?.study.code ?? ""} · Ringbatch` }];

const PHOTO_MAX_BYTES = 8 * 1024 * 1024;

export async function loader({ context }: Route.LoaderArgs) {
  const { study, enrollment } = requireStudy(context, ["analyst"]);
  return {
    study: { id: study.id, code: study.code, title: study.title },
    labCode: enrollment!.labCode,
    shipments: await listEnrollmentShipments(enrollment!.id),
    correctable: await receiptCorrectable(study, enrollment!.id),
    today: todayIso(),
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const { study, enrollment, user } = requireStudy(context, ["analyst"]);
  const upload = await readUploadForm(request, "photo", PHOTO_MAX_BYTES);
  if (upload.tooLarge) return refused("receipt", { photo: "The photo is larger than 8 MB." });
  return handleForm("receipt", receiptSchema, upload.formData, async (input) => {
    let photoAttachmentId: number | null = null;
    if (upload.file) {
      try {
        photoAttachmentId = (await storeUpload(upload.file, { allowed: IMAGE_TYPES, maxBytes: PHOTO_MAX_BYTES, uploadedBy: user.id })).id;
      } catch (error) {
        if (error instanceof UploadError) throw new FieldRefusal("photo", error.message);
        throw error;
      }
    }
    const outcome = await confirmReceipt(study, enrollment!, { ...input, photoAttachmentId }, user.id);
    return { done: outcome === "confirmed" ? "Receipt confirmed. Thank you." : "Receipt corrected; the earlier entry stays in the audit trail." };
  });
}

export default function Receipt({ loaderData, actionData }: Route.ComponentProps) {
  const { study, labCode, shipments, today, correctable } = loaderData;
  const result = formState(actionData as ActionResult | undefined, "receipt");
  const { errors, onSubmit } = useSchemaCheck(receiptSchema, result.errors);
  const busy = useNavigation().state === "submitting";
  return (
    <>
      <PageHeader title={`${study.code} — materials received`} subtitle={<>{study.title}{labCode && <> · your lab code {labCode}</>}</>} />
      <div className="flex flex-col gap-6">
        {result.done && <Notice tone="success">{result.done}</Notice>}
        {result.errors.form && <Notice tone="error">{result.errors.form}</Notice>}
        <Notice tone="caution">Bags of cement and aggregate are heavy: lift with help. Cement is caustic when wet: gloves and eye protection.</Notice>
        {shipments.length === 0 && <p>No shipment has been sent to your lab yet.</p>}
        {shipments.map((s) => (
          <Card key={s.id} title={`Shipment ${s.shippedOn ? `of ${s.shippedOn}` : "being prepared"}`}>
            <p className="mb-2">
              <Badge>{s.status}</Badge> {s.carrier && <>· {s.carrier}</>} {s.trackingNumber && <>· tracking {s.trackingNumber}</>}
            </p>
            <p className="mb-4">Contents: {s.contents}</p>
            {s.status === "received" && (
              <p>
                Received {s.receivedOn}, condition {s.condition}. {s.receiptNotes}
              </p>
            )}
            {s.status === "received" && correctable && <p className="mt-2 text-basalt-700">Until your lab records its first result you can correct this receipt below; the earlier entry stays in the audit trail.</p>}
            {s.status === "received" && !correctable && <p className="mt-2 text-basalt-700">The receipt is fixed now that your lab has recorded results; write to the coordinator if it is wrong.</p>}
            {(s.status === "shipped" || (s.status === "received" && correctable)) && (
              <Form method="post" encType="multipart/form-data" className="grid gap-4 md:grid-cols-2" onSubmit={onSubmit} noValidate>
                <input type="hidden" name="shipmentId" value={s.id} />
                <Field label="Received on" name="receivedOn" type="date" defaultValue={result.values.receivedOn ?? s.receivedOn ?? today} max={today} min={s.shippedOn ?? undefined} error={errors.receivedOn} />
                <fieldset className="flex flex-col gap-1">
                  <legend className="font-semibold text-basalt-800">Condition</legend>
                  {(["good", "damaged"] as const).map((c) => (
                    <label key={c} className="flex items-center gap-2">
                      <input type="radio" name="condition" value={c} defaultChecked={(result.values.condition ?? s.condition) === c} />
                      {c === "good" ? "Good: everything arrived intact" : "Damaged: something is broken, wet or missing"}
                    </label>
                  ))}
                  {errors.condition && <p className="text-sm font-semibold text-signal-700">{errors.condition}</p>}
                </fieldset>
                <div className="md:col-span-2">
                  <TextAreaField label="Notes" name="receiptNotes" defaultValue={result.values.receiptNotes} error={errors.receiptNotes} />
                </div>
                <Field label="Photo (JPEG, PNG or WebP, optional)" name="photo" type="file" accept="image/jpeg,image/png,image/webp" error={result.errors.photo} />
                <div className="self-end">
                  <Button type="submit" disabled={busy}>
                    {s.status === "received" ? "Correct the receipt" : "Confirm receipt"}
                  </Button>
                </div>
              </Form>
            )}
          </Card>
        ))}
      </div>
    </>
  );
}
