import { getFormProps, type Submission } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/invite";
import { fieldProps, FormErrors, formWideErrors, useSchemaForm } from "~/components/forms";
import { Button, Card, Field, MessagePage } from "~/components/ui";
import { acceptInvitationSchema, declineInvitationSchema, invitationAccountSchema, invitationAnswerSchema } from "~/lib/account-forms";
import { formatDate } from "~/lib/format";
import { acceptInvitation, declineInvitation, InvitationError, type InvitationLookup, lookupInvitation } from "~/models/invitation.server";
import { redirectSignedIn } from "~/server/auth.server";
import { refuse } from "~/server/form-reply.server";
import { getUser } from "~/server/guards.server";
import { clientAddress, isLimited, LINK_MISSES, recordHit } from "~/server/rate-limit.server";
export const meta: Route.MetaFunction = () => [{ title: "Invitation · Ringbatch" }];

const REFUSAL: Record<Exclude<InvitationLookup["status"], "valid">, { title: string; message: string; status: number }> = {
  unknown: { title: "This invitation link is not valid", message: "Check that the whole link was copied from the e-mail, or ask the study coordinator for a new invitation.", status: 404 },
  other_study: { title: "This invitation belongs to another study", message: "The link does not match the study it names. Open the link exactly as it came in the e-mail, or ask the coordinator for a new one.", status: 404 },
  used: { title: "This invitation has already been used", message: "Each invitation link works once. If your lab has accepted, sign in to see the study; otherwise ask the coordinator for a new invitation.", status: 410 },
  expired: { title: "This invitation has expired", message: "Invitation links work for 14 days. Ask the study coordinator to invite your lab again.", status: 410 },
};

async function lookup(request: Request, token: string | undefined) {
  const key = clientAddress(request);
  if (await isLimited(LINK_MISSES, key)) throw data({ title: "Too many attempts", message: "Wait 15 minutes, then open the link again." }, { status: 429 });
  const found = await lookupInvitation(token ?? "", new URL(request.url).searchParams.get("study"));
  if (found.status === "unknown" || found.status === "other_study") await recordHit(LINK_MISSES, key);
  return found;
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const [found, user] = await Promise.all([lookup(request, params.token), getUser(request)]);
  if (found.status !== "valid") {
    const { title, message, status } = REFUSAL[found.status];
    return data({ refusal: { title, message }, invitation: null }, { status });
  }
  return {
    refusal: null,
    invitation: {
      studyCode: found.study.code,
      studyTitle: found.study.title,
      testMethod: found.study.testMethod,
      resultsDue: found.study.resultsDue,
      shipDate: found.study.shipDate,
      labName: found.lab.name,
      joinsDirectory: found.lab.listing === "invited",
      email: found.invitation.email,
      needsPassword: !found.account?.hasPassword,
      signedInAs: user?.email ?? null,
      signInLink: `/login?${new URLSearchParams({ redirectTo: new URL(request.url).pathname + new URL(request.url).search, email: found.invitation.email })}`,
    },
  };
}

const PASSWORD_FIELDS = ["password", "confirm"];

export async function action({ request, params }: Route.ActionArgs) {
  const found = await lookup(request, params.token);
  const form = await request.formData();
  const answer = parseWithZod(form, { schema: invitationAnswerSchema });
  if (found.status !== "valid") return data({ result: answer.reply({ formErrors: [REFUSAL[found.status].title] }) }, { status: REFUSAL[found.status].status });
  if (answer.status !== "success") return refuse(answer);
  const user = await getUser(request);
  if (answer.value.intent === "decline") {
    await declineInvitation(found, user?.id ?? null);
    return { declined: true as const };
  }
  if (found.account?.hasPassword) {
    if (user?.id !== found.account.id) return data({ result: answer.reply({ formErrors: [`Sign in as ${found.invitation.email} to accept.`] }) }, { status: 403 });
    const accepted = await accepting(answer, () => acceptInvitation(found, { signedIn: user }));
    return accepted.ok ? redirect("/lab") : accepted.reply;
  }
  const submission = parseWithZod(form, { schema: invitationAccountSchema });
  // The passwords are never sent back into the page.
  if (submission.status !== "success") return data({ result: submission.reply({ hideFields: PASSWORD_FIELDS }) }, { status: 400 });
  const accepted = await accepting(submission, () => acceptInvitation(found, submission.value));
  return accepted.ok ? redirectSignedIn(accepted.value.userId, "/lab") : accepted.reply;
}

/** Runs the acceptance; a link claimed in the meantime (another tab, a colleague) is refused above the form. */
async function accepting<T>(submission: Submission<unknown>, accept: () => Promise<T>) {
  try {
    return { ok: true as const, value: await accept() };
  } catch (error) {
    if (!(error instanceof InvitationError)) throw error;
    return { ok: false as const, reply: data({ result: submission.reply({ hideFields: PASSWORD_FIELDS, formErrors: [error.message] }) }, { status: 409 }) };
  }
}

export default function Invitation({ loaderData, actionData }: Route.ComponentProps) {
  const { refusal, invitation } = loaderData;
  const busy = useNavigation().state === "submitting";
  if (refusal) return <MessagePage title={refusal.title} message={refusal.message} />;
  if (actionData && "declined" in actionData) {
    return <MessagePage title="Invitation declined" message="Thank you for letting us know. The link no longer works." />;
  }
  const inv = invitation!;
  return (
    <div className="mx-auto flex max-w-xl flex-col gap-4">
      <h1 className="text-2xl font-bold">Invitation to {inv.studyCode}</h1>
      <p>
        <span className="font-semibold">{inv.labName}</span> is invited to take part in “{inv.studyTitle}” ({inv.testMethod})
        {inv.shipDate && <>, materials ship {formatDate(inv.shipDate)}</>}
        {inv.resultsDue && <>, results due {formatDate(inv.resultsDue)}</>}. This invitation is for {inv.email}.
      </p>
      {inv.joinsDirectory && <p>Accepting adds {inv.labName} to the Ringbatch lab directory, with you as its contact.</p>}
      <Card title="Accept">
        {inv.needsPassword ? (
          <NewAccountForm email={inv.email} actionData={actionData} busy={busy} />
        ) : inv.signedInAs === inv.email ? (
          <AcceptSignedInForm labName={inv.labName} actionData={actionData} busy={busy} />
        ) : (
          <p>
            An account with {inv.email} exists.{" "}
            <a href={inv.signInLink} className="font-semibold text-basalt-700 underline">
              Sign in as {inv.email}
            </a>{" "}
            to accept{inv.signedInAs && <> (you are signed in as {inv.signedInAs}; sign out first)</>}.
          </p>
        )}
      </Card>
      <DeclineForm actionData={actionData} busy={busy} />
    </div>
  );
}

type ActionData = Route.ComponentProps["actionData"];

function NewAccountForm({ email, actionData, busy }: { email: string; actionData: ActionData; busy: boolean }) {
  const [form, fields] = useSchemaForm(invitationAccountSchema, { reply: actionData, intent: "accept" });
  return (
    <Form method="post" className="flex flex-col gap-4" {...getFormProps(form)}>
      <input type="hidden" name="intent" value="accept" />
      <FormErrors errors={formWideErrors(form)} />
      <p>Set up your account: you will sign in with {email} and this password.</p>
      <Field label="Your name" autoComplete="name" {...fieldProps(fields.name)} />
      <Field label="New password" type="password" autoComplete="new-password" hint="At least 12 characters" {...fieldProps(fields.password)} />
      <Field label="Repeat the password" type="password" autoComplete="new-password" {...fieldProps(fields.confirm)} />
      <Button type="submit" disabled={busy}>
        Set password and accept
      </Button>
    </Form>
  );
}

function AcceptSignedInForm({ labName, actionData, busy }: { labName: string; actionData: ActionData; busy: boolean }) {
  const [form] = useSchemaForm(acceptInvitationSchema, { reply: actionData, intent: "accept" });
  return (
    <Form method="post" className="flex flex-col gap-2" {...getFormProps(form)}>
      <input type="hidden" name="intent" value="accept" />
      <FormErrors errors={formWideErrors(form)} />
      <div>
        <Button type="submit" disabled={busy}>
          Accept for {labName}
        </Button>
      </div>
    </Form>
  );
}

function DeclineForm({ actionData, busy }: { actionData: ActionData; busy: boolean }) {
  const [form] = useSchemaForm(declineInvitationSchema, { reply: actionData, intent: "decline" });
  return (
    <Card title="Decline">
      <Form method="post" className="flex flex-col gap-2" {...getFormProps(form)}>
        <input type="hidden" name="intent" value="decline" />
        <FormErrors errors={formWideErrors(form)} />
        <p>If your lab cannot take part, decline so the coordinator can invite another lab.</p>
        <div>
          <Button type="submit" variant="secondary" disabled={busy}>
            Decline the invitation
          </Button>
        </div>
      </Form>
    </Card>
  );
}
