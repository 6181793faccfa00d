import { getFormProps } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { useEffect } from "react";
import { Form, Link, useFetcher, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/overview";
import { CellStatusBadge } from "~/components/cell-status-badge";
import { DataTable } from "~/components/data-table";
import { FormErrors, formWideErrors, useSchemaForm } from "~/components/forms";
import type { StudyPageHandle } from "~/components/study-frame";
import { Button, Card, Notice } from "~/components/ui";
import { CELL_STATUS_ORDER } from "~/lib/cell-status";
import { FieldRefusal } from "~/lib/field-refusal";
import { formatDate, todayIso } from "~/lib/format";
import { CELL_STATUS } from "~/lib/state-labels";
import { mayWrite } from "~/lib/write-rules";
import { studyPageMeta } from "~/lib/study-page-meta";
import { remindLabsWithMissingResults } from "~/models/reminder.server";
import { listStudyShipments } from "~/models/shipment.server";
import { type StudyProgress, statusCountsByMaterial, studyMatrix } from "~/models/study.server";
import { refuse, withRefusals } from "~/server/form-reply.server";
import { requireStudy } from "~/server/study-context.server";
import { redirectWithToast } from "~/server/toast.server";

export const handle = { pageTitle: "Overview" } satisfies StudyPageHandle;

export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

/** How often the open page refreshes its progress. */
const POLL_MS = 15_000;

export async function loader({ context }: Route.LoaderArgs) {
  const { study, access } = requireStudy(context, ["coordinator", "admin"]);
  const [matrix, shipments] = await Promise.all([studyMatrix(study.id), listStudyShipments(study.id)]);
  return {
    study,
    matrix,
    counts: statusCountsByMaterial(matrix),
    shipments: {
      damaged: shipments.filter((s) => s.condition === "damaged"),
      lost: shipments.filter((s) => s.status === "lost"),
      shipped: shipments.filter((s) => s.status === "shipped").length,
      received: shipments.filter((s) => s.status === "received").length,
    },
    canRemind: access === "coordinator" && mayWrite("results", study.state),
    today: todayIso(),
  };
}

const remindSchema = z.object({ intent: z.literal("remind", { error: "Unknown action." }) });

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user } = requireStudy(context, ["coordinator"]);
  const submission = parseWithZod(await request.formData(), { schema: remindSchema });
  if (submission.status !== "success") return refuse(submission);
  const reminded = await withRefusals(submission, async () => {
    if (!mayWrite("results", study.state)) throw new FieldRefusal("form", "Reminders go out only while the study is testing.");
    return (await remindLabsWithMissingResults(study, user.id, request)).reminded;
  });
  if (!reminded.ok) return reminded.reply;
  const labs = reminded.value;
  return redirectWithToast(
    `/studies/${study.id}`,
    labs.length ? `Reminded ${labs.length} ${labs.length === 1 ? "lab" : "labs"}: ${labs.join(", ")}.` : "Every lab has submitted; nobody to remind.",
  );
}

function daysUntil(date: string, today: string) {
  return Math.round((Date.parse(date) - Date.parse(today)) / 86_400_000);
}

function Bar({ label, value, max }: { label: string; value: number; max: number }) {
  return (
    <div className="flex flex-col gap-1">
      <div className="flex justify-between text-sm">
        <span className="font-semibold">{label}</span>
        <span>
          {value} of {max}
        </span>
      </div>
      <progress className="h-3 w-full" max={max || 1} value={value} aria-label={`${label}: ${value} of ${max} submitted`} />
    </div>
  );
}

export default function StudyOverview({ loaderData, actionData }: Route.ComponentProps) {
  const { study, shipments, canRemind, today } = loaderData;
  const progress = useFetcher<StudyProgress>();
  const busy = useNavigation().state === "submitting";
  const [remindForm] = useSchemaForm(remindSchema, { reply: actionData, id: "remind" });

  useEffect(() => {
    const timer = setInterval(() => {
      if (document.visibilityState === "visible" && progress.state === "idle") progress.load(`/api/v1/studies/${study.id}/progress`);
    }, POLL_MS);
    return () => clearInterval(timer);
  }, [study.id, progress]);

  // The polled figures replace the loader's once they arrive.
  const live = progress.data;
  const materials = live?.materials ?? loaderData.matrix.materials.map((m) => ({ id: m.id, code: m.code }));
  const rows =
    live?.labs ??
    loaderData.matrix.rows.map((r) => ({ enrollmentId: r.id, labCode: r.labCode, labName: r.labName, statuses: r.statuses, submitted: r.submitted }));
  const counts = live?.counts ?? loaderData.counts;
  const submitted = rows.flatMap((r) => r.submitted).filter(Boolean).length;
  const total = rows.length * materials.length;
  const dates = [
    { label: "Enrollment deadline", date: study.enrollmentDeadline },
    { label: "Ship date", date: study.shipDate },
    { label: "Results due", date: study.resultsDue },
  ];

  return (
    <div className="flex flex-col gap-6">
      <p className="text-basalt-700">
        {study.testMethod} · {study.replicatesPerCell} replicates per cell
      </p>
      <FormErrors errors={formWideErrors(remindForm)} />
      {shipments.damaged.map((s) => (
        <Notice key={s.id} tone="error">
          Shipment to {s.labCode ?? s.labName} ({s.labName}) arrived damaged on {formatDate(s.receivedOn)}: {s.receiptNotes}{" "}
          <Link to={`/studies/${study.id}/shipments`} className="font-semibold underline">
            See shipments
          </Link>
        </Notice>
      ))}
      {shipments.lost.map((s) => (
        <Notice key={s.id} tone="caution">
          Shipment to {s.labCode ?? s.labName} ({s.labName}) is marked lost in transit.
        </Notice>
      ))}

      <div className="grid gap-6 md:grid-cols-3">
        <Card title="Dates">
          <dl className="flex flex-col gap-2">
            {dates.map((d) => (
              <div key={d.label}>
                <dt className="font-semibold">{d.label}</dt>
                <dd>
                  {d.date ? (
                    <>
                      {formatDate(d.date)}{" "}
                      <span className="text-sm text-basalt-700">
                        ({daysUntil(d.date, today) >= 0 ? `in ${daysUntil(d.date, today)} days` : `${-daysUntil(d.date, today)} days ago`})
                      </span>
                    </>
                  ) : (
                    "not set"
                  )}
                </dd>
              </div>
            ))}
          </dl>
        </Card>
        <Card title="Shipments">
          <p>
            {shipments.shipped} on the way · {shipments.received} received · {shipments.damaged.length} damaged · {shipments.lost.length} lost
          </p>
        </Card>
        <Card title="Reminders">
          {canRemind ? (
            <Form method="post" className="flex flex-col gap-2" {...getFormProps(remindForm)}>
              <input type="hidden" name="intent" value="remind" />
              <p className="text-sm">E-mails only the labs with results not yet submitted, listing what is missing.</p>
              <Button type="submit" disabled={busy}>
                Remind labs with missing results
              </Button>
            </Form>
          ) : (
            <p>Reminders go out while the study is testing.</p>
          )}
        </Card>
      </div>

      <Card title="Progress">
        <p className="mb-2" aria-live="polite">
          {submitted} of {total} lab × material results submitted
        </p>
        <progress className="mb-4 h-3 w-full" max={total || 1} value={submitted} aria-label="Submitted lab × material results" />
        <div className="mb-6 grid gap-4 md:grid-cols-2">
          {counts.map((c) => (
            <Bar
              key={c.materialId}
              label={`Material ${c.code}`}
              value={rows.filter((r) => r.submitted[materials.findIndex((m) => m.id === c.materialId)]).length}
              max={rows.length}
            />
          ))}
        </div>
        <DataTable
          caption="Lab × material pairs in each status, per material"
          filterLabel="Filter materials"
          data={counts}
          columns={[
            { id: "code", header: "Material", value: (c) => c.code },
            ...CELL_STATUS_ORDER.map((s) => ({ id: s, header: CELL_STATUS[s].label, value: (c: (typeof counts)[number]) => c.counts[s] })),
          ]}
        />
      </Card>

      <Card title="Cell status by lab and material">
        <DataTable
          caption="Cell status by lab and material"
          filterLabel="Filter labs"
          empty="No lab has accepted yet."
          data={rows}
          columns={[
            { id: "code", header: "Lab code", value: (r) => r.labCode },
            { id: "lab", header: "Lab", value: (r) => r.labName },
            {
              id: "done",
              header: "Submitted",
              value: (r) => r.submitted.filter(Boolean).length,
              cell: (r) => <Bar label={r.labCode ?? r.labName} value={r.submitted.filter(Boolean).length} max={materials.length} />,
            },
            ...materials.map((m, i) => ({
              id: `m${m.id}`,
              header: m.code,
              value: (r: (typeof rows)[number]) => CELL_STATUS[r.statuses[i]!].label,
              cell: (r: (typeof rows)[number]) => <CellStatusBadge status={r.statuses[i]!} />,
            })),
          ]}
        />
      </Card>
    </div>
  );
}
