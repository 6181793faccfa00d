import { data, Form, redirect, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/account";
import { Button, Card, Field, Notice, PageHeader, SelectField, SimpleTable } from "~/components/ui";
import { recordAudit } from "~/server/audit.server";
import { type FieldErrors, parseForm } from "~/lib/forms";
import { useSchemaCheck } from "~/lib/use-schema-check";
import { requireLabMember, requireUser } from "~/server/guards.server";
import { endAllSessions, sessionStorage } from "~/server/session.server";
import { emailField, idField, nameField, newPasswordField } from "~/lib/validation";
import { createApiToken, listApiTokens, revokeApiToken } from "~/models/api-token.server";
import { listColleagues, removeColleague } from "~/models/lab.server";
import { listCoordinatedStudies, listLabEnrollments, listReviewedStudies } from "~/models/study.server";
import { AccountError, changePassword, updateName } from "~/models/user.server";
import { inviteColleague } from "~/models/welcome.server";

export const meta: Route.MetaFunction = () => [{ title: "Account · Ringbatch" }];

const profileSchema = z.object({ name: nameField });
const passwordSchema = z
  .object({ currentPassword: z.string().min(1, { message: "Enter your current password." }), newPassword: newPasswordField, confirmPassword: z.string() })
  .refine((v) => v.newPassword === v.confirmPassword, { path: ["confirmPassword"], message: "The two new passwords differ." });
const colleagueSchema = z.object({ labId: idField, email: emailField, name: nameField });
const removeSchema = z.object({ labId: idField, userId: idField });
// The target is "enrollment:<id>" for results:write or "study:<id>" for study:read.
const tokenSchema = z.object({
  tokenName: nameField,
  target: z.string().regex(/^(enrollment|study):\d+$/, { message: "Choose what the token may reach." }),
});
const revokeSchema = z.object({ tokenId: idField });

/** What the user's tokens may be made for: their lab's enrollments (write results) and the studies they see (read). */
async function tokenTargets(user: Awaited<ReturnType<typeof requireUser>>) {
  const [labStudies, studies] = await Promise.all([
    listLabEnrollments(user.labIds),
    user.role === "reviewer" ? listReviewedStudies(user.id) : user.role === "analyst" ? Promise.resolve([]) : listCoordinatedStudies(user),
  ]);
  return [
    ...labStudies.map((e) => ({ value: `enrollment:${e.enrollmentId}`, label: `Write results: ${e.studyCode} (${e.labName})` })),
    ...labStudies.map((e) => ({ value: `study:${e.studyId}`, label: `Read: ${e.studyCode}` })),
    ...studies.map((s) => ({ value: `study:${s.id}`, label: `Read: ${s.code}` })),
  ];
}

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const contactLabs = await Promise.all(user.contactLabIds.map(async (labId) => ({ labId, colleagues: await listColleagues(labId) })));
  const [tokens, targets] = await Promise.all([listApiTokens(user.id), tokenTargets(user)]);
  return { user, contactLabs, tokens, targets };
}

type ActionResult = { intent: string; errors?: FieldErrors; values?: Record<string, string>; done?: string; token?: string };

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request);
  const form = await request.formData();
  const intent = String(form.get("intent"));
  const fail = (errors: FieldErrors, values?: Record<string, string>) =>
    data<ActionResult>({ intent, errors, values }, { status: 400 });
  try {
    switch (intent) {
      case "profile": {
        const parsed = parseForm(profileSchema, form);
        if (!parsed.ok) return fail(parsed.errors, parsed.values);
        await updateName(user.id, parsed.data.name);
        return { intent, done: "Your name is saved." } satisfies ActionResult;
      }
      case "password": {
        const parsed = parseForm(passwordSchema, form);
        if (!parsed.ok) return fail(parsed.errors);
        await changePassword(user.id, parsed.data.currentPassword, parsed.data.newPassword);
        await recordAudit({ actorUserId: user.id, action: "password_changed", entityType: "user", entityId: user.id });
        return signOutEverywhere(request, user.id);
      }
      case "sign-out-everywhere":
        return signOutEverywhere(request, user.id);
      case "add-colleague": {
        const parsed = parseForm(colleagueSchema, form);
        if (!parsed.ok) return fail(parsed.errors, parsed.values);
        await requireLabMember(request, parsed.data.labId, { contact: true });
        await inviteColleague(parsed.data.labId, parsed.data, user, request);
        return { intent, done: `${parsed.data.name} is now an analyst of your lab and gets an e-mail with a link to set a password.` } satisfies ActionResult;
      }
      case "remove-colleague": {
        const parsed = parseForm(removeSchema, form);
        if (!parsed.ok) return fail(parsed.errors);
        await requireLabMember(request, parsed.data.labId, { contact: true });
        await removeColleague(parsed.data.labId, parsed.data.userId, user.id);
        return { intent, done: "Colleague removed from your lab." } satisfies ActionResult;
      }
      case "create-token": {
        const parsed = parseForm(tokenSchema, form);
        if (!parsed.ok) return fail(parsed.errors, parsed.values);
        const [kind, id] = parsed.data.target.split(":");
        const { token } = await createApiToken(user, {
          name: parsed.data.tokenName,
          scope: kind === "enrollment" ? "results:write" : "study:read",
          enrollmentId: kind === "enrollment" ? Number(id) : null,
          studyId: kind === "study" ? Number(id) : null,
        });
        return { intent, token, done: "Token created. Copy it now: it is shown only once." } satisfies ActionResult;
      }
      case "revoke-token": {
        const parsed = parseForm(revokeSchema, form);
        if (!parsed.ok) return fail(parsed.errors);
        await revokeApiToken(user.id, parsed.data.tokenId);
        return { intent, done: "Token revoked: it no longer works." } satisfies ActionResult;
      }
      default:
        return fail({ form: "Unknown action." });
    }
  } catch (error) {
    if (error instanceof AccountError) return fail({ [error.field]: error.message }, Object.fromEntries([...form].filter(([k]) => !k.toLowerCase().includes("password")).map(([k, v]) => [k, String(v)])));
    throw error;
  }
}

async function signOutEverywhere(request: Request, userId: number) {
  await endAllSessions(userId);
  const session = await sessionStorage.getSession(request.headers.get("Cookie"));
  return redirect("/login", { headers: { "Set-Cookie": await sessionStorage.destroySession(session) } });
}

export default function Account({ loaderData, actionData }: Route.ComponentProps) {
  const { user, contactLabs, tokens, targets } = loaderData;
  const navigation = useNavigation();
  const busy = navigation.state === "submitting";
  const result = actionData as ActionResult | undefined;
  const errorsFor = (intent: string) => (result?.intent === intent ? (result.errors ?? {}) : {});
  const valuesFor = (intent: string) => (result?.intent === intent ? (result.values ?? {}) : {});
  // The same schemas as the action, checked before posting.
  const profileCheck = useSchemaCheck(profileSchema, errorsFor("profile"));
  const passwordCheck = useSchemaCheck(passwordSchema, errorsFor("password"));
  const tokenCheck = useSchemaCheck(tokenSchema, errorsFor("create-token"));
  const colleagueCheck = useSchemaCheck(colleagueSchema, errorsFor("add-colleague"));
  return (
    <>
      <PageHeader title="Your account" subtitle={user.email} />
      <div className="grid gap-6 md:grid-cols-2">
        <Card title="Name">
          <Form method="post" className="flex flex-col gap-4" onSubmit={profileCheck.onSubmit} noValidate>
            <input type="hidden" name="intent" value="profile" />
            {result?.intent === "profile" && result.done && <Notice tone="success">{result.done}</Notice>}
            <Field label="Name" name="name" defaultValue={valuesFor("profile").name ?? user.name} error={profileCheck.errors.name} required />
            <Button type="submit" disabled={busy}>Save name</Button>
          </Form>
        </Card>
        <Card title="Password">
          <Form method="post" className="flex flex-col gap-4" onSubmit={passwordCheck.onSubmit} noValidate>
            <input type="hidden" name="intent" value="password" />
            <Field label="Current password" name="currentPassword" type="password" autoComplete="current-password" error={passwordCheck.errors.currentPassword} required />
            <Field label="New password" name="newPassword" type="password" autoComplete="new-password" hint="At least 12 characters. You will sign in again afterwards, and your API tokens stop working." error={passwordCheck.errors.newPassword} required />
            <Field label="New password again" name="confirmPassword" type="password" autoComplete="new-password" error={passwordCheck.errors.confirmPassword} required />
            <Button type="submit" disabled={busy}>Change password</Button>
          </Form>
        </Card>
        <Card title="Sessions">
          <p className="mb-4">Signed in on another device you no longer use? End every session, this one included; your API tokens are revoked too.</p>
          <Form method="post">
            <input type="hidden" name="intent" value="sign-out-everywhere" />
            <Button type="submit" variant="secondary" disabled={busy}>Sign out of every session and revoke all API tokens</Button>
          </Form>
        </Card>
      </div>
      <Card title="API tokens" className="mt-6">
        <p className="mb-4">
          Scripts and lab information systems use a token instead of your password. A token acts as you, for one
          study only: it either writes your lab's draft results or reads the study. See the API section of the README.
        </p>
        {result?.intent === "create-token" && result.token && (
          <div className="mb-4">
            <Notice tone="success">{result.done}</Notice>
            <label htmlFor="new-token" className="mt-2 block font-semibold">New token</label>
            <input id="new-token" readOnly value={result.token} className="w-full rounded-md border border-basalt-200 bg-basalt-50 px-3 py-2 font-mono text-sm" />
          </div>
        )}
        {result?.intent === "revoke-token" && result.done && <Notice tone="success">{result.done}</Notice>}
        {tokens.length > 0 && (
          <SimpleTable
            caption="Your API tokens"
            headers={["Name", "Scope", "Study", "Last used", ""]}
            rows={tokens.map((t) => [
              t.name,
              t.scope,
              t.studyCode ?? "—",
              t.revokedAt ? "Revoked" : t.lastUsedAt ? new Date(t.lastUsedAt).toISOString().slice(0, 16).replace("T", " ") : "Never",
              t.revokedAt ? null : (
                <Form method="post" key="revoke">
                  <input type="hidden" name="intent" value="revoke-token" />
                  <input type="hidden" name="tokenId" value={t.id} />
                  <Button type="submit" variant="secondary" aria-label={`Revoke token ${t.name}`}>Revoke</Button>
                </Form>
              ),
            ])}
          />
        )}
        {targets.length > 0 ? (
          // A new key after each created token empties the form for the next one.
          <Form method="post" className="mt-4 grid gap-4 md:grid-cols-3" key={result?.token ?? "token-form"} onSubmit={tokenCheck.onSubmit} noValidate>
            <input type="hidden" name="intent" value="create-token" />
            <Field label="Token name" name="tokenName" hint="Say where it is used, e.g. the lab system's name." defaultValue={valuesFor("create-token").tokenName} error={tokenCheck.errors.tokenName} required />
            <SelectField label="May reach" name="target" options={targets} defaultValue={valuesFor("create-token").target} error={tokenCheck.errors.target} />
            <div className="self-end">
              <Button type="submit" disabled={busy}>Create token</Button>
            </div>
          </Form>
        ) : (
          <p>There is no study yet that a token of yours could reach.</p>
        )}
      </Card>
      {contactLabs.map(({ labId, colleagues }) => (
        <Card key={labId} title="Your lab's analysts" className="mt-6">
          {result?.intent?.endsWith("colleague") && result.done && <Notice tone="success">{result.done}</Notice>}
          {errorsFor("remove-colleague").colleague && <Notice tone="error">{errorsFor("remove-colleague").colleague}</Notice>}
          <SimpleTable
            caption="Analysts of your lab"
            headers={["Name", "E-mail", "Role", ""]}
            rows={colleagues.map((c) => [
              c.name,
              c.email,
              c.isContact ? "Lab contact" : "Analyst",
              c.isContact ? null : (
                <Form method="post" key="remove">
                  <input type="hidden" name="intent" value="remove-colleague" />
                  <input type="hidden" name="labId" value={labId} />
                  <input type="hidden" name="userId" value={c.id} />
                  <Button type="submit" variant="secondary" aria-label={`Remove ${c.name}`}>Remove</Button>
                </Form>
              ),
            ])}
          />
          <Form method="post" className="mt-4 grid gap-4 md:grid-cols-2" onSubmit={colleagueCheck.onSubmit} noValidate>
            <input type="hidden" name="intent" value="add-colleague" />
            <input type="hidden" name="labId" value={labId} />
            <Field label="Colleague's name" name="name" defaultValue={valuesFor("add-colleague").name} error={colleagueCheck.errors.name} required />
            <Field label="Colleague's e-mail" name="email" type="email" defaultValue={valuesFor("add-colleague").email} error={colleagueCheck.errors.email} required />
            <div className="md:col-span-2">
              <Button type="submit" disabled={busy}>Add analyst and send the e-mail</Button>
            </div>
          </Form>
        </Card>
      ))}
    </>
  );
}
