import { parseWithZod } from "@conform-to/zod/v4";
import { Form, Link } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/queries";
import { DataTable } from "~/components/data-table";
import { FormErrors, refusalOf } from "~/components/forms";
import { StateBadge } from "~/components/state-badge";
import type { StudyPageHandle } from "~/components/study-frame";
import { Button, Card } from "~/components/ui";
import { formatDate } from "~/lib/format";
import { cellKey } from "~/lib/review/cells";
import { writeRefusal } from "~/lib/write-rules";
import { QUERY_STATE } from "~/lib/state-labels";
import { studyPageMeta } from "~/lib/study-page-meta";
import { closeQuery, listStudyQueries } from "~/models/coordinator-queries.server";
import { refuse, withRefusals } from "~/server/form-reply.server";
import { notFound } from "~/server/guards.server";
import { requireStudy } from "~/server/study-context.server";
import { redirectWithToast } from "~/server/toast.server";

export const handle = { pageTitle: "Queries" } satisfies StudyPageHandle;

export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

export async function loader({ context }: Route.LoaderArgs) {
  const { study } = requireStudy(context, ["coordinator", "admin"]);
  return { study: { id: study.id, code: study.code, title: study.title }, queries: await listStudyQueries(study.id), refusal: writeRefusal("queries", study.state) };
}

const closeSchema = z.object({
  intent: z.literal("close", { error: "Unknown action." }),
  queryId: z.coerce.number({ message: "Missing query." }).int().positive("Missing query."),
});

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user } = requireStudy(context, ["coordinator"]);
  const submission = parseWithZod(await request.formData(), { schema: closeSchema });
  if (submission.status !== "success") return refuse(submission);
  const closed = await withRefusals(submission, () => closeQuery(study, user.id, submission.value.queryId), 409);
  if (!closed.ok) return closed.reply;
  if (!closed.value) notFound();
  return redirectWithToast(`/studies/${study.id}/queries`, "Query closed.");
}

export default function Queries({ loaderData, actionData }: Route.ComponentProps) {
  const { study, queries, refusal } = loaderData;
  type Query = (typeof queries)[number];
  return (
    <div className="flex flex-col gap-4">
      <p className="text-basalt-700">Questions to labs about their cells: open until the lab answers, closed once you have what you need.</p>
      <FormErrors errors={refusalOf(actionData, "close")} />
      <Card>
        <DataTable<Query>
          caption="Queries of the study, newest first"
          filterLabel="Filter queries"
          empty="No query yet. Raise one from a flagged cell on the analysis page."
          data={queries}
          columns={[
            { id: "state", header: "State", value: (q) => QUERY_STATE[q.state].label, cell: (q) => <StateBadge view={QUERY_STATE[q.state]} /> },
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
            { id: "raised", header: "Raised", value: (q) => formatDate(q.createdAt) },
            {
              id: "close",
              header: "Action",
              sortable: false,
              value: () => null,
              cell: (q) =>
                q.state !== "closed" && !refusal ? (
                  <Form method="post">
                    <input type="hidden" name="intent" value="close" />
                    <input type="hidden" name="queryId" value={q.id} />
                    <Button type="submit" variant="secondary">
                      Close
                      <span className="sr-only">
                        {" "}
                        the query to lab {q.lab} on {q.material}
                      </span>
                    </Button>
                  </Form>
                ) : (
                  formatDate(q.closedAt)
                ),
            },
          ]}
        />
      </Card>
    </div>
  );
}
