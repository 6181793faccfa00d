import { type FieldMetadata, getFormProps } from "@conform-to/react";
import { Form, Link, useNavigation } from "react-router";
import type { z } from "zod";
import type { Route } from "./+types/users";
import { fieldProps, FormErrors, formWideErrors, replyAbout, useSchemaForm } from "~/components/forms";
import { Pager } from "~/components/pager";
import { Badge, Button, Card, Field, PageHeader, SelectField, SimpleTable } from "~/components/ui";
import { type Role, ROLES } from "~/db/values";
import { adminUserSchema, createUserSchema, disableUserSchema, updateUserSchema, userFilterSchema } from "~/lib/account-forms";
import { requestedPage } from "~/lib/paging";
import { wholeNumberParam } from "~/lib/query-params";
import { listLabs } from "~/models/lab.server";
import { createAccountWithWelcome } from "~/models/password-link.server";
import { AccountError, findUsers, setDisabled, updateAccount } from "~/models/user.server";
import { recordAudit } from "~/server/audit.server";
import { submitForm } from "~/server/form-reply.server";
import { requireRole } from "~/server/guards.server";
import { endAllSessions } from "~/server/session.server";
import { redirectWithToast } from "~/server/toast.server";

export const meta: Route.MetaFunction = () => [{ title: "Users · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const admin = await requireRole(request, "admin");
  const params = new URL(request.url).searchParams;
  const filter = userFilterSchema.parse({ q: params.get("q") ?? "", role: params.get("role") || null, lab: wholeNumberParam(params, "lab") });
  const [users, labs] = await Promise.all([findUsers({ search: filter.q, role: filter.role, labId: filter.lab }, requestedPage(params)), listLabs()]);
  return { users, filter, adminId: admin.id, labs: labs.map((l) => ({ id: l.id, name: l.name })) };
}

export async function action({ request }: Route.ActionArgs) {
  const admin = await requireRole(request, "admin");
  const change = async (input: z.output<typeof adminUserSchema>) => {
    switch (input.intent) {
      case "create": {
        if (input.roles.includes("analyst") && !input.labId) throw new AccountError("labId", "An analyst belongs to a lab: choose one.");
        const user = await createAccountWithWelcome({ ...input, isContact: input.isContact === "on" }, admin, request);
        return `Account for ${user.email} created; a link to set the password is on its way.`;
      }
      case "update": {
        const account = { userId: input.userId, roles: input.roles, labId: input.labId, isContact: input.isContact === "on" };
        await updateAccount(account, admin.id);
        await recordAudit({ actorUserId: admin.id, action: "user_updated", entityType: "user", entityId: input.userId, after: account });
        return "Account updated.";
      }
      case "disable": {
        const disabled = input.disabled === "true";
        await setDisabled(input.userId, disabled, admin.id);
        if (disabled) await endAllSessions(input.userId);
        await recordAudit({ actorUserId: admin.id, action: disabled ? "user_disabled" : "user_enabled", entityType: "user", entityId: input.userId });
        return disabled ? "Account disabled; its sessions have ended." : "Account enabled.";
      }
    }
  };
  // Back to the same filtered page the administrator was on.
  return submitForm(request, adminUserSchema, change, (message) => redirectWithToast(`/admin/users${new URL(request.url).search}`, message));
}

const ROLE_NAME: Record<Role, string> = { admin: "Administrator", coordinator: "Coordinator", analyst: "Analyst", reviewer: "Reviewer" };

type LoaderData = Route.ComponentProps["loaderData"];
type UserRow = LoaderData["users"]["rows"][number];
type LabOption = { value: string; label: string };

export default function AdminUsers({ loaderData, actionData }: Route.ComponentProps) {
  const { users, labs, filter, adminId } = loaderData;
  const busy = useNavigation().state === "submitting";
  const labOptions: LabOption[] = [{ value: "", label: "No lab" }, ...labs.map((l) => ({ value: String(l.id), label: l.name }))];
  const filtered = filter.q !== "" || filter.role !== null || filter.lab !== null;
  return (
    <>
      <PageHeader title="Users" subtitle="Accounts, roles and lab membership." />
      <FindAccountsCard filter={filter} filtered={filtered} labOptions={labOptions} />
      {/* A new account (one more in the count) starts the form afresh. */}
      <NewAccountCard key={users.total} labOptions={labOptions} reply={actionData} busy={busy} />
      <Card title="Accounts">
        <p className="mb-3">
          {users.total} {users.total === 1 ? "account" : "accounts"}
          {filtered ? " match" : ""}.
        </p>
        <SimpleTable
          caption={filtered ? "Accounts matching the search" : "All accounts"}
          headers={["Name", "E-mail", "Roles and lab", "Status"]}
          rows={users.rows.map((u) => [
            <span key="name">
              {u.name}
              {!u.hasPassword && <span className="block text-sm text-basalt-700">Password not set yet</span>}
            </span>,
            u.email,
            <UpdateUserForm key="update" user={u} own={u.id === adminId} labOptions={labOptions} reply={replyAbout(actionData, "userId", u.id)} />,
            <AccountStatus key="status" user={u} own={u.id === adminId} reply={replyAbout(actionData, "userId", u.id)} />,
          ])}
        />
        <Pager page={users.page} pageCount={users.pageCount} label="Pages of accounts" />
      </Card>
    </>
  );
}

/** The search over accounts: a GET form, so a filtered list has its own address. */
function FindAccountsCard({ filter, filtered, labOptions }: { filter: LoaderData["filter"]; filtered: boolean; labOptions: LabOption[] }) {
  return (
    <Card title="Find accounts" className="my-6">
      <Form method="get" className="grid items-end gap-4 md:grid-cols-4">
        <Field label="Name or e-mail contains" name="q" type="search" defaultValue={filter.q} />
        <SelectField label="Role" name="role" defaultValue={filter.role ?? ""} options={[{ value: "", label: "Any role" }, ...ROLES.map((r) => ({ value: r, label: ROLE_NAME[r] }))]} />
        <SelectField label="Lab" name="lab" defaultValue={filter.lab ? String(filter.lab) : ""} options={[{ value: "", label: "Any lab" }, ...labOptions.slice(1)]} />
        <div className="flex items-center gap-4 pb-1">
          <Button type="submit" variant="secondary">
            Search
          </Button>
          {filtered && (
            <Link to="/admin/users" className="font-semibold text-basalt-700 underline">
              Show all
            </Link>
          )}
        </div>
      </Form>
    </Card>
  );
}

function NewAccountCard({ labOptions, reply, busy }: { labOptions: LabOption[]; reply: unknown; busy: boolean }) {
  const [form, fields] = useSchemaForm(createUserSchema, { reply, intent: "create", defaultValue: { roles: ["analyst"] } });
  return (
    <Card title="New account" className="mb-6">
      <Form method="post" className="grid gap-4 md:grid-cols-3" {...getFormProps(form)}>
        <input type="hidden" name="intent" value="create" />
        <FormErrors errors={formWideErrors(form)} />
        <Field label="E-mail" type="email" {...fieldProps(fields.email)} />
        <Field label="Name" {...fieldProps(fields.name)} />
        <SelectField label="Lab" options={labOptions} {...fieldProps(fields.labId)} />
        <RoleChoices legend="Roles" field={fields.roles} idPrefix="new" />
        <label className="flex items-center gap-2 self-end pb-3 font-semibold">
          <input type="checkbox" name={fields.isContact.name} className="h-5 w-5" defaultChecked={fields.isContact.initialValue === "on"} /> Lab contact
        </label>
        <p className="text-basalt-700 md:col-span-3">The person gets an e-mail with a link to set their own password; the link works once, for 14 days.</p>
        <div className="md:col-span-3">
          <Button type="submit" disabled={busy}>
            Create account
          </Button>
        </div>
      </Form>
    </Card>
  );
}

/**
 * One box per role. A role that may not be taken away here (an administrator's
 * own, the last administrator's) is shown ticked and fixed, with why, and still
 * sent with the form.
 */
function RoleChoices({
  legend,
  field,
  idPrefix,
  fixed,
  inRow = false,
}: {
  legend: string;
  field: FieldMetadata<unknown>;
  idPrefix: string;
  fixed?: { role: Role; why: string };
  /** In a table row the legend is read out but not shown: the row already names the account. */
  inRow?: boolean;
}) {
  const initial = ([] as unknown[]).concat(field.initialValue ?? []);
  return (
    <fieldset className={`flex flex-wrap items-center gap-x-4 gap-y-1 ${inRow ? "" : "md:col-span-2"}`} aria-describedby={field.errors ? `${idPrefix}-roles-error` : undefined}>
      <legend className={inRow ? "sr-only" : "mb-1 font-semibold"}>{legend}</legend>
      {ROLES.map((role) => {
        const locked = fixed?.role === role;
        return (
          <label key={role} className="flex min-h-11 items-center gap-1">
            <input
              type="checkbox"
              name={locked ? undefined : field.name}
              value={role}
              defaultChecked={locked || initial.includes(role)}
              disabled={locked}
              className="h-5 w-5"
            />
            {locked && <input type="hidden" name={field.name} value={role} />}
            {ROLE_NAME[role]}
          </label>
        );
      })}
      {fixed && <span className="w-full text-sm text-basalt-700">{fixed.why}</span>}
      {field.errors && (
        <span id={`${idPrefix}-roles-error`} className="w-full font-semibold text-signal-700">
          {field.errors[0]}
        </span>
      )}
    </fieldset>
  );
}

/** Why the administrator role of this row cannot be taken away here, if it cannot. */
function fixedAdminRole(user: UserRow, own: boolean) {
  if (!user.roles.includes("admin")) return undefined;
  if (own) return { role: "admin" as const, why: "Your own administrator role stays: another administrator can change it." };
  if (user.onlyAdmin) return { role: "admin" as const, why: "The only administrator keeps the role until there is another." };
  return undefined;
}

function UpdateUserForm({ user, own, labOptions, reply }: { user: UserRow; own: boolean; labOptions: LabOption[]; reply: unknown }) {
  const [form, fields] = useSchemaForm(updateUserSchema, {
    reply,
    intent: "update",
    id: `update-user-${user.id}`,
    defaultValue: { roles: user.roles, labId: user.labIds[0] ? String(user.labIds[0]) : "", isContact: user.isContact ? "on" : undefined },
  });
  return (
    <Form method="post" className="flex flex-col gap-2" {...getFormProps(form)}>
      <input type="hidden" name="intent" value="update" />
      <input type="hidden" name="userId" value={user.id} />
      <FormErrors errors={formWideErrors(form)} />
      <RoleChoices legend={`Roles of ${user.email}`} field={fields.roles} idPrefix={`user-${user.id}`} fixed={fixedAdminRole(user, own)} inRow />
      <div className="flex flex-wrap items-end gap-2">
        <label className="sr-only" htmlFor={`lab-${user.id}`}>
          Lab of {user.email}
        </label>
        <select id={`lab-${user.id}`} name={fields.labId.name} defaultValue={(fields.labId.initialValue as string) ?? ""} className="min-h-11 rounded-md border border-basalt-200 px-2">
          {labOptions.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </select>
        <label className="flex min-h-11 items-center gap-1">
          <input type="checkbox" name={fields.isContact.name} defaultChecked={fields.isContact.initialValue === "on"} className="h-5 w-5" /> Contact
        </label>
        <Button type="submit" variant="secondary" aria-label={`Save roles and lab of ${user.email}`}>
          Save
        </Button>
      </div>
      {fields.labId.errors && <span className="font-semibold text-signal-700">{fields.labId.errors[0]}</span>}
    </Form>
  );
}

/** Active or disabled, with the one action that will be accepted: none on your own row or the last administrator's. */
function AccountStatus({ user, own, reply }: { user: UserRow; own: boolean; reply: unknown }) {
  const [form] = useSchemaForm(disableUserSchema, { reply, intent: "disable", id: `disable-user-${user.id}` });
  const badge = user.disabled ? <Badge tone="signal">Disabled</Badge> : <Badge tone="leaf">Active</Badge>;
  if (own) return <span className="flex flex-wrap items-center gap-2">{badge} Your account</span>;
  if (user.onlyAdmin && !user.disabled) return <span className="flex flex-wrap items-center gap-2">{badge} The only administrator</span>;
  return (
    <Form method="post" className="flex flex-wrap items-center gap-2" {...getFormProps(form)}>
      <input type="hidden" name="intent" value="disable" />
      <input type="hidden" name="userId" value={user.id} />
      <input type="hidden" name="disabled" value={user.disabled ? "false" : "true"} />
      {badge}
      <Button type="submit" variant="secondary" aria-label={`${user.disabled ? "Enable" : "Disable"} ${user.email}`}>
        {user.disabled ? "Enable" : "Disable"}
      </Button>
      <FormErrors errors={formWideErrors(form)} />
    </Form>
  );
}
