import { Form, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/shipments";
import { DataTable } from "~/components/data-table";
import { Badge, Button, Card, Field, Notice, PageHeader, SelectField, TextAreaField } from "~/components/ui";
import { type ActionResult, formState, handleForm, refused } from "~/lib/form-results";
import { requireStudy } from "~/server/study-context.server";
import { shipmentCreateSchema, shipSchema } from "~/lib/study-forms";
import { STATE_LABEL } from "~/lib/state-labels";
import { useSchemaCheck } from "~/lib/use-schema-check";
import { listStudyEnrollments } from "~/models/invitation.server";
import { createShipment, defaultContents, listStudyShipments, markLost, markShipped } from "~/models/shipment.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Shipments ${data?.study.code ?? ""} · Ringbatch` }];

export async function loader({ context }: Route.LoaderArgs) {
  const { study, access } = requireStudy(context, ["coordinator", "admin"]);
  const [enrolled, list, contents] = await Promise.all([listStudyEnrollments(study.id), listStudyShipments(study.id), defaultContents(study.id)]);
  return {
    study,
    labs: enrolled.filter((e) => e.state === "accepted").map((e) => ({ value: String(e.id), label: `${e.labCode ?? "—"} · ${e.labName}` })),
    shipments: list,
    defaultContents: contents,
    canEdit: access === "coordinator",
    today: new Date().toISOString().slice(0, 10),
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user } = requireStudy(context, ["coordinator"]);
  const form = await request.formData();
  const intent = String(form.get("intent") ?? "");
  switch (intent) {
    case "create":
      return handleForm(intent, shipmentCreateSchema, form, async (input) => {
        await createShipment(study, input, user.id);
        return { done: "Shipment prepared." };
      });
    case "ship":
      return handleForm(intent, shipSchema, form, async (input) => {
        await markShipped(study, input, user.id, request);
        return { done: "Marked shipped; the lab has been e-mailed." };
      });
    case "lost":
      return handleForm(intent, z.object({ shipmentId: z.coerce.number().int().positive() }), form, async ({ shipmentId }) => {
        await markLost(study, shipmentId, user.id);
        return { done: "Marked lost in transit." };
      });
    default:
      return refused(intent, { form: "Unknown action." });
  }
}

const STATUS_VIEW = {
  preparing: { label: "Preparing", tone: "neutral" },
  shipped: { label: "Shipped", tone: "ochre" },
  received: { label: "Received", tone: "leaf" },
  lost: { label: "Lost", tone: "signal" },
} as const;

export default function Shipments({ loaderData, actionData }: Route.ComponentProps) {
  const { study, labs, shipments, canEdit, today } = loaderData;
  const result = actionData as ActionResult | undefined;
  const create = formState(result, "create");
  const createCheck = useSchemaCheck(shipmentCreateSchema, create.errors);
  const ship = formState(result, "ship");
  const busy = useNavigation().state === "submitting";
  const rowError = (id: number) => (result && result.intent !== "create" && result.values?.shipmentId === String(id) ? result.errors : undefined);
  return (
    <>
      <PageHeader title={`${study.code} — shipments`} subtitle={<>{study.title} · <Badge>{STATE_LABEL[study.state]}</Badge></>} />
      <div className="flex flex-col gap-6">
        {result?.done && <Notice tone="success">{result.done}</Notice>}
        <Notice tone="caution">Bags of cement and aggregate are heavy: pack and lift them with help, and mark the weight on each box.</Notice>
        {canEdit && (
          <Card title="Prepare a shipment">
            {labs.length === 0 ? (
              <p>No lab has accepted yet.</p>
            ) : (
              <Form method="post" className="grid gap-4 md:grid-cols-2" onSubmit={createCheck.onSubmit} noValidate>
                <input type="hidden" name="intent" value="create" />
                <SelectField label="Lab" name="enrollmentId" options={labs} defaultValue={create.values.enrollmentId} error={createCheck.errors.enrollmentId} />
                <Field label="Carrier" name="carrier" defaultValue={create.values.carrier} error={createCheck.errors.carrier} />
                <div className="md:col-span-2">
                  <TextAreaField label="Materials and lots" name="contents" defaultValue={create.values.contents ?? loaderData.defaultContents} error={createCheck.errors.contents} />
                </div>
                <Field label="Tracking number" name="trackingNumber" defaultValue={create.values.trackingNumber} error={createCheck.errors.trackingNumber} />
                <div className="self-end">
                  <Button type="submit" disabled={busy}>
                    Prepare shipment
                  </Button>
                </div>
              </Form>
            )}
          </Card>
        )}
        <Card title="Shipments">
          <DataTable
            caption="Shipments of the study"
            filterLabel="Filter shipments"
            empty="No shipments yet."
            data={shipments}
            columns={[
              { id: "lab", header: "Lab", value: (s) => `${s.labCode ?? ""} ${s.labName}`.trim() },
              {
                id: "status",
                header: "Status",
                value: (s) => STATUS_VIEW[s.status].label,
                cell: (s) => (
                  <>
                    <Badge tone={STATUS_VIEW[s.status].tone}>{STATUS_VIEW[s.status].label}</Badge>
                    {s.condition === "damaged" && (
                      <span className="mt-1 block">
                        <Badge tone="signal">Damaged</Badge>
                      </span>
                    )}
                  </>
                ),
              },
              { id: "contents", header: "Contents", value: (s) => s.contents },
              { id: "carrier", header: "Carrier and tracking", value: (s) => [s.carrier, s.trackingNumber].filter(Boolean).join(" · ") || null },
              { id: "shipped", header: "Shipped", value: (s) => s.shippedOn },
              {
                id: "received",
                header: "Received",
                value: (s) => s.receivedOn,
                cell: (s) =>
                  s.receivedOn ? (
                    <>
                      {s.receivedOn} ({s.condition})
                      {s.receiptNotes && <span className="block text-sm">{s.receiptNotes}</span>}
                      {s.photoAttachmentId && (
                        <a href={`/files/${s.photoAttachmentId}`} className="block text-sm font-semibold text-basalt-700 underline">
                          Photo
                        </a>
                      )}
                    </>
                  ) : (
                    "—"
                  ),
              },
              ...(canEdit
                ? [
                    {
                      id: "actions",
                      header: "Next step",
                      sortable: false,
                      value: () => null,
                      cell: (s: (typeof shipments)[number]) => {
                        const errors = rowError(s.id) ?? (ship.values.shipmentId === String(s.id) ? ship.errors : {});
                        return s.status === "preparing" ? (
                          <div className="flex flex-col gap-2">
                            <Form method="post" className="flex flex-col gap-2">
                              <input type="hidden" name="intent" value="ship" />
                              <input type="hidden" name="shipmentId" value={s.id} />
                              <Field label="Ship date" id={`ship-${s.id}-date`} name="shippedOn" type="date" defaultValue={today} error={errors.shippedOn} />
                              <Field label="Carrier" id={`ship-${s.id}-carrier`} name="carrier" defaultValue={s.carrier} error={errors.carrier} />
                              <Field label="Tracking number" id={`ship-${s.id}-tracking`} name="trackingNumber" defaultValue={s.trackingNumber} error={errors.trackingNumber} />
                              <Button type="submit" disabled={busy}>
                                Mark shipped
                              </Button>
                            </Form>
                            {errors.form && <p className="text-sm font-semibold text-signal-700">{errors.form}</p>}
                          </div>
                        ) : s.status === "shipped" ? (
                          <Form method="post">
                            <input type="hidden" name="intent" value="lost" />
                            <input type="hidden" name="shipmentId" value={s.id} />
                            <Button type="submit" variant="secondary" disabled={busy}>
                              Mark lost
                            </Button>
                          </Form>
                        ) : null;
                      },
                    },
                  ]
                : []),
            ]}
          />
        </Card>
      </div>
    </>
  );
}
