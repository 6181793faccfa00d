import { data, Form, Link } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/queries";
import { DataTable } from "~/components/data-table";
import { Badge, Button, Card, Notice, PageHeader } from "~/components/ui";
import { parseForm } from "~/lib/forms";
import { notFound } from "~/server/guards.server";
import { requireStudy } from "~/server/study-context.server";
import { cellKey } from "~/lib/review/cells";
import { writeRefusal } from "~/lib/write-rules";
import { closeQuery, listStudyQueries, QueryError } from "~/models/coordinator-queries.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Queries · ${data?.study.code ?? "Study"} · Ringbatch` }];

export async function loader({ context }: Route.LoaderArgs) {
  const { study } = requireStudy(context, ["coordinator", "admin"]);
  return { study: { id: study.id, code: study.code, title: study.title }, queries: await listStudyQueries(study.id), refusal: writeRefusal("queries", study.state) };
}

const closeSchema = z.object({ queryId: z.coerce.number().int().positive("Missing query.") });

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user } = requireStudy(context, ["coordinator"]);
  const parsed = parseForm(closeSchema, await request.formData());
  if (!parsed.ok) return data({ ok: false as const, error: parsed.errors.queryId ?? "Missing query." }, { status: 400 });
  try {
    if (!(await closeQuery(study, user.id, parsed.data.queryId))) notFound();
  } catch (error) {
    if (error instanceof QueryError) return data({ ok: false as const, error: error.message }, { status: 409 });
    throw error;
  }
  return { ok: true as const, error: null };
}

const STATE_TONE = { open: "ochre", answered: "signal", closed: "leaf" } as const;

export default function Queries({ loaderData, actionData }: Route.ComponentProps) {
  const { study, queries, refusal } = loaderData;
  type Query = (typeof queries)[number];
  return (
    <>
      <PageHeader title={`Queries — ${study.code}`} subtitle="Questions to labs about their cells: open until the lab answers, closed once you have what you need." />
      <div className="flex flex-col gap-4">
        {actionData?.ok && <Notice tone="success">Query closed.</Notice>}
        {actionData && !actionData.ok && <Notice tone="error">{actionData.error}</Notice>}
        <Card>
          <DataTable<Query>
            caption="Queries of the study, newest first"
            filterLabel="Filter queries"
            empty="No query yet. Raise one from a flagged cell on the analysis page."
            data={queries}
            columns={[
              { id: "state", header: "State", value: (q) => q.state, cell: (q) => <Badge tone={STATE_TONE[q.state]}>{q.state}</Badge> },
              { id: "lab", header: "Lab", value: (q) => q.lab, cell: (q) => `${q.lab} · ${q.labName}` },
              {
                id: "cell",
                header: "Cell",
                value: (q) => `${q.material} ${q.response}`,
                cell: (q) => (
                  <Link to={`/studies/${study.id}/analysis?cell=${encodeURIComponent(cellKey(q))}#investigate`} className="text-basalt-700 underline">
                    {q.material} · {q.response}
                  </Link>
                ),
              },
              { id: "statistic", header: "Statistic", value: (q) => q.statistic || null },
              { id: "question", header: "Question", value: (q) => q.question },
              { id: "answer", header: "Lab's answer", value: (q) => q.answer, cell: (q) => q.answer ?? <span className="text-basalt-700">awaited</span> },
              { id: "raised", header: "Raised", value: (q) => q.createdAt.slice(0, 10) },
              {
                id: "close",
                header: "Action",
                sortable: false,
                value: () => null,
                cell: (q) =>
                  q.state !== "closed" && !refusal ? (
                    <Form method="post">
                      <input type="hidden" name="queryId" value={q.id} />
                      <Button type="submit" variant="secondary">
                        Close<span className="sr-only"> the query to lab {q.lab} on {q.material}</span>
                      </Button>
                    </Form>
                  ) : (
                    (q.closedAt?.slice(0, 10) ?? "—")
                  ),
              },
            ]}
          />
        </Card>
      </div>
    </>
  );
}
