import type { Route } from "./+types/packing-list";
import { MaterialsCaution } from "~/components/cautions";
import { PackingItemsTable } from "~/components/packing-list";
import { StateBadge } from "~/components/state-badge";
import type { StudyPageHandle } from "~/components/study-frame";
import { Button, Card } from "~/components/ui";
import { formatDate } from "~/lib/format";
import { packingSummary } from "~/lib/packing-list";
import { SHIPMENT_STATE } from "~/lib/state-labels";
import { studyPageMeta } from "~/lib/study-page-meta";
import { packingListOf } from "~/models/shipment.server";
import { notFound } from "~/server/guards.server";
import { requireStudy } from "~/server/study-context.server";

export const handle = { pageTitle: "Packing list" } satisfies StudyPageHandle;

export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

/** One lab's packing list, to print and put in the box. */
export async function loader({ context, params }: Route.LoaderArgs) {
  const { study } = requireStudy(context, ["coordinator", "admin"]);
  const shipmentId = Number(params.shipmentId);
  if (!Number.isSafeInteger(shipmentId) || shipmentId <= 0) notFound();
  return { study: { code: study.code, title: study.title, testMethod: study.testMethod }, shipment: await packingListOf(study.id, shipmentId) };
}

export default function PackingList({ loaderData }: Route.ComponentProps) {
  const { study, shipment } = loaderData;
  const lab = shipment.labCode ? `${shipment.labName} (${shipment.labCode})` : shipment.labName;
  return (
    <article className="flex flex-col gap-4">
      <p className="no-print">
        <Button type="button" variant="secondary" onClick={() => window.print()}>
          Print the packing list
        </Button>
      </p>
      <Card title={`For ${lab}`} className="print:border-0 print:p-0 print:shadow-none">
        <dl className="grid gap-x-6 gap-y-1 sm:grid-cols-[auto_1fr]">
          <dt className="font-semibold">Study</dt>
          <dd>
            {study.code}, {study.title} ({study.testMethod})
          </dd>
          <dt className="font-semibold">Ship to</dt>
          <dd className="whitespace-pre-line">{[shipment.contactName, shipment.labName, shipment.address].filter(Boolean).join("\n")}</dd>
          {shipment.contactEmail && (
            <>
              <dt className="font-semibold">Contact</dt>
              <dd>{shipment.contactEmail}</dd>
            </>
          )}
          <dt className="font-semibold">Shipment</dt>
          <dd>
            No. {shipment.id} · <StateBadge view={SHIPMENT_STATE[shipment.status]} /> · {packingSummary(shipment.items)}
          </dd>
          <dt className="font-semibold">Carrier</dt>
          <dd>{[shipment.carrier, shipment.trackingNumber && `tracking ${shipment.trackingNumber}`].filter(Boolean).join(", ") || "—"}</dd>
          <dt className="font-semibold">Shipped</dt>
          <dd>{formatDate(shipment.shippedOn)}</dd>
        </dl>
      </Card>
      <PackingItemsTable caption={`Packing list for ${lab}`} items={shipment.items} note={shipment.note} />
      <MaterialsCaution packing />
      <p className="text-sm text-basalt-700">On arrival, check each line against the boxes and confirm receipt and condition on the study's receipt page.</p>
    </article>
  );
}
