import { getFormProps } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/index";
import { Pager } from "~/components/pager";
import { StateBadge } from "~/components/state-badge";
import { FormErrors, formWideErrors, useSchemaForm } from "~/components/forms";
import { Button, Card, PageHeader } from "~/components/ui";
import { labInvitationAnswerSchema } from "~/lib/account-forms";
import { formatDate } from "~/lib/format";
import { labTodoItems } from "~/lib/lab-todo";
import { requestedPage } from "~/lib/paging";
import { ENROLLMENT_STATE, STUDY_STATE } from "~/lib/state-labels";
import { labEnrollmentsPage, labTodoFacts } from "~/models/study.server";
import { answerInvitationInApp } from "~/models/invitation.server";
import { refuse, withRefusals } from "~/server/form-reply.server";
import { requireRole } from "~/server/guards.server";
import { redirectWithToast } from "~/server/toast.server";

export const meta: Route.MetaFunction = () => [{ title: "My lab · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireRole(request, "analyst");
  const { rows, ...page } = await labEnrollmentsPage(user.labIds, requestedPage(new URL(request.url).searchParams));
  const facts = await labTodoFacts(rows);
  const enrollments = rows.map((e) => ({ ...e, todo: labTodoItems(facts.get(e.enrollmentId)!) }));
  // Studies with something waiting come first on the page; the rest keep their order.
  return { enrollments: [...enrollments.filter((e) => e.todo.length > 0), ...enrollments.filter((e) => e.todo.length === 0)], page };
}

/** Accepts or declines the lab's invitation, as the e-mail's link would. */
export async function action({ request }: Route.ActionArgs) {
  const user = await requireRole(request, "analyst");
  const submission = parseWithZod(await request.formData(), { schema: labInvitationAnswerSchema });
  if (submission.status !== "success") return refuse(submission);
  const { intent, enrollmentId } = submission.value;
  const answered = await withRefusals(submission, () => answerInvitationInApp(user, enrollmentId, intent), 409);
  if (!answered.ok) return answered.reply;
  return redirectWithToast("/lab", intent === "accept" ? "Invitation accepted. Your lab code is shown beside the study." : "Invitation declined. The coordinator is told.");
}

export default function LabHome({ loaderData, actionData }: Route.ComponentProps) {
  const { enrollments, page } = loaderData;
  return (
    <>
      <PageHeader
        title="My lab"
        subtitle="What is waiting for your lab in each study. You see your own lab's data only."
        actions={
          <Link to="/lab/queries" className="inline-flex min-h-11 items-center font-semibold text-basalt-700 underline">
            Queries to your lab
          </Link>
        }
      />
      {enrollments.length === 0 ? (
        <Card>
          <p>Your lab is not enrolled in any study yet.</p>
        </Card>
      ) : (
        <div className="grid gap-4">
          {enrollments.map((e) => (
            <section key={e.enrollmentId} aria-labelledby={`study-${e.enrollmentId}`} className="rounded-lg border border-basalt-100 bg-white p-5 shadow-sm">
              <div className="mb-3 flex flex-wrap items-center justify-between gap-2">
                <h2 id={`study-${e.enrollmentId}`} className="text-lg font-semibold text-basalt-800">
                  <Link to={`/lab/studies/${e.studyId}`} className="whitespace-nowrap text-basalt-700 underline">
                    {e.studyCode}
                  </Link>{" "}
                  — {e.studyTitle}
                </h2>
                <span className="flex flex-wrap items-center gap-2 text-basalt-700">
                  <StateBadge view={STUDY_STATE[e.studyState]} />
                  {e.enrollmentState === "withdrawn" && <StateBadge view={{ ...ENROLLMENT_STATE.withdrawn, label: "Your lab withdrawn" }} />}
                  <span>
                    {e.labName} · <span className="whitespace-nowrap">lab code <span className="font-semibold">{e.labCode ?? "—"}</span></span>
                  </span>
                </span>
              </div>
              {e.todo.length === 0 ? (
                <p className="text-basalt-700">Nothing is waiting for your lab in this study.</p>
              ) : (
                <ul className="grid gap-3" aria-label={`Waiting in ${e.studyCode}`}>
                  {e.todo.map((item) => (
                    <li key={item.kind} className="grid gap-1 border-l-4 border-ochre-300 pl-3 sm:grid-cols-[1fr_auto]" data-testid={`todo-${item.kind}`}>
                      <div>
                        <p className="font-semibold text-basalt-900">{item.title}</p>
                        <p className="text-basalt-700">{item.detail}</p>
                        {item.kind === "accept" && <InvitationAnswer enrollmentId={e.enrollmentId} studyCode={e.studyCode} reply={actionData} />}
                        <p className="flex flex-wrap gap-x-4">
                          {item.links.map((link) => (
                            <Link key={link.to + link.label} to={link.to} className="inline-flex min-h-11 items-center font-semibold text-basalt-700 underline">
                              {link.label}
                            </Link>
                          ))}
                        </p>
                      </div>
                      {item.due && <p className="whitespace-nowrap tabular-nums text-basalt-700">due {formatDate(item.due)}</p>}
                    </li>
                  ))}
                </ul>
              )}
            </section>
          ))}
        </div>
      )}
      <Pager page={page.page} pageCount={page.pageCount} label="Your lab's study pages" />
    </>
  );
}

/** Accept and decline buttons for one study's invitation; a refusal (used or expired meanwhile) is said above them. */
function InvitationAnswer({ enrollmentId, studyCode, reply }: { enrollmentId: number; studyCode: string; reply: Route.ComponentProps["actionData"] }) {
  const answering = useNavigation().formData?.get("enrollmentId") === String(enrollmentId);
  const mine = (reply && "result" in reply ? reply.result.initialValue?.enrollmentId : undefined) === String(enrollmentId);
  const [form] = useSchemaForm(labInvitationAnswerSchema, { reply: mine ? reply : undefined, id: `invitation-${enrollmentId}` });
  return (
    <Form method="post" className="my-2 flex flex-col gap-2" {...getFormProps(form)}>
      <FormErrors errors={formWideErrors(form)} />
      <input type="hidden" name="enrollmentId" value={enrollmentId} />
      <div className="flex flex-wrap gap-3">
        <Button type="submit" name="intent" value="accept" disabled={answering}>
          Accept<span className="sr-only"> the invitation to {studyCode}</span>
        </Button>
        <Button type="submit" name="intent" value="decline" variant="secondary" disabled={answering}>
          Decline<span className="sr-only"> the invitation to {studyCode}</span>
        </Button>
      </div>
    </Form>
  );
}
