import { Form, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/labs";
import { DataTable } from "~/components/data-table";
import { Badge, Button, Card, Notice, PageHeader, SelectField, TextAreaField } from "~/components/ui";
import { type ActionResult, formState, handleForm, refused } from "~/lib/form-results";
import { requireStudy } from "~/server/study-context.server";
import { RECOMMENDED_MIN_LABS } from "~/lib/study-lifecycle";
import { mayWrite } from "~/lib/write-rules";
import { ConfirmStep } from "~/components/confirm-dialog";
import { withdrawalSchema } from "~/lib/study-forms";
import { STATE_LABEL } from "~/lib/state-labels";
import { useSchemaCheck } from "~/lib/use-schema-check";
import { idField } from "~/lib/validation";
import { inviteLab, listStudyEnrollments, withdrawEnrollment } from "~/models/invitation.server";
import { listLabs } from "~/models/lab.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Labs ${data?.study.code ?? ""} · Ringbatch` }];

export async function loader({ context }: Route.LoaderArgs) {
  const { study, access } = requireStudy(context, ["coordinator", "admin"]);
  const [directory, enrolled] = await Promise.all([listLabs(), listStudyEnrollments(study.id)]);
  const byLab = new Map(enrolled.map((e) => [e.labId, e]));
  const rows = directory.map((lab) => {
    const e = byLab.get(lab.id);
    return { ...lab, enrollmentId: e?.id ?? null, enrollmentState: e?.state ?? null, labCode: e?.labCode ?? null, invitedAt: e?.invitedAt?.toISOString().slice(0, 10) ?? null };
  });
  return {
    study,
    rows,
    accepted: enrolled.filter((e) => e.state === "accepted").length,
    canInvite: access === "coordinator" && mayWrite("invitations", study.state),
    canWithdraw: access === "coordinator" && mayWrite("withdrawals", study.state),
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user } = requireStudy(context, ["coordinator"]);
  const form = await request.formData();
  const intent = String(form.get("intent") ?? "");
  switch (intent) {
    case "invite":
      return handleForm(intent, z.object({ labId: idField }), form, async ({ labId }) => {
        await inviteLab(study, labId, user.id, request);
        return { done: "Invitation sent to the lab's contact." };
      });
    case "withdraw":
      return handleForm(intent, withdrawalSchema, form, async ({ enrollmentId, reason }) => {
        await withdrawEnrollment(study, enrollmentId, reason, user.id);
        return { done: "The lab is withdrawn: it can no longer change results, and its results have left the analysis." };
      });
    default:
      return refused(intent, { form: "Unknown action." });
  }
}

const ENROLLMENT_VIEW = {
  invited: { label: "Invited", tone: "ochre" },
  accepted: { label: "Accepted", tone: "leaf" },
  declined: { label: "Declined", tone: "signal" },
  withdrawn: { label: "Withdrawn", tone: "neutral" },
} as const;

export default function StudyLabs({ loaderData, actionData }: Route.ComponentProps) {
  const { study, rows, accepted, canInvite, canWithdraw } = loaderData;
  const reply = actionData as ActionResult | undefined;
  const result = formState(reply, "invite");
  const withdrawal = formState(reply, "withdraw");
  const withdrawalCheck = useSchemaCheck(withdrawalSchema, withdrawal.errors);
  const withdrawable = rows
    .filter((l) => l.enrollmentState === "invited" || l.enrollmentState === "accepted")
    .map((l) => ({ value: String(l.enrollmentId), label: `${l.name}${l.labCode ? ` (${l.labCode})` : ""}` }));
  const busy = useNavigation().state === "submitting";
  return (
    <>
      <PageHeader title={`${study.code} — labs`} subtitle={<>{study.title} · <Badge>{STATE_LABEL[study.state]}</Badge></>} />
      <div className="flex flex-col gap-4">
        {(result.done ?? withdrawal.done) && <Notice tone="success">{result.done ?? withdrawal.done}</Notice>}
        {result.errors.labId && <Notice tone="error">{result.errors.labId}</Notice>}
        {!canInvite && study.state === "draft" && <Notice>Open recruiting on the setup page to invite labs.</Notice>}
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
              { id: "name", header: "Lab", value: (l) => l.name },
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
                value: (l) => (l.enrollmentState ? ENROLLMENT_VIEW[l.enrollmentState].label : "Not invited"),
                cell: (l) =>
                  l.enrollmentState ? <Badge tone={ENROLLMENT_VIEW[l.enrollmentState].tone}>{ENROLLMENT_VIEW[l.enrollmentState].label}</Badge> : "Not invited",
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
                            <Button type="submit" variant="secondary" disabled={busy || !l.contactEmail} aria-label={`${l.enrollmentState ? "Invite again" : "Invite"} ${l.name}`}>
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
        {canWithdraw && withdrawable.length > 0 && (
          <Card title="Withdraw a lab">
            <p className="mb-4">
              A withdrawn lab can no longer change its results, and its results leave the analysis; they stay on record with your reason. While the study
              is recruiting, the lab can be invited again.
            </p>
            <Form method="post" className="grid gap-4 md:grid-cols-2" onSubmit={withdrawalCheck.onSubmit} noValidate>
              <input type="hidden" name="intent" value="withdraw" />
              <SelectField
                label="Lab"
                name="enrollmentId"
                options={[{ value: "", label: "Choose a lab" }, ...withdrawable]}
                defaultValue={withdrawal.values.enrollmentId ?? ""}
                error={withdrawalCheck.errors.enrollmentId}
              />
              <TextAreaField label="Reason" name="reason" rows={2} defaultValue={withdrawal.values.reason} error={withdrawalCheck.errors.reason} />
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
          </Card>
        )}
      </div>
    </>
  );
}
