import { getFormProps } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/overview";
import { fieldProps, FormErrors, useSchemaForm } from "~/components/forms";
import type { StudyPageHandle } from "~/components/study-frame";
import { Button, Card, Notice, SelectField, SimpleTable } from "~/components/ui";
import { formatDate } from "~/lib/format";
import { roundTransitionSchema } from "~/lib/round-forms";
import { allowedNextStates } from "~/lib/study-lifecycle";
import { CELL_STATUS, STUDY_STATE } from "~/lib/state-labels";
import { CELL_STATUS_ORDER } from "~/lib/cell-status";
import { transitionStudy } from "~/models/study-lifecycle.server";
import { statusCountsByMaterial, studyMatrix } from "~/models/study.server";
import { refuse } from "~/server/form-reply.server";
import { requireRound } from "~/server/round-context.server";
import { redirectWithToast } from "~/server/toast.server";
import { studyPageMeta } from "~/lib/study-page-meta";

export const handle = { pageTitle: "Round" } satisfies StudyPageHandle;
export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

/** The moves this page offers; publication goes through the scores page and its checks. */
const ROUND_MOVES = ["recruiting", "testing", "checking"] as const;

export async function loader({ context }: Route.LoaderArgs) {
  const { study, access } = requireRound(context, ["coordinator", "admin"]);
  const matrix = await studyMatrix(study.id);
  const moves = access === "coordinator" ? allowedNextStates(study.state).filter((s): s is (typeof ROUND_MOVES)[number] => (ROUND_MOVES as readonly string[]).includes(s)) : [];
  return {
    round: { id: study.id, code: study.code, testMethod: study.testMethod, replicates: study.replicatesPerCell, resultsDue: study.resultsDue, state: study.state },
    labs: matrix.rows.length,
    counts: statusCountsByMaterial(matrix),
    moves,
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const { study, user } = requireRound(context, ["coordinator"]);
  const submission = parseWithZod(await request.formData(), { schema: roundTransitionSchema });
  if (submission.status !== "success") return refuse(submission);
  const check = await transitionStudy(study, submission.value.to, user.id);
  if (!check.allowed) return refuse(submission, { to: check.problems });
  return redirectWithToast(`/rounds/${study.id}`, `The round is now: ${STUDY_STATE[submission.value.to].label}.`);
}

export default function RoundOverview({ loaderData, actionData }: Route.ComponentProps) {
  const { round, labs, counts, moves } = loaderData;
  const [form, fields] = useSchemaForm(roundTransitionSchema, { reply: actionData, intent: "transition", defaultValue: { to: moves[0] } });
  const busy = useNavigation().state === "submitting";
  const studyPages = `/studies/${round.id}`;
  return (
    <div className="flex flex-col gap-6">
      <Card title="The round">
        <dl className="grid gap-2 sm:grid-cols-[12rem_1fr]">
          <dt className="font-semibold">Test method</dt>
          <dd>{round.testMethod}</dd>
          <dt className="font-semibold">Replicates per lab</dt>
          <dd>{round.replicates} (each lab's result is their average)</dd>
          <dt className="font-semibold">Results due</dt>
          <dd>{formatDate(round.resultsDue)}</dd>
          <dt className="font-semibold">Labs enrolled</dt>
          <dd>{labs}</dd>
        </dl>
        <p className="mt-4">
          A round's enrolment, shipments and results use the study pages:{" "}
          <Link className="font-semibold text-basalt-700 underline" to={`${studyPages}/setup`}>
            setup
          </Link>
          ,{" "}
          <Link className="font-semibold text-basalt-700 underline" to={`${studyPages}/labs`}>
            labs and invitations
          </Link>
          ,{" "}
          <Link className="font-semibold text-basalt-700 underline" to={`${studyPages}/shipments`}>
            shipments
          </Link>{" "}
          and{" "}
          <Link className="font-semibold text-basalt-700 underline" to={`${studyPages}/results`}>
            results
          </Link>
          .
        </p>
      </Card>

      <Card title="Results received">
        <SimpleTable
          caption="Cells per material by status"
          headers={["Material", ...CELL_STATUS_ORDER.map((s) => CELL_STATUS[s].label)]}
          rows={counts.map((c) => [c.code, ...CELL_STATUS_ORDER.map((s) => String(c.counts[s]))])}
        />
      </Card>

      {moves.length > 0 && (
        <Card title="Round state">
          <Form method="post" className="flex flex-col gap-3" {...getFormProps(form)}>
            <input type="hidden" name="intent" value="transition" />
            <FormErrors errors={form.errors} />
            <SelectField label="Move the round to" {...fieldProps(fields.to)} options={moves.map((s) => ({ value: s, label: STUDY_STATE[s].label }))} />
            <div>
              <Button type="submit" disabled={busy}>
                Move
              </Button>
            </div>
          </Form>
        </Card>
      )}
      {round.state === "checking" && (
        <Notice>
          Testing is closed. Set the assigned values and σ_pt, enter the homogeneity and stability checks, then publish on the{" "}
          <Link className="font-semibold underline" to={`/rounds/${round.id}/scores`}>
            scores
          </Link>{" "}
          page.
        </Notice>
      )}
    </div>
  );
}
