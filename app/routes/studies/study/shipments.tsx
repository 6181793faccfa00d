import { getFormProps } from "@conform-to/react";
import type { MouseEvent } from "react";
import { Form, Link, useNavigation } from "react-router";
import type { z } from "zod";
import type { Route } from "./+types/shipments";
import { DataTable } from "~/components/data-table";
import { fieldProps, FormErrors, formWideErrors, refusalOf, replyAbout, useSchemaForm } from "~/components/forms";
import { PackingItemsTable } from "~/components/packing-list";
import { StateBadge } from "~/components/state-badge";
import type { StudyPageHandle } from "~/components/study-frame";
import { Badge, Button, Card, Field, Notice, SelectField, TextAreaField } from "~/components/ui";
import { MaterialsCaution } from "~/components/cautions";
import { formatDate, todayIso } from "~/lib/format";
import { packingSummary, UNIT_CHOICES } from "~/lib/packing-list";
import { SHIPMENT_STATE } from "~/lib/state-labels";
import { shipmentForms, shipmentsSchema } from "~/lib/study-forms";
import { studyPageMeta } from "~/lib/study-page-meta";
import { mayWrite, writeRefusal } from "~/lib/write-rules";
import { labsAwaitingShipment, listStudyShipments, markLost, markShipped, prepareShipments, studyStartingPackingList } from "~/models/shipment.server";
import { submitForm } from "~/server/form-reply.server";
import { requireStudy } from "~/server/study-context.server";
import { redirectWithToast } from "~/server/toast.server";

export const handle = { pageTitle: "Shipments" } satisfies StudyPageHandle;

export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

export async function loader({ context }: Route.LoaderArgs) {
  const { study, access } = requireStudy(context, ["coordinator", "admin"]);
  const [awaiting, list, startingList] = await Promise.all([labsAwaitingShipment(study.id), listStudyShipments(study.id), studyStartingPackingList(study.id)]);
  return {
    study,
    awaiting: awaiting.map((lab) => ({ value: String(lab.enrollmentId), label: `${lab.labCode ?? "—"} · ${lab.labName}` })),
    shipments: list,
    startingList,
    canEdit: access === "coordinator" && mayWrite("shipments", study.state),
    // Why a coordinator sees no shipment controls in this state; admins read only and are told nothing.
    closedBecause: access === "coordinator" ? writeRefusal("shipments", study.state) : null,
    today: todayIso(),
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user } = requireStudy(context, ["coordinator"]);
  const change = async (form: z.output<typeof shipmentsSchema>) => {
    switch (form.intent) {
      case "create": {
        const { intent: _, ...input } = form;
        const prepared = await prepareShipments(study, input, user.id);
        return prepared === 1 ? "Shipment prepared." : `Prepared ${prepared} shipments with the same packing list.`;
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
  };
  return submitForm(request, shipmentsSchema, change, (message) => redirectWithToast(`/studies/${study.id}/shipments`, message));
}

type Shipment = Route.ComponentProps["loaderData"]["shipments"][number];

export default function Shipments({ loaderData, actionData }: Route.ComponentProps) {
  const { study, awaiting, startingList, shipments, canEdit, closedBecause, today } = loaderData;
  const busy = useNavigation().state === "submitting";
  return (
    <div className="flex flex-col gap-6">
      <MaterialsCaution packing />
      {closedBecause && <Notice>{closedBecause}</Notice>}
      {canEdit && (
        <Card title="Prepare shipments">
          {awaiting.length === 0 ? (
            <p>Every accepted lab has a shipment. Labs appear here once they accept, or when their shipment is marked lost.</p>
          ) : (
            <PrepareForm awaiting={awaiting} startingList={startingList} reply={actionData} busy={busy} />
          )}
        </Card>
      )}
      <Card title="Shipments">
        <DataTable
          caption="Shipments of the study, one row per shipment"
          filterLabel="Filter shipments"
          empty="No shipments yet."
          data={shipments}
          columns={[
            { id: "lab", header: "Lab", value: (s) => `${s.labCode ?? ""} ${s.labName}`.trim() },
            {
              id: "status",
              header: "State",
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
            {
              id: "carrier",
              header: "Carrier and tracking",
              value: (s) => [s.carrier, s.trackingNumber].filter(Boolean).join(" · ") || null,
              // The tracking number on its own line, whole: a number split at its hyphen cannot be read out to the carrier.
              cell: (s) =>
                s.carrier || s.trackingNumber ? (
                  <>
                    {s.carrier}
                    {s.trackingNumber && <span className="keep-whole block">{s.trackingNumber}</span>}
                  </>
                ) : (
                  "—"
                ),
            },
            {
              id: "items",
              header: "Items",
              value: (s) => s.items.length,
              cell: (s) => (
                <details>
                  <summary className="cursor-pointer font-semibold text-basalt-700">{packingSummary(s.items)}</summary>
                  <div className="mt-2 min-w-80">
                    <PackingItemsTable caption={`Items for ${s.labCode ?? s.labName}`} items={s.items} note={s.note} />
                  </div>
                </details>
              ),
            },
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
            {
              id: "packing-list",
              header: "Packing list",
              sortable: false,
              value: () => null,
              cell: (s) => (
                <Link to={`/studies/${study.id}/shipments/${s.id}/packing-list`} className="font-semibold text-basalt-700 underline">
                  Print<span className="sr-only"> the packing list for {s.labCode ?? s.labName}</span>
                </Link>
              ),
            },
            ...(canEdit
              ? [
                  {
                    id: "actions",
                    header: "Next step",
                    sortable: false,
                    value: () => null,
                    cell: (s: Shipment) =>
                      s.status === "preparing" ? (
                        <ShipForm shipment={s} today={today} reply={actionData} busy={busy} />
                      ) : s.status === "shipped" ? (
                        <Form method="post">
                          <input type="hidden" name="intent" value="lost" />
                          <input type="hidden" name="shipmentId" value={s.id} />
                          <Button type="submit" variant="secondary" disabled={busy}>
                            Mark lost<span className="sr-only"> ({s.labCode ?? s.labName})</span>
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

const EVERY_LAB = "every";

/**
 * One packing list, for one lab or copied to every lab awaiting materials. The
 * lab list offers only labs awaiting a shipment; choosing all of them asks for
 * a confirmation that names how many.
 */
function PrepareForm({
  awaiting,
  startingList,
  reply,
  busy,
}: FormArgs & { awaiting: { value: string; label: string }[]; startingList: Route.ComponentProps["loaderData"]["startingList"] }) {
  const [form, fields] = useSchemaForm(shipmentForms.create, {
    reply,
    intent: "create",
    defaultValue: { enrollmentId: EVERY_LAB, items: startingList.length ? startingList : [{ unit: "kg", containerCount: "1" }] },
  });
  const items = fields.items.getFieldList();
  const labCount = awaiting.length;
  // Asked on the Prepare button only: the add and remove buttons submit the form too, to Conform.
  const confirmEveryLab = (event: MouseEvent<HTMLButtonElement>) => {
    const target = event.currentTarget.form?.elements.namedItem("enrollmentId") as HTMLSelectElement | null;
    const question = `Prepare this packing list for all ${labCount} ${labCount === 1 ? "lab" : "labs"} awaiting materials?`;
    if (target?.value === EVERY_LAB && !window.confirm(question)) event.preventDefault();
  };
  return (
    <Form method="post" className="flex flex-col gap-4" {...getFormProps(form)}>
      <input type="hidden" name="intent" value="create" />
      <input type="hidden" name="labCount" value={labCount} />
      <FormErrors errors={formWideErrors(form)} />
      <div className="grid grid-cols-1 gap-4 md:grid-cols-3">
        <SelectField
          label="Ship to"
          {...fieldProps(fields.enrollmentId)}
          options={[{ value: EVERY_LAB, label: `Every accepted lab awaiting materials (${labCount})` }, ...awaiting]}
        />
        <Field label="Carrier" {...fieldProps(fields.carrier)} />
        <Field label="Tracking number" hint="For one lab; add each lab's when it ships." {...fieldProps(fields.trackingNumber)} />
      </div>
      <fieldset className="flex flex-col gap-3">
        <legend className="mb-2 font-semibold text-basalt-800">Items</legend>
        {fields.items.errors && <FormErrors errors={fields.items.errors} />}
        {items.map((item, index) => {
          const line = item.getFieldset();
          return (
            <div key={item.key} className="grid grid-cols-1 items-start gap-3 border-b border-basalt-100 pb-3 sm:grid-cols-2 lg:grid-cols-[minmax(0,3fr)_repeat(2,minmax(0,1fr))_minmax(0,1.5fr)_minmax(0,1fr)_auto]">
              <Field label={`Item ${index + 1}: material or constituent`} {...fieldProps(line.description)} />
              <Field label="Quantity" inputMode="decimal" {...fieldProps(line.quantity)} />
              <SelectField label="Unit" {...fieldProps(line.unit)} options={UNIT_CHOICES} />
              <Field label="Lot" {...fieldProps(line.lot)} />
              <Field label="Containers" inputMode="numeric" {...fieldProps(line.containerCount)} />
              <Button variant="secondary" className="self-end" {...form.remove.getButtonProps({ name: fields.items.name, index })} disabled={items.length === 1}>
                Remove<span className="sr-only"> item {index + 1}</span>
              </Button>
            </div>
          );
        })}
        <div>
          <Button variant="secondary" {...form.insert.getButtonProps({ name: fields.items.name, defaultValue: { unit: "kg", containerCount: "1" } })}>
            Add an item
          </Button>
        </div>
      </fieldset>
      <TextAreaField label="Note for the packing list" rows={2} {...fieldProps(fields.note)} />
      <div>
        <Button type="submit" disabled={busy} onClick={confirmEveryLab}>
          Prepare
        </Button>
      </div>
    </Form>
  );
}

/** One row's "mark shipped" form, folded away until used; the action's answer belongs to it only when it names this shipment. */
function ShipForm({ shipment, today, reply, busy }: FormArgs & { shipment: Shipment; today: string }) {
  const mine = replyAbout(reply, "shipmentId", shipment.id);
  const [form, fields] = useSchemaForm(shipmentForms.ship, {
    reply: mine,
    intent: "ship",
    id: `ship-${shipment.id}`,
    defaultValue: { shippedOn: today, carrier: shipment.carrier, trackingNumber: shipment.trackingNumber },
  });
  return (
    <details open={mine !== undefined}>
      <summary className="cursor-pointer font-semibold text-basalt-700">
        Mark shipped<span className="sr-only"> ({shipment.labCode ?? shipment.labName})</span>
      </summary>
      <Form method="post" className="mt-2 flex min-w-56 flex-col gap-2" {...getFormProps(form)}>
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
    </details>
  );
}
