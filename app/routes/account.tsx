import { getFormProps } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect } from "react-router";
import type { Route } from "./+types/account";
import { fieldProps, FormErrors, formWideErrors, PostForm, useSchemaForm } from "~/components/forms";
import { Button, Card, Field, Notice, PageHeader, SelectField, SimpleTable } from "~/components/ui";
import {
  accountSchema,
  colleagueSchema,
  noticePreferencesSchema,
  passwordChangeSchema,
  profileSchema,
  removeColleagueSchema,
  revokeTokenSchema,
  signOutEverywhereSchema,
  tokenSchema,
} from "~/lib/account-forms";
import { FieldRefusal } from "~/lib/field-refusal";
import { formatDateTime } from "~/lib/format";
import { db } from "~/db/client.server";
import { createApiToken, listApiTokens, revokeApiToken } from "~/models/api-token.server";
import { noticePreferencesOf, saveNoticePreferences } from "~/models/notices.server";
import { listColleagues, removeColleague } from "~/models/lab.server";
import { listCoordinatedStudies, listLabEnrollments, listReviewedStudies } from "~/models/study.server";
import { changePassword, updateName } from "~/models/user.server";
import { inviteColleague } from "~/models/password-link.server";
import { recordAudit } from "~/server/audit.server";
import { withRefusals } from "~/server/form-reply.server";
import { requireLabMember, requireUser } from "~/server/guards.server";
import { endAllSessions, sessionStorage } from "~/server/session.server";
import { redirectWithToast } from "~/server/toast.server";

export const meta: Route.MetaFunction = () => [{ title: "Account · Ringbatch" }];

/** What the user's tokens may be made for: their lab's enrollments (write results) and the studies they see (read). */
async function tokenTargets(user: Awaited<ReturnType<typeof requireUser>>) {
  const coordinates = user.roles.includes("admin") || user.roles.includes("coordinator");
  const [labStudies, reviewed, coordinated] = await Promise.all([
    listLabEnrollments(user.labIds),
    user.roles.includes("reviewer") ? listReviewedStudies(user.id) : Promise.resolve([]),
    coordinates ? listCoordinatedStudies(user, "any") : Promise.resolve([]),
  ]);
  const targets = [
    ...labStudies.map((e) => ({ value: `enrollment:${e.enrollmentId}`, label: `Write results: ${e.studyCode} (${e.labName})` })),
    ...labStudies.map((e) => ({ value: `study:${e.studyId}`, label: `Read: ${e.studyCode}` })),
    ...[...reviewed, ...coordinated].map((s) => ({ value: `study:${s.id}`, label: `Read: ${s.code}` })),
  ];
  // Someone with several roles may reach one study two ways; offer it once.
  return targets.filter((t, i) => targets.findIndex((other) => other.value === t.value) === i);
}

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const contactLabs = await Promise.all(user.contactLabIds.map(async (labId) => ({ labId, colleagues: await listColleagues(labId) })));
  const [tokens, targets, notices] = await Promise.all([listApiTokens(user.id), tokenTargets(user), noticePreferencesOf(db, user.id)]);
  return { user, contactLabs, tokens, targets, notices };
}

// Passwords are never sent back into the page, not even after a refusal.
const PASSWORD_FIELDS = ["currentPassword", "newPassword", "confirmPassword"];

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request);
  const submission = parseWithZod(await request.formData(), { schema: accountSchema });
  if (submission.status !== "success") {
    const hideFields = submission.payload.intent === "password" ? PASSWORD_FIELDS : [];
    return data({ result: submission.reply({ hideFields }) }, { status: 400 });
  }
  const input = submission.value;
  switch (input.intent) {
    case "profile":
      await updateName(user.id, input.name);
      return redirectWithToast("/account", "Your name is saved.");
    case "password": {
      try {
        await changePassword(user.id, input.currentPassword, input.newPassword);
      } catch (error) {
        if (!(error instanceof FieldRefusal)) throw error;
        return data({ result: submission.reply({ hideFields: PASSWORD_FIELDS, fieldErrors: { [error.field]: [error.message] } }) }, { status: 400 });
      }
      await recordAudit({ actorUserId: user.id, action: "password_changed", entityType: "user", entityId: user.id });
      return signOutEverywhere(request, user.id);
    }
    case "sign-out-everywhere":
      return signOutEverywhere(request, user.id);
    case "add-colleague": {
      await requireLabMember(request, input.labId, { contact: true });
      const added = await withRefusals(submission, () => inviteColleague(input.labId, input, user, request));
      if (!added.ok) return added.reply;
      return redirectWithToast("/account", `${input.name} is now an analyst of your lab and gets an e-mail with a link to set a password.`);
    }
    case "remove-colleague": {
      await requireLabMember(request, input.labId, { contact: true });
      const removed = await withRefusals(submission, () => removeColleague(input.labId, input.userId, user.id));
      if (!removed.ok) return removed.reply;
      return redirectWithToast("/account", "Colleague removed from your lab.");
    }
    case "create-token": {
      const [kind, id] = input.target.split(":");
      const created = await withRefusals(submission, () =>
        createApiToken(user, {
          name: input.tokenName,
          scope: kind === "enrollment" ? "results:write" : "study:read",
          enrollmentId: kind === "enrollment" ? Number(id) : null,
          studyId: kind === "study" ? Number(id) : null,
        }),
      );
      if (!created.ok) return created.reply;
      // The token itself is shown once, on this answer only: it never goes into a cookie or the log.
      return { result: submission.reply({ resetForm: true }), token: created.value.token };
    }
    case "revoke-token":
      await revokeApiToken(user.id, input.tokenId);
      return redirectWithToast("/account", "Token revoked: it no longer works.");
    case "notices": {
      const { intent: _, ...preferences } = input;
      await saveNoticePreferences(db, user.id, preferences);
      return redirectWithToast("/account", "Your e-mail notices are saved.");
    }
  }
}

async function signOutEverywhere(request: Request, userId: number) {
  await endAllSessions(userId);
  const session = await sessionStorage.getSession(request.headers.get("Cookie"));
  return redirect("/login", { headers: { "Set-Cookie": await sessionStorage.destroySession(session) } });
}

type ActionData = Route.ComponentProps["actionData"];

export default function Account({ loaderData, actionData }: Route.ComponentProps) {
  const { user, contactLabs, tokens, targets, notices } = loaderData;
  const newToken = actionData && "token" in actionData ? actionData.token : null;
  const [profileForm, profileFields] = useSchemaForm(profileSchema, { reply: actionData, intent: "profile", defaultValue: { name: user.name } });
  const [passwordForm, passwordFields] = useSchemaForm(passwordChangeSchema, { reply: actionData, intent: "password" });
  const [signOutForm] = useSchemaForm(signOutEverywhereSchema, { reply: actionData, intent: "sign-out-everywhere" });
  const [tokenForm, tokenFields] = useSchemaForm(tokenSchema, { reply: actionData, intent: "create-token" });
  const [noticesForm, noticesFields] = useSchemaForm(noticePreferencesSchema, { reply: actionData, intent: "notices" });
  return (
    <>
      <PageHeader title="Your account" subtitle={user.email} />
      <div className="grid gap-6 md:grid-cols-2">
        <Card title="Name">
          <PostForm form={profileForm} submitLabel="Save name" hidden={{ intent: "profile" }}>
            <Field label="Name" {...fieldProps(profileFields.name)} />
          </PostForm>
        </Card>
        <Card title="Password">
          <PostForm form={passwordForm} submitLabel="Change password" hidden={{ intent: "password" }}>
            <Field label="Current password" type="password" autoComplete="current-password" {...fieldProps(passwordFields.currentPassword)} />
            <Field
              label="New password"
              type="password"
              autoComplete="new-password"
              hint="At least 12 characters. You will sign in again afterwards, and your API tokens stop working."
              {...fieldProps(passwordFields.newPassword)}
            />
            <Field label="New password again" type="password" autoComplete="new-password" {...fieldProps(passwordFields.confirmPassword)} />
          </PostForm>
        </Card>
        <Card title="E-mail notices">
          <PostForm form={noticesForm} submitLabel="Save notices" submitVariant="secondary" hidden={{ intent: "notices" }} className="flex flex-col gap-3">
            <label className="flex items-start gap-2">
              <input type="checkbox" name={noticesFields.resultReminders.name} defaultChecked={notices.resultReminders} className="mt-1 h-5 w-5" />
              <span>Reminders to my lab a week before results are due, and when they are overdue</span>
            </label>
            <label className="flex items-start gap-2">
              <input type="checkbox" name={noticesFields.enrollmentAnswers.name} defaultChecked={notices.enrollmentAnswers} className="mt-1 h-5 w-5" />
              <span>A note when a lab accepts or declines an invitation to a study I coordinate</span>
            </label>
            <p className="text-sm text-basalt-700">Notices of a damaged or lost shipment always go to the study's coordinators.</p>
          </PostForm>
        </Card>
        <Card title="Sessions">
          <p className="mb-4">Signed in on another device you no longer use? End every session, this one included; your API tokens are revoked too.</p>
          <PostForm form={signOutForm} submitLabel="Sign out of every session and revoke all API tokens" submitVariant="secondary" hidden={{ intent: "sign-out-everywhere" }} />
        </Card>
      </div>
      <Card title="API tokens" className="mt-6">
        <p className="mb-4">
          Scripts and lab information systems use a token instead of your password. A token acts as you, for one
          study only: it either writes your lab's draft results or reads the study.{" "}
          <Link to="/account/api" className="font-semibold text-basalt-700 underline">
            Using the API
          </Link>{" "}
          shows the calls with your own studies filled in.
        </p>
        {newToken && (
          <div className="mb-4">
            <Notice tone="success">Token created. Copy it now: it is shown only once.</Notice>
            <label htmlFor="new-token" className="mt-2 block font-semibold">New token</label>
            <input id="new-token" readOnly value={newToken} className="w-full rounded-md border border-basalt-200 bg-basalt-50 px-3 py-2 font-mono text-sm" />
          </div>
        )}
        {tokens.length > 0 && (
          <SimpleTable
            caption="Your API tokens"
            headers={["Name", "Scope", "Study", "Last used", ""]}
            rows={tokens.map((t) => [
              t.name,
              t.scope,
              t.studyCode ?? "—",
              t.revokedAt ? "Revoked" : t.lastUsedAt ? formatDateTime(t.lastUsedAt) : "Never",
              t.revokedAt ? null : <RevokeTokenForm key="revoke" token={t} actionData={actionData} />,
            ])}
          />
        )}
        {targets.length > 0 ? (
          <PostForm form={tokenForm} submitLabel="Create token" hidden={{ intent: "create-token" }} className="mt-4 grid gap-4 md:grid-cols-3" submitClassName="self-end">
            <Field label="Token name" hint="Say where it is used, e.g. the lab system's name." {...fieldProps(tokenFields.tokenName)} />
            <SelectField label="May reach" options={targets} {...fieldProps(tokenFields.target)} />
          </PostForm>
        ) : (
          <p>There is no study yet that a token of yours could reach.</p>
        )}
      </Card>
      {contactLabs.map(({ labId, colleagues }) => (
        <ColleaguesCard key={labId} labId={labId} colleagues={colleagues} actionData={actionData} />
      ))}
    </>
  );
}

/** The reply, if it answers the form that posted these values. */
function replyFor(actionData: ActionData, values: Record<string, string>) {
  const initial = actionData && "result" in actionData ? actionData.result?.initialValue : undefined;
  return initial && Object.entries(values).every(([name, value]) => initial[name] === value) ? actionData : undefined;
}

function RevokeTokenForm({ token, actionData }: { token: { id: number; name: string }; actionData: ActionData }) {
  const [form] = useSchemaForm(revokeTokenSchema, {
    reply: replyFor(actionData, { intent: "revoke-token", tokenId: String(token.id) }),
    id: `revoke-token-${token.id}`,
  });
  return (
    <Form method="post" {...getFormProps(form)}>
      <input type="hidden" name="intent" value="revoke-token" />
      <input type="hidden" name="tokenId" value={token.id} />
      <FormErrors errors={formWideErrors(form)} />
      <Button type="submit" variant="secondary" aria-label={`Revoke token ${token.name}`}>Revoke</Button>
    </Form>
  );
}

function RemoveColleagueForm({ labId, colleague, actionData }: { labId: number; colleague: { id: number; name: string }; actionData: ActionData }) {
  const [form] = useSchemaForm(removeColleagueSchema, {
    reply: replyFor(actionData, { intent: "remove-colleague", labId: String(labId), userId: String(colleague.id) }),
    id: `remove-colleague-${labId}-${colleague.id}`,
  });
  return (
    <Form method="post" {...getFormProps(form)}>
      <input type="hidden" name="intent" value="remove-colleague" />
      <input type="hidden" name="labId" value={labId} />
      <input type="hidden" name="userId" value={colleague.id} />
      <FormErrors errors={formWideErrors(form)} />
      <Button type="submit" variant="secondary" aria-label={`Remove ${colleague.name}`}>Remove</Button>
    </Form>
  );
}

function ColleaguesCard({
  labId,
  colleagues,
  actionData,
}: {
  labId: number;
  colleagues: Awaited<ReturnType<typeof listColleagues>>;
  actionData: ActionData;
}) {
  const [form, fields] = useSchemaForm(colleagueSchema, {
    reply: replyFor(actionData, { intent: "add-colleague", labId: String(labId) }),
    id: `add-colleague-${labId}`,
  });
  return (
    <Card title="Your lab's analysts" className="mt-6">
      <SimpleTable
        caption="Analysts of your lab"
        headers={["Name", "E-mail", "Role", ""]}
        rows={colleagues.map((c) => [
          c.name,
          c.email,
          c.isContact ? "Lab contact" : "Analyst",
          c.isContact ? null : <RemoveColleagueForm key="remove" labId={labId} colleague={c} actionData={actionData} />,
        ])}
      />
      <PostForm
        form={form}
        submitLabel="Add analyst and send the e-mail"
        hidden={{ intent: "add-colleague", labId }}
        className="mt-4 grid gap-4 md:grid-cols-2"
        submitClassName="md:col-span-2"
      >
        <Field label="Colleague's name" {...fieldProps(fields.name)} />
        <Field label="Colleague's e-mail" type="email" {...fieldProps(fields.email)} />
      </PostForm>
    </Card>
  );
}
