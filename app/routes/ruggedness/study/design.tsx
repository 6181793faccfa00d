import type { Route } from "./+types/design";
import { ConcreteCaution } from "~/components/cautions";
import { NoDesignYet } from "~/components/no-design-yet";
import { RunHeading } from "~/components/run-heading";
import type { StudyPageHandle } from "~/components/study-frame";
import { Card, SimpleTable } from "~/components/ui";
import { plackettBurmanDesign, settingText } from "~/lib/ruggedness";
import { ruggednessSetup } from "~/models/ruggedness.server";
import { requireRuggednessStudy } from "~/server/ruggedness-context.server";
import { studyPageMeta } from "~/lib/study-page-meta";

export const handle = { pageTitle: "Design & run sheet" } satisfies StudyPageHandle;
export const meta: Route.MetaFunction = ({ matches }) => studyPageMeta(handle.pageTitle, matches);

export async function loader({ context }: Route.LoaderArgs) {
  const { study } = requireRuggednessStudy(context, ["coordinator", "admin"]);
  const setup = await ruggednessSetup(study.id);
  return { study: { id: study.id, code: study.code, title: study.title, testMethod: study.testMethod }, setup, design: setup.plan ? plackettBurmanDesign(setup.plan.runs) : null };
}

export default function DesignPage({ loaderData }: Route.ComponentProps) {
  const { study, setup, design } = loaderData;
  if (!setup.plan || !design) {
    return <NoDesignYet studyId={study.id} />;
  }
  const { plan, factors, responses } = setup;
  const columnLabel = (column: number) => factors.find((f) => f.column === column)?.name ?? `Dummy (column ${column})`;
  const settingOf = (column: number, level: number) => {
    const f = factors.find((x) => x.column === column);
    if (!f) return level > 0 ? "+" : "−";
    return settingText(level > 0 ? f.high : f.low, f.unit);
  };
  const columns = design[0]!.length;
  return (
    <div className="flex flex-col gap-6">
      <Card title="The design">
        <p className="mb-3 text-basalt-700">
          Plackett–Burman design of {plan.runs} runs for {factors.length} factors, with {columns - factors.length} dummy{" "}
          {columns - factors.length === 1 ? "column" : "columns"}; {plan.replicates === 2 ? "two results" : "one result"} per run. + is the high
          setting, − the low one. Run order drawn at random (seed {plan.runOrderSeed}).
        </p>
        <SimpleTable
          caption="Design columns by run"
          headers={["Run", "Order", ...Array.from({ length: columns }, (_, i) => `${i + 1}. ${columnLabel(i + 1)}`)]}
          rows={design.map((row, i) => [i + 1, plan.runOrder.indexOf(i + 1) + 1, ...row.map((level) => (level > 0 ? "+" : "−"))])}
        />
      </Card>
      <section className="flex flex-col gap-4 rounded-lg border border-basalt-100 bg-white p-5 shadow-sm print:border-0 print:shadow-none">
        <div className="flex flex-wrap items-center justify-between gap-3">
          <h2 className="text-lg font-semibold text-basalt-800">Run sheet — {study.code}</h2>
          <button type="button" onClick={() => window.print()} className="min-h-11 rounded-md border border-basalt-500 px-4 py-2 font-semibold print:hidden">
            Print the run sheet
          </button>
        </div>
        <p>
          {study.title}. {study.testMethod}. Perform the runs in the order below, each with the settings shown; hold every other detail of the
          procedure as the method states it. Write each result in its box.
        </p>
        <ConcreteCaution heavy />
        <ol className="flex flex-col gap-3">
          {plan.runOrder.map((run, position) => (
            <li key={run} className="break-inside-avoid rounded-md border border-basalt-200 p-3">
              <RunHeading run={run} position={position} className="font-semibold" />
              <ul className="ml-5 list-disc">
                {factors.map((f) => (
                  <li key={f.column}>
                    {f.name}: <strong>{settingOf(f.column, design[run - 1]![f.column - 1]!)}</strong>
                  </li>
                ))}
              </ul>
              <div className="mt-2 flex flex-wrap gap-4">
                {responses.flatMap((r) =>
                  Array.from({ length: plan.replicates }, (_, k) => (
                    <span key={`${r.key}-${k}`} className="inline-flex items-center gap-2">
                      {r.name}
                      {plan.replicates > 1 ? ` (result ${k + 1})` : ""}: <span className="inline-block h-7 w-16 border-b-2 border-basalt-700" aria-hidden />
                    </span>
                  )),
                )}
              </div>
            </li>
          ))}
        </ol>
      </section>
    </div>
  );
}
