import { data, Form, redirect, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/invite";
import { Button, Card, Field, MessagePage, Notice } from "~/components/ui";
import { redirectSignedIn } from "~/server/auth.server";
import { type ActionResult, formState, handleForm, refused } from "~/lib/form-results";
import { getUser } from "~/server/guards.server";
import { clientAddress, isLimited, LINK_MISSES, recordHit } from "~/server/rate-limit.server";
import { nameField, newPasswordField } from "~/lib/validation";
import { acceptInvitation, declineInvitation, type InvitationLookup, lookupInvitation } from "~/models/invitation.server";

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
      labName: found.lab.name,
      email: found.invitation.email,
      needsPassword: !found.account?.hasPassword,
      signedInAs: user?.email ?? null,
      signInLink: `/login?redirectTo=${encodeURIComponent(new URL(request.url).pathname + new URL(request.url).search)}`,
    },
  };
}

const newAccountSchema = z
  .object({ name: nameField, password: newPasswordField, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ." });

export async function action({ request, params }: Route.ActionArgs) {
  const found = await lookup(request, params.token);
  if (found.status !== "valid") return refused("accept", { form: REFUSAL[found.status].title }, {}, REFUSAL[found.status].status);
  const user = await getUser(request);
  const form = await request.formData();
  if (form.get("intent") === "decline") {
    await declineInvitation(found, user?.id ?? null);
    return { intent: "decline", done: "You declined the invitation. The coordinator sees this on the study's lab page." } satisfies ActionResult;
  }
  if (found.account?.hasPassword) {
    if (user?.id !== found.account.id) return refused("accept", { form: `Sign in as ${found.invitation.email} to accept.` }, {}, 403);
    await acceptInvitation(found, { signedIn: user });
    return redirect("/lab");
  }
  return handleForm("accept", newAccountSchema, form, async ({ name, password }) => {
    const { userId } = await acceptInvitation(found, { name, password });
    return redirectSignedIn(userId, "/lab");
  });
}

export default function Invitation({ loaderData, actionData }: Route.ComponentProps) {
  const { refusal, invitation } = loaderData;
  const result = actionData as ActionResult | undefined;
  const accept = formState(result, "accept");
  const busy = useNavigation().state === "submitting";
  if (refusal) return <MessagePage title={refusal.title} message={refusal.message} />;
  if (result?.intent === "decline" && result.done) {
    return <MessagePage title="Invitation declined" message="Thank you for letting us know. The link no longer works." />;
  }
  const inv = invitation!;
  return (
    <div className="mx-auto flex max-w-xl flex-col gap-4">
      <h1 className="text-2xl font-bold">Invitation to {inv.studyCode}</h1>
      <p>
        <span className="font-semibold">{inv.labName}</span> is invited to take part in “{inv.studyTitle}” ({inv.testMethod})
        {inv.resultsDue && <>, results due {inv.resultsDue}</>}. This invitation is for {inv.email}.
      </p>
      {accept.errors.form && <Notice tone="error">{accept.errors.form}</Notice>}
      <Card title="Accept">
        {inv.needsPassword ? (
          <Form method="post" className="flex flex-col gap-4">
            <input type="hidden" name="intent" value="accept" />
            <p>Set up your account: you will sign in with {inv.email} and this password.</p>
            <Field label="Your name" name="name" autoComplete="name" defaultValue={accept.values.name} error={accept.errors.name} required />
            <Field label="New password" name="password" type="password" autoComplete="new-password" hint="At least 12 characters" error={accept.errors.password} required />
            <Field label="Repeat the password" name="confirm" type="password" autoComplete="new-password" error={accept.errors.confirm} required />
            <Button type="submit" disabled={busy}>
              Set password and accept
            </Button>
          </Form>
        ) : inv.signedInAs === inv.email ? (
          <Form method="post">
            <input type="hidden" name="intent" value="accept" />
            <Button type="submit" disabled={busy}>
              Accept for {inv.labName}
            </Button>
          </Form>
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
      <Card title="Decline">
        <Form method="post" className="flex flex-col gap-2">
          <input type="hidden" name="intent" value="decline" />
          <p>If your lab cannot take part, decline so the coordinator can invite another lab.</p>
          <div>
            <Button type="submit" variant="secondary" disabled={busy}>
              Decline the invitation
            </Button>
          </div>
        </Form>
      </Card>
    </div>
  );
}
