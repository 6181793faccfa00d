import { data, Form, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/users";
import { Badge, Button, Card, Field, Notice, PageHeader, SelectField, SimpleTable } from "~/components/ui";
import { ROLES } from "~/db/values";
import { recordAudit } from "~/server/audit.server";
import { type FieldErrors, parseForm } from "~/lib/forms";
import { useSchemaCheck } from "~/lib/use-schema-check";
import { requireRole } from "~/server/guards.server";
import { endAllSessions } from "~/server/session.server";
import { emailField, idField, nameField, newPasswordField } from "~/lib/validation";
import { listLabs } from "~/models/lab.server";
import { AccountError, createUser, listUsersWithLabs, setDisabled, setLabMembership, setRole } from "~/models/user.server";

export const meta: Route.MetaFunction = () => [{ title: "Users · Ringbatch" }];

const labChoice = z.union([z.literal(""), idField]).transform((v) => (v === "" ? null : v));
const createSchema = z.object({
  email: emailField,
  name: nameField,
  role: z.enum(ROLES, { message: "Choose a role." }),
  password: newPasswordField,
  labId: labChoice,
  isContact: z.literal("on").optional(),
});
const updateSchema = z.object({
  userId: idField,
  role: z.enum(ROLES, { message: "Choose a role." }),
  labId: labChoice,
  isContact: z.literal("on").optional(),
});
const disableSchema = z.object({ userId: idField, disabled: z.enum(["true", "false"]) });

export async function loader({ request }: Route.LoaderArgs) {
  await requireRole(request, "admin");
  const [users, labs] = await Promise.all([listUsersWithLabs(), listLabs()]);
  return { users, labs: labs.map((l) => ({ id: l.id, name: l.name })) };
}

type ActionResult = { intent: string; errors?: FieldErrors; values?: Record<string, string>; done?: string };

export async function action({ request }: Route.ActionArgs) {
  const admin = await requireRole(request, "admin");
  const form = await request.formData();
  const intent = String(form.get("intent"));
  const fail = (errors: FieldErrors, values?: Record<string, string>) => data<ActionResult>({ intent, errors, values }, { status: 400 });
  if (intent === "create") {
    const parsed = parseForm(createSchema, form);
    if (!parsed.ok) return fail(parsed.errors, { ...parsed.values, password: "" });
    if (parsed.data.role === "analyst" && !parsed.data.labId) return fail({ labId: "An analyst belongs to a lab: choose one." }, { ...parsed.values, password: "" });
    try {
      const created = await createUser({ ...parsed.data, isContact: parsed.data.isContact === "on" });
      await recordAudit({ actorUserId: admin.id, action: "user_created", entityType: "user", entityId: created.id, after: { email: created.email, role: created.role } });
      return { intent, done: `Account for ${created.email} created.` } satisfies ActionResult;
    } catch (error) {
      if (error instanceof AccountError) return fail({ [error.field]: error.message }, { ...parsed.values, password: "" });
      throw error;
    }
  }
  if (intent === "update") {
    const parsed = parseForm(updateSchema, form);
    if (!parsed.ok) return fail(parsed.errors);
    await setRole(parsed.data.userId, parsed.data.role);
    await setLabMembership(parsed.data.userId, parsed.data.labId, parsed.data.isContact === "on");
    await recordAudit({ actorUserId: admin.id, action: "user_updated", entityType: "user", entityId: parsed.data.userId, after: parsed.data });
    return { intent, done: "Account updated." } satisfies ActionResult;
  }
  if (intent === "disable") {
    const parsed = parseForm(disableSchema, form);
    if (!parsed.ok) return fail(parsed.errors);
    if (parsed.data.userId === admin.id) return fail({ form: "You cannot disable your own account." });
    const disabled = parsed.data.disabled === "true";
    await setDisabled(parsed.data.userId, disabled);
    if (disabled) await endAllSessions(parsed.data.userId);
    await recordAudit({ actorUserId: admin.id, action: disabled ? "user_disabled" : "user_enabled", entityType: "user", entityId: parsed.data.userId });
    return { intent, done: disabled ? "Account disabled; its sessions have ended." : "Account enabled." } satisfies ActionResult;
  }
  return fail({ form: "Unknown action." });
}

const ROLE_OPTIONS = ROLES.map((r) => ({ value: r, label: r[0]!.toUpperCase() + r.slice(1) }));

export default function AdminUsers({ loaderData, actionData }: Route.ComponentProps) {
  const { users, labs } = loaderData;
  const result = actionData as ActionResult | undefined;
  const busy = useNavigation().state === "submitting";
  const { errors: createErrors, onSubmit: checkCreate } = useSchemaCheck(createSchema, result?.intent === "create" ? (result.errors ?? {}) : {});
  const createValues = result?.intent === "create" ? (result.values ?? {}) : {};
  const labOptions = [{ value: "", label: "No lab" }, ...labs.map((l) => ({ value: String(l.id), label: l.name }))];
  return (
    <>
      <PageHeader title="Users" subtitle="Accounts, roles and lab membership." />
      {result?.done && <Notice tone="success">{result.done}</Notice>}
      {result?.errors?.form && <Notice tone="error">{result.errors.form}</Notice>}
      <Card title="New account" className="my-6">
        <Form method="post" className="grid gap-4 md:grid-cols-3" onSubmit={checkCreate} noValidate>
          <input type="hidden" name="intent" value="create" />
          <Field label="E-mail" name="email" type="email" defaultValue={createValues.email} error={createErrors.email} required />
          <Field label="Name" name="name" defaultValue={createValues.name} error={createErrors.name} required />
          <SelectField label="Role" name="role" options={ROLE_OPTIONS} defaultValue={createValues.role ?? "analyst"} error={createErrors.role} />
          <Field label="First password" name="password" type="password" autoComplete="new-password" hint="At least 12 characters." error={createErrors.password} required />
          <SelectField label="Lab" name="labId" options={labOptions} defaultValue={createValues.labId ?? ""} error={createErrors.labId} />
          <label className="flex items-center gap-2 self-end pb-3 font-semibold">
            <input type="checkbox" name="isContact" className="h-5 w-5" defaultChecked={createValues.isContact === "on"} /> Lab contact
          </label>
          <div className="md:col-span-3">
            <Button type="submit" disabled={busy}>Create account</Button>
          </div>
        </Form>
      </Card>
      <Card title="Accounts">
        <SimpleTable
          caption="All accounts"
          headers={["Name", "E-mail", "Role and lab", "Status"]}
          rows={users.map((u) => [
            u.name,
            u.email,
            <Form method="post" key="update" className="flex flex-wrap items-end gap-2">
              <input type="hidden" name="intent" value="update" />
              <input type="hidden" name="userId" value={u.id} />
              <label className="sr-only" htmlFor={`role-${u.id}`}>Role of {u.email}</label>
              <select id={`role-${u.id}`} name="role" defaultValue={u.role} className="min-h-11 rounded-md border border-basalt-200 px-2">
                {ROLE_OPTIONS.map((o) => <option key={o.value} value={o.value}>{o.label}</option>)}
              </select>
              <label className="sr-only" htmlFor={`lab-${u.id}`}>Lab of {u.email}</label>
              <select id={`lab-${u.id}`} name="labId" defaultValue={u.labIds[0] ? String(u.labIds[0]) : ""} className="min-h-11 rounded-md border border-basalt-200 px-2">
                {labOptions.map((o) => <option key={o.value} value={o.value}>{o.label}</option>)}
              </select>
              <label className="flex items-center gap-1">
                <input type="checkbox" name="isContact" defaultChecked={u.isContact} className="h-5 w-5" /> Contact
              </label>
              <Button type="submit" variant="secondary" aria-label={`Save role and lab of ${u.email}`}>Save</Button>
            </Form>,
            <Form method="post" key="disable" className="flex items-center gap-2">
              <input type="hidden" name="intent" value="disable" />
              <input type="hidden" name="userId" value={u.id} />
              <input type="hidden" name="disabled" value={u.disabled ? "false" : "true"} />
              {u.disabled ? <Badge tone="signal">Disabled</Badge> : <Badge tone="leaf">Active</Badge>}
              <Button type="submit" variant="secondary" aria-label={`${u.disabled ? "Enable" : "Disable"} ${u.email}`}>
                {u.disabled ? "Enable" : "Disable"}
              </Button>
            </Form>,
          ])}
        />
      </Card>
    </>
  );
}
