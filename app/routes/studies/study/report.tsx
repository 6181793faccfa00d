import type { Route } from "./+types/report";
import { LazyCharts } from "~/components/charts/lazy-charts";
import { PrecisionTables } from "~/components/precision-tables";
import { PrintFrame } from "~/components/print-frame";
import { ExcludedCells, StatementCaution, StatementTexts } from "~/components/statement-parts";
import { StateBadge } from "~/components/state-badge";
import type { StudyPageHandle } from "~/components/study-frame";
import { Card, SimpleTable } from "~/components/ui";
import { ALPHA_LABEL } from "~/lib/review/format";
import { STATEMENT_STATE } from "~/lib/state-labels";
import { studyPageMeta } from "~/lib/study-page-meta";
import { listStatements, participatingLabs } from "~/models/statement.server";
import { requireStudy } from "~/server/study-context.server";

export const handle = { pageTitle: "Report" } satisfies StudyPageHandle;

export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

/** The printable report of the statement version most advanced in review; reviewers get it with lab codes only. */
export async function loader({ context }: Route.LoaderArgs) {
  const { study, access } = requireStudy(context, ["coordinator", "admin", "reviewer"]);
  const statements = await listStatements(study.id);
  const statement =
    statements.find((s) => s.state === "approved") ?? statements.find((s) => s.sentAt !== null) ?? (access === "reviewer" ? null : statements[0]) ?? null;
  const labs = statement ? await participatingLabs(study.id, statement.snapshot.analysis) : [];
  const named = access !== "reviewer";
  return {
    study: { id: study.id, code: study.code, title: study.title, testMethod: study.testMethod, state: study.state },
    named,
    statement: statement && {
      version: statement.version,
      state: statement.state,
      textE691: statement.textE691,
      textC670: statement.textC670,
      snapshot: statement.snapshot,
    },
    labs: labs.map((l) => (named ? l : { code: l.code, name: null })),
  };
}

export default function Report({ loaderData }: Route.ComponentProps) {
  const { study, statement, labs, named } = loaderData;
  return (
    <PrintFrame header={`Precision report · ${study.code} · ${statement ? `statement version ${statement.version}` : "no statement yet"}`}>
      <article className="flex flex-col gap-6 print:gap-4">
        <header>
          <p className="text-basalt-700">Precision report of {study.testMethod}.</p>
          <p className="mt-2 print:hidden">
            <button
              type="button"
              onClick={() => window.print()}
              className="min-h-11 rounded-md border border-basalt-500 bg-white px-4 font-semibold text-basalt-800"
            >
              Print the report
            </button>
          </p>
        </header>
        <StatementCaution />
        {!statement ? (
          <Card>
            <p>No statement version exists yet; freeze one on the statement page first.</p>
          </Card>
        ) : (
          <>
            <Card title={`Statement, version ${statement.version}`}>
              <p className="mb-3">
                <StateBadge view={STATEMENT_STATE[statement.state]} /> {statement.snapshot.labs} labs, {statement.snapshot.materials.length} materials,{" "}
                {statement.snapshot.replicates} replicates per cell; consistency checked at the {ALPHA_LABEL[statement.snapshot.analysis.alpha]} level; data
                version {statement.snapshot.dataVersion}.
              </p>
              <StatementTexts textE691={statement.textE691} textC670={statement.textC670} />
            </Card>
            <Card title="Participating labs">
              <SimpleTable
                caption="Labs that contributed results"
                headers={named ? ["Code", "Lab"] : ["Code"]}
                rows={labs.map((l) => (named ? [l.code, l.name] : [l.code]))}
              />
            </Card>
            <Card title="Materials">
              <SimpleTable
                caption="Materials of the study"
                headers={["Code", "Description"]}
                rows={statement.snapshot.materials.map((m) => [m.code, m.description])}
              />
            </Card>
            <Card title="Cells left out">
              <ExcludedCells excluded={statement.snapshot.analysis.excluded} />
            </Card>
            <Card title="Tables">
              <PrecisionTables analysis={statement.snapshot.analysis} responses={statement.snapshot.responses} headingLevel={3} />
            </Card>
            <Card title="Plots" className="print:break-before-page">
              <LazyCharts analysis={statement.snapshot.analysis} responses={statement.snapshot.responses} />
            </Card>
          </>
        )}
      </article>
    </PrintFrame>
  );
}
