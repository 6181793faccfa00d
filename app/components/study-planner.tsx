/**
 * The study planner, on the new-study and setup pages: for a guessed
 * γ = σ_R/σ_r, ISO 5725-1's A_r and A_R for labs × replicates, the smallest
 * design meeting a target on σ_R, the practices' minimums, and what a design
 * costs each lab in concrete and constituents. A GET form, so it never touches
 * the page's other forms.
 */
import { Form, Link } from "react-router";
import { Button, Field, SimpleTable } from "~/components/ui";
import { PLANNER_LABS, PLANNER_REPLICATES } from "~/lib/study-planner";
import type { PlannerView } from "~/models/study-planner.server";

const pct = (x: number) => `±${(100 * x).toFixed(0)} %`;
const amount = (x: number, unit: string) => `${x.toLocaleString("en", { maximumFractionDigits: unit === "mL" ? 0 : 1 })} ${unit}`;

export function StudyPlanner({ view, askMaterials = false }: { view: PlannerView; askMaterials?: boolean }) {
  const { plan, cost, chosen, earlier, gammaSource } = view;
  return (
    <section aria-labelledby="planner-heading" className="flex flex-col gap-4">
      <h2 id="planner-heading" className="text-lg font-semibold text-basalt-800">
        Study planner: how many labs and replicates
      </h2>
      <p className="text-sm text-basalt-700">
        ISO 5725-1: the true σ_r lies within s_r·(1 ± A_r) and σ_R within s_R·(1 ± A_R) with about 95 % probability. A_R depends on γ = σ_R/σ_r,
        here {plan.gamma.toFixed(2)} ({gammaSource}).
      </p>
      <Form method="get" className="flex flex-wrap items-end gap-4" preventScrollReset>
        <Field label="γ = σ_R/σ_r" name="gamma" type="number" step="0.05" min="1" max="20" defaultValue={plan.gamma.toFixed(2)} />
        <Field label="Target on σ_R (± %)" name="target" type="number" step="1" min="1" max="99" defaultValue={String(Math.round(plan.targetAR * 100))} />
        <Field label="Labs" name="labs" type="number" min="3" max="200" defaultValue={String(chosen.labs)} />
        <Field label="Replicates" name="replicates" type="number" min="2" max="20" defaultValue={String(chosen.replicates)} />
        {askMaterials && <Field label="Materials" name="materials" type="number" min="1" max="20" defaultValue={String(chosen.materials)} />}
        <Button type="submit" variant="secondary">
          Plan
        </Button>
      </Form>
      {earlier.length > 0 && (
        <p className="text-sm">
          γ from an earlier study:{" "}
          {earlier.map((e, i) => (
            <span key={e.studyId}>
              {i > 0 && ", "}
              <Link to={`?gamma=${e.gamma.toFixed(2)}#planner-heading`} className="text-basalt-700 underline">
                {e.code} ({e.testMethod}): {e.gamma.toFixed(2)}
              </Link>
            </span>
          ))}
        </p>
      )}
      <SimpleTable
        caption={`A_r and A_R for labs × replicates at γ = ${plan.gamma.toFixed(2)}; ✓ marks designs meeting ${pct(plan.targetAR)} on σ_R`}
        headers={["Labs", ...PLANNER_REPLICATES.map((n) => `n = ${n}: A_r / A_R`)]}
        rows={PLANNER_LABS.map((labs) => [
          `${labs}${labs < 6 ? " (below E691's 6)" : ""}`,
          ...PLANNER_REPLICATES.map((n) => {
            const cell = plan.table.find((c) => c.labs === labs && c.replicates === n)!;
            return (
              <span key={n} className={cell.meetsTarget && cell.meetsMinimums ? "font-semibold text-leaf-700" : undefined}>
                {pct(cell.Ar)} / {pct(cell.AR)}
                {cell.meetsTarget && cell.meetsMinimums && <span> ✓</span>}
              </span>
            );
          }),
        ])}
      />
      <p>
        {plan.smallest ? (
          <>
            Smallest design meeting {pct(plan.targetAR)} on σ_R: <strong>{plan.smallest.labs} labs × {plan.smallest.replicates} replicates</strong>{" "}
            (A_R {pct(plan.smallest.AR)}, A_r {pct(plan.smallest.Ar)}) — fewest results per material, fewer labs on a tie.
          </>
        ) : (
          <>No design up to 100 labs and 10 replicates meets {pct(plan.targetAR)} on σ_R at this γ.</>
        )}
      </p>
      <div className="text-sm">
        <p className="font-semibold text-basalt-800">The practices' minimums</p>
        <ul className="list-disc pl-5">
          {plan.minimums.map((m) => (
            <li key={m}>{m}</li>
          ))}
        </ul>
      </div>
      <div className="flex flex-col gap-2">
        <h3 className="font-semibold text-basalt-800">
          What {chosen.labs} labs × {chosen.replicates} replicates cost
        </h3>
        <p>Concrete per lab: {cost.volumeText}; {(cost.volumePerLabM3 * chosen.labs).toFixed(2)} m³ for all labs.</p>
        {cost.perLab.length > 0 ? (
          <SimpleTable
            caption="Constituents to ship, per lab and in total"
            headers={["Constituent", "Per lab", `All ${chosen.labs} labs`]}
            rows={cost.perLab.map((c, i) => [c.name, amount(c.amount, c.unit), amount(cost.total[i]!.amount, c.unit)])}
          />
        ) : (
          <p className="text-sm text-basalt-700">Constituent masses appear once the materials' mixture designs are entered.</p>
        )}
      </div>
    </section>
  );
}
