import { getFormProps } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, useNavigation } from "react-router";
import type { Route } from "./+types/users";
import { fieldProps, FormErrors, formWideErrors, useSchemaForm } from "~/components/forms";
import { Badge, Button, Card, Field, PageHeader, SelectField, SimpleTable } from "~/components/ui";
import { ROLES } from "~/db/values";
import { FieldRefusal } from "~/lib/field-refusal";
import { adminUserSchema, createUserSchema, disableUserSchema, updateUserSchema } from "~/lib/account-forms";
import { listLabs } from "~/models/lab.server";
import { createUser, listUsersWithLabs, setDisabled, setLabMembership, setRole } from "~/models/user.server";
import { recordAudit } from "~/server/audit.server";
import { requireRole } from "~/server/guards.server";
import { endAllSessions } from "~/server/session.server";
import { redirectWithToast } from "~/server/toast.server";

export const meta: Route.MetaFunction = () => [{ title: "Users · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  await requireRole(request, "admin");
  const [users, labs] = await Promise.all([listUsersWithLabs(), listLabs()]);
  return { users, labs: labs.map((l) => ({ id: l.id, name: l.name })) };
}

export async function action({ request }: Route.ActionArgs) {
  const admin = await requireRole(request, "admin");
  const submission = parseWithZod(await request.formData(), { schema: adminUserSchema });
  // A first password typed for someone else is never sent back into the page.
  const refusal = (fieldErrors?: Record<string, string[]>) => data({ result: submission.reply({ hideFields: ["password"], ...(fieldErrors && { fieldErrors }) }) }, { status: 400 });
  if (submission.status !== "success") return refusal();
  const input = submission.value;
  switch (input.intent) {
    case "create": {
      if (input.role === "analyst" && !input.labId) return refusal({ labId: ["An analyst belongs to a lab: choose one."] });
      let user: Awaited<ReturnType<typeof createUser>>;
      try {
        user = await createUser({ ...input, isContact: input.isContact === "on" });
      } catch (error) {
        if (error instanceof FieldRefusal) return refusal({ [error.field]: [error.message] });
        throw error;
      }
      await recordAudit({ actorUserId: admin.id, action: "user_created", entityType: "user", entityId: user.id, after: { email: user.email, role: user.role } });
      return redirectWithToast("/admin/users", `Account for ${user.email} created.`);
    }
    case "update": {
      const { intent: _intent, ...change } = input;
      await setRole(change.userId, change.role);
      await setLabMembership(change.userId, change.labId, change.isContact === "on");
      await recordAudit({ actorUserId: admin.id, action: "user_updated", entityType: "user", entityId: change.userId, after: change });
      return redirectWithToast("/admin/users", "Account updated.");
    }
    case "disable": {
      if (input.userId === admin.id) return refusal({ form: ["You cannot disable your own account."] });
      const disabled = input.disabled === "true";
      await setDisabled(input.userId, disabled);
      if (disabled) await endAllSessions(input.userId);
      await recordAudit({ actorUserId: admin.id, action: disabled ? "user_disabled" : "user_enabled", entityType: "user", entityId: input.userId });
      return redirectWithToast("/admin/users", disabled ? "Account disabled; its sessions have ended." : "Account enabled.");
    }
  }
}

const ROLE_OPTIONS = ROLES.map((r) => ({ value: r, label: r[0]!.toUpperCase() + r.slice(1) }));

type ActionData = Route.ComponentProps["actionData"];
type LabOption = { value: string; label: string };

/** The reply, if it answers the form of this account. */
function replyFor(actionData: ActionData, intent: string, userId: number) {
  const initial = actionData?.result?.initialValue;
  return initial?.intent === intent && initial.userId === String(userId) ? actionData : undefined;
}

export default function AdminUsers({ loaderData, actionData }: Route.ComponentProps) {
  const { users, labs } = loaderData;
  const busy = useNavigation().state === "submitting";
  const [form, fields] = useSchemaForm(createUserSchema, { reply: actionData, intent: "create", defaultValue: { role: "analyst" } });
  const labOptions: LabOption[] = [{ value: "", label: "No lab" }, ...labs.map((l) => ({ value: String(l.id), label: l.name }))];
  return (
    <>
      <PageHeader title="Users" subtitle="Accounts, roles and lab membership." />
      <Card title="New account" className="my-6">
        <Form method="post" className="grid gap-4 md:grid-cols-3" {...getFormProps(form)}>
          <input type="hidden" name="intent" value="create" />
          <FormErrors errors={formWideErrors(form)} />
          <Field label="E-mail" type="email" {...fieldProps(fields.email)} />
          <Field label="Name" {...fieldProps(fields.name)} />
          <SelectField label="Role" options={ROLE_OPTIONS} {...fieldProps(fields.role)} />
          <Field label="First password" type="password" autoComplete="new-password" hint="At least 12 characters." {...fieldProps(fields.password)} />
          <SelectField label="Lab" options={labOptions} {...fieldProps(fields.labId)} />
          <label className="flex items-center gap-2 self-end pb-3 font-semibold">
            <input type="checkbox" name={fields.isContact.name} className="h-5 w-5" defaultChecked={fields.isContact.initialValue === "on"} /> Lab contact
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
            <UpdateUserForm key="update" user={u} labOptions={labOptions} reply={replyFor(actionData, "update", u.id)} />,
            <DisableUserForm key="disable" user={u} reply={replyFor(actionData, "disable", u.id)} />,
          ])}
        />
      </Card>
    </>
  );
}

type UserRow = Route.ComponentProps["loaderData"]["users"][number];

function UpdateUserForm({ user, labOptions, reply }: { user: UserRow; labOptions: LabOption[]; reply: ActionData }) {
  const [form, fields] = useSchemaForm(updateUserSchema, {
    reply,
    id: `update-user-${user.id}`,
    defaultValue: { role: user.role, labId: user.labIds[0] ? String(user.labIds[0]) : "", isContact: user.isContact ? "on" : undefined },
  });
  return (
    <Form method="post" className="flex flex-wrap items-end gap-2" {...getFormProps(form)}>
      <input type="hidden" name="intent" value="update" />
      <input type="hidden" name="userId" value={user.id} />
      <FormErrors errors={formWideErrors(form)} />
      <CompactSelect label={`Role of ${user.email}`} id={`role-${user.id}`} name={fields.role.name} defaultValue={fields.role.initialValue as string} options={ROLE_OPTIONS} />
      <CompactSelect label={`Lab of ${user.email}`} id={`lab-${user.id}`} name={fields.labId.name} defaultValue={(fields.labId.initialValue as string) ?? ""} options={labOptions} />
      <label className="flex items-center gap-1">
        <input type="checkbox" name={fields.isContact.name} defaultChecked={fields.isContact.initialValue === "on"} className="h-5 w-5" /> Contact
      </label>
      <Button type="submit" variant="secondary" aria-label={`Save role and lab of ${user.email}`}>Save</Button>
    </Form>
  );
}

function DisableUserForm({ user, reply }: { user: UserRow; reply: ActionData }) {
  const [form] = useSchemaForm(disableUserSchema, { reply, id: `disable-user-${user.id}` });
  return (
    <Form method="post" className="flex flex-wrap items-center gap-2" {...getFormProps(form)}>
      <input type="hidden" name="intent" value="disable" />
      <input type="hidden" name="userId" value={user.id} />
      <input type="hidden" name="disabled" value={user.disabled ? "false" : "true"} />
      {user.disabled ? <Badge tone="signal">Disabled</Badge> : <Badge tone="leaf">Active</Badge>}
      <Button type="submit" variant="secondary" aria-label={`${user.disabled ? "Enable" : "Disable"} ${user.email}`}>
        {user.disabled ? "Enable" : "Disable"}
      </Button>
      <FormErrors errors={formWideErrors(form)} />
    </Form>
  );
}

/** A select inside a table row, its label read out but not shown. */
function CompactSelect({ label, id, name, defaultValue, options }: { label: string; id: string; name: string; defaultValue: string; options: LabOption[] }) {
  return (
    <>
      <label className="sr-only" htmlFor={id}>
        {label}
      </label>
      <select id={id} name={name} defaultValue={defaultValue} className="min-h-11 rounded-md border border-basalt-200 px-2">
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </>
  );
}
