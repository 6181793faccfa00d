import { Form, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/studies.$studyId.labs";
import { DataTable } from "~/components/DataTable";
import { StudyNav } from "~/components/StudyNav";
import { Badge, Button, Card, Notice, PageHeader } from "~/components/ui";
import { type ActionResult, formState, handleForm } from "~/lib/form-results";
import { requireStudyAccess } from "~/lib/guards.server";
import { invitationsOpen, RECOMMENDED_MIN_LABS } from "~/lib/study-lifecycle";
import { STATE_LABEL } from "~/lib/study-states";
import { idField } from "~/lib/validation";
import { inviteLab, listStudyEnrollments } from "~/models/invitation.server";
import { listLabs } from "~/models/lab.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Labs ${data?.study.code ?? ""} · Ringbatch` }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const { study, access } = await requireStudyAccess(request, params.studyId, ["coordinator", "admin"]);
  const [directory, enrolled] = await Promise.all([listLabs(), listStudyEnrollments(study.id)]);
  const byLab = new Map(enrolled.map((e) => [e.labId, e]));
  const rows = directory.map((lab) => {
    const e = byLab.get(lab.id);
    return { ...lab, enrollmentState: e?.state ?? null, labCode: e?.labCode ?? null, invitedAt: e?.invitedAt?.toISOString().slice(0, 10) ?? null };
  });
  return { study, rows, accepted: enrolled.filter((e) => e.state === "accepted").length, canInvite: access === "coordinator" && invitationsOpen(study.state) };
}

export async function action({ request, params }: Route.ActionArgs) {
  const { study, user } = await requireStudyAccess(request, params.studyId, ["coordinator"]);
  return handleForm("invite", z.object({ labId: idField }), await request.formData(), async ({ labId }) => {
    await inviteLab(study, labId, user.id, request);
    return { done: "Invitation sent to the lab's contact." };
  });
}

const ENROLLMENT_VIEW = {
  invited: { label: "Invited", tone: "ochre" },
  accepted: { label: "Accepted", tone: "leaf" },
  declined: { label: "Declined", tone: "signal" },
  withdrawn: { label: "Withdrawn", tone: "neutral" },
} as const;

export default function StudyLabs({ loaderData, actionData }: Route.ComponentProps) {
  const { study, rows, accepted, canInvite } = loaderData;
  const result = formState(actionData as ActionResult | undefined, "invite");
  const busy = useNavigation().state === "submitting";
  return (
    <>
      <PageHeader title={`${study.code} — labs`} subtitle={<>{study.title} · <Badge>{STATE_LABEL[study.state]}</Badge></>} />
      <StudyNav studyId={study.id} />
      <div className="flex flex-col gap-4">
        {result.done && <Notice tone="success">{result.done}</Notice>}
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
      </div>
    </>
  );
}
