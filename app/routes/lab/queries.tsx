import { getFormProps } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/queries";
import { fieldProps, FormErrors, formWideErrors, useSchemaForm } from "~/components/forms";
import { StateBadge } from "~/components/state-badge";
import { Button, Card, PageHeader, TextAreaField } from "~/components/ui";
import { refuseUnsafeCharacters } from "~/lib/text-hygiene";
import { QUERY_STATE } from "~/lib/state-labels";
import { answerQuery, listLabQueries, QueryAnswerError } from "~/models/lab-queries.server";
import { refuse } from "~/server/form-reply.server";
import { notFound, requireRole } from "~/server/guards.server";
import { redirectWithToast } from "~/server/toast.server";

export const meta: Route.MetaFunction = () => [{ title: "Queries · My lab · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireRole(request, "analyst");
  return { queries: await listLabQueries(user.labIds) };
}

const ANSWER_TOO_SHORT = "Write your answer (at least 3 characters).";

const answerSchema = z.object({
  queryId: z.coerce.number().int().positive(),
  answer: z.string({ message: ANSWER_TOO_SHORT }).trim().min(3, { message: ANSWER_TOO_SHORT }).max(2000, { message: "Keep the answer to 2000 characters or fewer." }).superRefine(refuseUnsafeCharacters({ multiline: true })),
});

export async function action({ request }: Route.ActionArgs) {
  const user = await requireRole(request, "analyst");
  const submission = parseWithZod(await request.formData(), { schema: answerSchema });
  if (submission.status !== "success") return refuse(submission);
  const { queryId, answer } = submission.value;
  try {
    if (!(await answerQuery(queryId, user.labIds, answer, user, request))) notFound();
  } catch (error) {
    if (error instanceof QueryAnswerError) return refuse(submission, { answer: [error.message] }, 409);
    throw error;
  }
  return redirectWithToast("/lab/queries", "Answer sent to the coordinator.");
}

type LabQuery = Route.ComponentProps["loaderData"]["queries"][number];

export default function LabQueries({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <>
      <PageHeader title="Queries" subtitle="Questions from study coordinators about your lab's results. Your answer is e-mailed to the coordinator." />
      {loaderData.queries.length === 0 ? (
        <Card>
          <p>No queries to your lab.</p>
        </Card>
      ) : (
        <ul className="grid gap-4">
          {loaderData.queries.map((q) => (
            <li key={q.id}>
              <Card>
                <h2 className="mb-1 text-lg font-semibold text-basalt-800">
                  {q.studyCode} · {q.materialCode} · {q.responseName} <StateBadge view={QUERY_STATE[q.state]} />
                </h2>
                {q.statistic && <p className="text-sm text-basalt-700">Prompted by {q.statistic}</p>}
                <p className="my-2">{q.question}</p>
                <Link to={`/lab/studies/${q.studyId}/results/${q.materialId}`} className="font-semibold text-basalt-700 underline">
                  Open the results of {q.materialCode}
                </Link>
                {q.answer && (
                  <p className="mt-2">
                    <span className="font-semibold">Your lab's answer:</span> {q.answer}
                  </p>
                )}
                {q.state !== "closed" && <AnswerForm query={q} reply={actionData?.result?.initialValue?.queryId === String(q.id) ? actionData : undefined} />}
              </Card>
            </li>
          ))}
        </ul>
      )}
    </>
  );
}

function AnswerForm({ query, reply }: { query: LabQuery; reply: Route.ComponentProps["actionData"] }) {
  const busy = useNavigation().state !== "idle";
  const [form, fields] = useSchemaForm(answerSchema, { reply, id: `answer-${query.id}` });
  return (
    <Form method="post" className="mt-3 grid max-w-2xl gap-2" {...getFormProps(form)}>
      <input type="hidden" name="queryId" value={query.id} />
      <FormErrors errors={formWideErrors(form)} />
      <TextAreaField label={query.answer ? "Change your answer" : "Your answer"} rows={3} {...fieldProps(fields.answer)} />
      <div>
        <Button type="submit" disabled={busy}>
          Send answer
        </Button>
      </div>
    </Form>
  );
}
