import { getFormProps } from "@conform-to/react";
import { Form, useNavigation } from "react-router";
import type { z } from "zod";
import type { Route } from "./+types/labs";
import { DataTable } from "~/components/data-table";
import { fieldProps, FormErrors, formWideErrors, refusalOf, useSchemaForm } from "~/components/forms";
import { StateBadge } from "~/components/state-badge";
import type { StudyPageHandle } from "~/components/study-frame";
import { Badge, Button, Card, Field, Notice, SelectField, TextAreaField } from "~/components/ui";
import { formatDate } from "~/lib/format";
import { ENROLLMENT_STATE } from "~/lib/state-labels";
import { labsForms, labsSchema } from "~/lib/study-forms";
import { RECOMMENDED_MIN_LABS } from "~/lib/study-lifecycle";
import { mayWrite, writeRefusal } from "~/lib/write-rules";
import { ConfirmStep } from "~/components/confirm-dialog";
import { studyPageMeta } from "~/lib/study-page-meta";
import { inviteLab, inviteOutsideLab, listStudyEnrollments, withdrawEnrollment } from "~/models/invitation.server";
import { listLabs } from "~/models/lab.server";
import { submitForm } from "~/server/form-reply.server";
import { requireStudy } from "~/server/study-context.server";
import { redirectWithToast } from "~/server/toast.server";

export const handle = { pageTitle: "Labs" } satisfies StudyPageHandle;

export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

export async function loader({ context }: Route.LoaderArgs) {
  const { study, access } = requireStudy(context, ["coordinator", "admin"]);
  const [directory, enrolled] = await Promise.all([listLabs(), listStudyEnrollments(study.id)]);
  const byLab = new Map(enrolled.map((e) => [e.labId, e]));
  // Labs invited from outside the directory are listed too, until their contact answers.
  const outside = enrolled.filter((e) => !directory.some((lab) => lab.id === e.labId)).map((e) => e.lab);
  const rows = [...directory, ...outside].map((lab) => {
    const e = byLab.get(lab.id);
    return {
      ...lab,
      enrollmentId: e?.id ?? null,
      enrollmentState: e?.state ?? null,
      labCode: e?.labCode ?? null,
      invitedAt: e?.invitedAt ? formatDate(e.invitedAt) : null,
    };
  });
  return {
    study,
    rows,
    accepted: enrolled.filter((e) => e.state === "accepted").length,
    canInvite: access === "coordinator" && mayWrite("invitations", study.state),
    invitationsClosedBecause: access === "coordinator" && study.state !== "draft" ? writeRefusal("invitations", study.state) : null,
    canWithdraw: access === "coordinator" && mayWrite("withdrawals", study.state),
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user } = requireStudy(context, ["coordinator"]);
  const change = async (form: z.output<typeof labsSchema>) => {
    if (form.intent === "invite") {
      await inviteLab(study, form.labId, user.id, request);
      return "Invitation sent to the lab's contact.";
    }
    if (form.intent === "invite-outside") {
      const { lab } = await inviteOutsideLab(study, form, user.id, request);
      return `Invitation sent to ${lab.contactEmail}. ${lab.name} joins the lab directory when it accepts.`;
    }
    await withdrawEnrollment(study, form.enrollmentId, form.reason, user.id);
    return "The lab is withdrawn: it can no longer change results, and its results have left the analysis.";
  };
  return submitForm(request, labsSchema, change, (message) => redirectWithToast(`/studies/${study.id}/labs`, message));
}

export default function StudyLabs({ loaderData, actionData }: Route.ComponentProps) {
  const { study, rows, accepted, canInvite, invitationsClosedBecause, canWithdraw } = loaderData;
  const inviteRefusal = refusalOf(actionData, "invite");
  const withdrawable = rows
    .filter((l) => l.enrollmentState === "invited" || l.enrollmentState === "accepted")
    .map((l) => ({ value: String(l.enrollmentId), label: `${l.name}${l.labCode ? ` (${l.labCode})` : ""}` }));
  const busy = useNavigation().state === "submitting";
  return (
    <div className="flex flex-col gap-4">
      <FormErrors errors={inviteRefusal} />
      {!canInvite && study.state === "draft" && <Notice>Open recruiting on the setup page to invite labs.</Notice>}
      {invitationsClosedBecause && <Notice>{invitationsClosedBecause}</Notice>}
      <p>
        {accepted} {accepted === 1 ? "lab has" : "labs have"} accepted.
        {accepted < RECOMMENDED_MIN_LABS && ` A precision statement usually needs at least ${RECOMMENDED_MIN_LABS} labs.`}
      </p>
      <Card title="Lab directory">
        <DataTable
          caption="Labs of the directory and their enrollment in this study"
          filterLabel="Filter labs"
          data={rows}
          columns={[
            {
              id: "name",
              header: "Lab",
              value: (l) => l.name,
              cell: (l) => (
                <>
                  {l.name}
                  {l.listing === "invited" && (
                    <span className="block">
                      <Badge>{l.enrollmentState === "declined" ? "Declined: stays out of the directory" : "Not in the directory yet"}</Badge>
                    </span>
                  )}
                </>
              ),
            },
            { id: "address", header: "Address", value: (l) => l.address || null },
            {
              id: "contact",
              header: "Contact",
              value: (l) => `${l.contactName} ${l.contactEmail}`.trim() || null,
              cell: (l) => (
                <>
                  {l.contactName || "—"}
                  {l.contactEmail && <span className="block text-sm text-basalt-700">{l.contactEmail}</span>}
                </>
              ),
            },
            { id: "accreditation", header: "Accreditation", value: (l) => l.accreditationNumber || null },
            {
              id: "state",
              header: "Enrollment",
              value: (l) => (l.enrollmentState ? ENROLLMENT_STATE[l.enrollmentState].label : "Not invited"),
              cell: (l) => (l.enrollmentState ? <StateBadge view={ENROLLMENT_STATE[l.enrollmentState]} /> : "Not invited"),
            },
            { id: "code", header: "Lab code", value: (l) => l.labCode },
            { id: "invited", header: "Invited on", value: (l) => l.invitedAt },
            ...(canInvite
              ? [
                  {
                    id: "invite",
                    header: "Invitation",
                    sortable: false,
                    value: () => null,
                    cell: (l: (typeof rows)[number]) =>
                      l.enrollmentState === "accepted" ? null : (
                        <Form method="post">
                          <input type="hidden" name="intent" value="invite" />
                          <input type="hidden" name="labId" value={l.id} />
                          <Button
                            type="submit"
                            variant="secondary"
                            disabled={busy || !l.contactEmail}
                            aria-label={`${l.enrollmentState ? "Invite again" : "Invite"} ${l.name}`}
                          >
                            {l.enrollmentState ? "Invite again" : "Invite"}
                          </Button>
                        </Form>
                      ),
                  },
                ]
              : []),
          ]}
        />
      </Card>
      {canInvite && (
        <Card title="Invite a lab that is not in the directory">
          <p className="mb-4">
            The invitation goes to the contact's e-mail address. When the contact accepts, they set their password and the lab joins the directory; an
            administrator checks it is not a lab already listed under another name. If the contact declines, the lab stays out of the directory and
            keeps its row here, so you can invite it again.
          </p>
          {/* A new row after a sent invitation starts the form afresh. */}
          <OutsideLabForm key={rows.length} reply={actionData} busy={busy} />
        </Card>
      )}
      {canWithdraw && withdrawable.length > 0 && (
        <Card title="Withdraw a lab">
          <p className="mb-4">
            A withdrawn lab can no longer change its results, and its results leave the analysis; they stay on record with your reason. While the study is
            recruiting, the lab can be invited again.
          </p>
          <WithdrawalForm labs={withdrawable} reply={actionData} busy={busy} />
        </Card>
      )}
    </div>
  );
}

function OutsideLabForm({ reply, busy }: { reply: unknown; busy: boolean }) {
  const [form, fields] = useSchemaForm(labsForms.inviteOutside, { reply, intent: "invite-outside" });
  return (
    <Form method="post" className="grid gap-4 md:grid-cols-3" {...getFormProps(form)}>
      <input type="hidden" name="intent" value="invite-outside" />
      <FormErrors errors={formWideErrors(form)} />
      <Field label="Lab name" autoComplete="organization" {...fieldProps(fields.labName)} />
      <Field label="Contact name" autoComplete="off" {...fieldProps(fields.contactName)} />
      <Field label="Contact e-mail" type="email" autoComplete="off" {...fieldProps(fields.contactEmail)} />
      <div className="md:col-span-3">
        <Button type="submit" disabled={busy}>
          Send the invitation
        </Button>
      </div>
    </Form>
  );
}

function WithdrawalForm({ labs, reply, busy }: { labs: { value: string; label: string }[]; reply: unknown; busy: boolean }) {
  const [form, fields] = useSchemaForm(labsForms.withdraw, { reply, intent: "withdraw" });
  return (
    <Form method="post" className="grid gap-4 md:grid-cols-2" {...getFormProps(form)}>
      <input type="hidden" name="intent" value="withdraw" />
      <FormErrors errors={formWideErrors(form)} />
      <SelectField label="Lab" {...fieldProps(fields.enrollmentId)} options={[{ value: "", label: "Choose a lab" }, ...labs]} />
      <TextAreaField label="Reason" rows={2} {...fieldProps(fields.reason)} />
      <div>
        <ConfirmStep
          label="Withdraw the lab"
          title="Withdraw the lab from the study?"
          consequences={
            <>
              <p>The lab can no longer enter or change results, and its pending invitation stops working.</p>
              <p>Its results are kept for the record but leave the analysis. This cannot be undone.</p>
            </>
          }
          confirmLabel="Withdraw the lab"
          variant="danger"
          disabled={busy}
        />
      </div>
    </Form>
  );
}
