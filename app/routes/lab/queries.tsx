import { data, Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/queries";
import { Badge, Button, Card, Notice, PageHeader } from "~/components/ui";
import { parseForm } from "~/lib/forms";
import { notFound, requireRole } from "~/server/guards.server";
import { answerQuery, listLabQueries, QueryAnswerError } from "~/models/lab-queries.server";

export const meta: Route.MetaFunction = () => [{ title: "Queries · My lab · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireRole(request, "analyst");
  return { queries: await listLabQueries(user.labIds) };
}

const answerSchema = z.object({
  queryId: z.coerce.number().int().positive(),
  answer: z.string().trim().min(3, { message: "Write your answer (at least 3 characters)." }).max(2000, { message: "Keep the answer to 2000 characters or fewer." }),
});

export async function action({ request }: Route.ActionArgs) {
  const user = await requireRole(request, "analyst");
  const parsed = parseForm(answerSchema, await request.formData());
  if (!parsed.ok) return data({ queryId: Number(parsed.values.queryId), errors: parsed.errors, values: parsed.values }, { status: 400 });
  try {
    const answered = await answerQuery(parsed.data.queryId, user.labIds, parsed.data.answer, user, request);
    if (!answered) notFound();
  } catch (error) {
    if (error instanceof QueryAnswerError) return data({ queryId: parsed.data.queryId, errors: { answer: error.message }, values: parsed.values }, { status: 409 });
    throw error;
  }
  return { queryId: parsed.data.queryId, answered: true };
}

const STATE_VIEW = { open: { label: "Open", tone: "signal" }, answered: { label: "Answered", tone: "leaf" }, closed: { label: "Closed", tone: "neutral" } } as const;

export default function LabQueries({ loaderData, actionData }: Route.ComponentProps) {
  const navigation = useNavigation();
  const reply = actionData as { queryId: number; answered?: boolean; errors?: Record<string, string>; values?: Record<string, string> } | undefined;
  return (
    <>
      <PageHeader title="Queries" subtitle="Questions from study coordinators about your lab's results. Your answer is e-mailed to the coordinator." />
      {loaderData.queries.length === 0 ? (
        <Card>
          <p>No queries to your lab.</p>
        </Card>
      ) : (
        <ul className="grid gap-4">
          {loaderData.queries.map((q) => {
            const mine = reply?.queryId === q.id ? reply : undefined;
            const id = `answer-${q.id}`;
            return (
              <li key={q.id}>
                <Card>
                  <h2 className="mb-1 text-lg font-semibold text-basalt-800">
                    {q.studyCode} · {q.materialCode} · {q.responseName} <Badge tone={STATE_VIEW[q.state].tone}>{STATE_VIEW[q.state].label}</Badge>
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
                  {mine?.answered && <Notice tone="success">Answer sent to the coordinator.</Notice>}
                  {q.state !== "closed" && (
                    <Form method="post" className="mt-3 grid max-w-2xl gap-2">
                      <input type="hidden" name="queryId" value={q.id} />
                      <label htmlFor={id} className="font-semibold text-basalt-800">
                        {q.answer ? "Change your answer" : "Your answer"}
                      </label>
                      <textarea
                        id={id}
                        name="answer"
                        rows={3}
                        required
                        defaultValue={mine?.values?.answer ?? ""}
                        aria-invalid={mine?.errors?.answer ? true : undefined}
                        aria-describedby={mine?.errors?.answer ? `${id}-error` : undefined}
                        className="rounded-md border border-basalt-200 bg-white px-3 py-2"
                      />
                      {mine?.errors?.answer && (
                        <p id={`${id}-error`} className="text-sm font-semibold text-signal-700">
                          {mine.errors.answer}
                        </p>
                      )}
                      <div>
                        <Button type="submit" disabled={navigation.state !== "idle"}>
                          Send answer
                        </Button>
                      </div>
                    </Form>
                  )}
                </Card>
              </li>
            );
          })}
        </ul>
      )}
    </>
  );
}
