import { Link } from "react-router";
import type { Route } from "./+types/sheet";
import { ComparisonOutcomeView } from "~/components/comparison-outcome";
import { StatementCaution } from "~/components/statement-parts";
import { Card, SimpleTable } from "~/components/ui";
import { formatDateTime } from "~/lib/format";
import { findComparison } from "~/models/comparison.server";
import { notFound, requireUser } from "~/server/guards.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Comparison sheet ${data?.comparison.id ?? ""} · Ringbatch` }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const id = Number(params.comparisonId);
  if (!Number.isSafeInteger(id) || id <= 0) notFound();
  const comparison = await findComparison(user.id, id);
  if (!comparison) notFound();
  return { comparison, person: user.name };
}

export default function ComparisonSheet({ loaderData }: Route.ComponentProps) {
  const { comparison: c, person } = loaderData;
  return (
    <article className="mx-auto flex max-w-3xl flex-col gap-4">
      <div className="flex items-center justify-between gap-4 print:hidden">
        <Link to="/compare" className="font-semibold underline">
          ← Your comparisons
        </Link>
        <button type="button" onClick={() => window.print()} className="min-h-11 rounded-md border border-basalt-500 px-4 py-2 font-semibold">
          Print this sheet
        </button>
      </div>
      <header>
        <h1 className="text-2xl font-bold text-basalt-900">Mixture comparison — {c.trialLabel} against {c.referenceLabel}</h1>
        <p className="text-basalt-700">
          {c.responseName} · made {formatDateTime(c.createdAt)} by {person} · precision statement version {c.statementVersion} of study {c.studyCode} ({c.studyTitle}), {c.testMethod}
        </p>
      </header>
      <Card title="Results entered">
        <SimpleTable
          caption="Results entered"
          headers={["Mixture", "Results", "Where tested"]}
          rows={[
            [c.referenceLabel, c.referenceValues.join(", "), c.setting === "same-lab" ? "same lab as the trial" : "lab 1"],
            [c.trialLabel, c.trialValues.join(", "), c.setting === "same-lab" ? "same lab as the reference" : "lab 2"],
          ]}
        />
        {c.notes && <p className="mt-3 whitespace-pre-line">{c.notes}</p>}
      </Card>
      <Card title="Outcome">
        <ComparisonOutcomeView outcome={c.outcome} unit={c.unit} />
      </Card>
      <StatementCaution />
    </article>
  );
}
