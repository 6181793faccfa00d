import { getFormProps } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, useNavigation } from "react-router";
import type { Route } from "./+types/shipments";
import { DataTable } from "~/components/data-table";
import { fieldProps, FormErrors, formWideErrors, refusalOf, replyAbout, useSchemaForm } from "~/components/forms";
import { StateBadge } from "~/components/state-badge";
import type { StudyPageHandle } from "~/components/study-frame";
import { Badge, Button, Card, Field, SelectField, TextAreaField } from "~/components/ui";
import { MaterialsCaution } from "~/components/cautions";
import { formatDate, todayIso } from "~/lib/format";
import { SHIPMENT_STATE } from "~/lib/state-labels";
import { shipmentForms, shipmentsSchema } from "~/lib/study-forms";
import { studyPageMeta } from "~/lib/study-page-meta";
import { listStudyEnrollments } from "~/models/invitation.server";
import { createShipment, defaultContents, listStudyShipments, markLost, markShipped } from "~/models/shipment.server";
import { refuse, withRefusals } from "~/server/form-reply.server";
import { requireStudy } from "~/server/study-context.server";
import { redirectWithToast } from "~/server/toast.server";

export const handle = { pageTitle: "Shipments" } satisfies StudyPageHandle;

export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

export async function loader({ context }: Route.LoaderArgs) {
  const { study, access } = requireStudy(context, ["coordinator", "admin"]);
  const [enrolled, list, contents] = await Promise.all([listStudyEnrollments(study.id), listStudyShipments(study.id), defaultContents(study.id)]);
  return {
    study,
    labs: enrolled.filter((e) => e.state === "accepted").map((e) => ({ value: String(e.id), label: `${e.labCode ?? "—"} · ${e.labName}` })),
    shipments: list,
    defaultContents: contents,
    canEdit: access === "coordinator",
    today: todayIso(),
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user } = requireStudy(context, ["coordinator"]);
  const submission = parseWithZod(await request.formData(), { schema: shipmentsSchema });
  if (submission.status !== "success") return refuse(submission);
  const form = submission.value;
  const outcome = await withRefusals(submission, async () => {
    switch (form.intent) {
      case "create": {
        const { intent: _, ...input } = form;
        await createShipment(study, input, user.id);
        return "Shipment prepared.";
      }
      case "ship": {
        const { intent: _, ...input } = form;
        await markShipped(study, input, user.id, request);
        return "Marked shipped; the lab has been e-mailed.";
      }
      case "lost":
        await markLost(study, form.shipmentId, user.id);
        return "Marked lost in transit.";
    }
  });
  if (!outcome.ok) return outcome.reply;
  return redirectWithToast(`/studies/${study.id}/shipments`, outcome.value);
}

export default function Shipments({ loaderData, actionData }: Route.ComponentProps) {
  const { labs, shipments, canEdit, today } = loaderData;
  const busy = useNavigation().state === "submitting";
  return (
    <div className="flex flex-col gap-6">
      <MaterialsCaution packing />
      {canEdit && (
        <Card title="Prepare a shipment">
          {labs.length === 0 ? (
            <p>No lab has accepted yet.</p>
          ) : (
            <PrepareForm labs={labs} defaultContents={loaderData.defaultContents} reply={actionData} busy={busy} />
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
              value: (s) => SHIPMENT_STATE[s.status].label,
              cell: (s) => (
                <>
                  <StateBadge view={SHIPMENT_STATE[s.status]} />
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
            { id: "shipped", header: "Shipped", value: (s) => s.shippedOn, cell: (s) => formatDate(s.shippedOn) },
            {
              id: "received",
              header: "Received",
              value: (s) => s.receivedOn,
              cell: (s) =>
                s.receivedOn ? (
                  <>
                    {formatDate(s.receivedOn)} ({s.condition}){s.receiptNotes && <span className="block text-sm">{s.receiptNotes}</span>}
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
                    cell: (s: (typeof shipments)[number]) =>
                      s.status === "preparing" ? (
                        <ShipForm shipment={s} today={today} reply={actionData} busy={busy} />
                      ) : s.status === "shipped" ? (
                        <Form method="post">
                          <input type="hidden" name="intent" value="lost" />
                          <input type="hidden" name="shipmentId" value={s.id} />
                          <Button type="submit" variant="secondary" disabled={busy}>
                            Mark lost
                          </Button>
                          <FormErrors errors={refusalOf(replyAbout(actionData, "shipmentId", s.id), "lost")} />
                        </Form>
                      ) : null,
                  },
                ]
              : []),
          ]}
        />
      </Card>
    </div>
  );
}

type FormArgs = { reply: unknown; busy: boolean };

function PrepareForm({ labs, defaultContents, reply, busy }: FormArgs & { labs: { value: string; label: string }[]; defaultContents: string }) {
  const [form, fields] = useSchemaForm(shipmentForms.create, { reply, intent: "create", defaultValue: { contents: defaultContents } });
  return (
    <Form method="post" className="grid gap-4 md:grid-cols-2" {...getFormProps(form)}>
      <input type="hidden" name="intent" value="create" />
      <FormErrors errors={formWideErrors(form)} />
      <SelectField label="Lab" {...fieldProps(fields.enrollmentId)} options={labs} />
      <Field label="Carrier" {...fieldProps(fields.carrier)} />
      <div className="md:col-span-2">
        <TextAreaField label="Materials and lots" {...fieldProps(fields.contents)} />
      </div>
      <Field label="Tracking number" {...fieldProps(fields.trackingNumber)} />
      <div className="self-end">
        <Button type="submit" disabled={busy}>
          Prepare shipment
        </Button>
      </div>
    </Form>
  );
}

type Shipment = Route.ComponentProps["loaderData"]["shipments"][number];

/** One row's "mark shipped" form; the action's answer belongs to it only when it names this shipment. */
function ShipForm({ shipment, today, reply, busy }: FormArgs & { shipment: Shipment; today: string }) {
  const [form, fields] = useSchemaForm(shipmentForms.ship, {
    reply: replyAbout(reply, "shipmentId", shipment.id),
    intent: "ship",
    id: `ship-${shipment.id}`,
    defaultValue: { shippedOn: today, carrier: shipment.carrier, trackingNumber: shipment.trackingNumber },
  });
  return (
    <Form method="post" className="flex flex-col gap-2" {...getFormProps(form)}>
      <input type="hidden" name="intent" value="ship" />
      <input type="hidden" name="shipmentId" value={shipment.id} />
      <Field label="Ship date" type="date" {...fieldProps(fields.shippedOn)} />
      <Field label="Carrier" {...fieldProps(fields.carrier)} />
      <Field label="Tracking number" {...fieldProps(fields.trackingNumber)} />
      <FormErrors errors={formWideErrors(form)} />
      <Button type="submit" disabled={busy}>
        Mark shipped
      </Button>
    </Form>
  );
}
