/** The study's fresh-property targets and target surface rating, as a lab batches and tests to them. */
import { FRESH_FIELDS, type FreshProperty } from "~/lib/results/fresh";

const SHOWN: FreshProperty[] = ["slump", "air_content", "concrete_temperature"];

export type FreshTargets = Partial<Record<FreshProperty, { target: number; tolerance: number }>>;

export function StudyTargets({ targets, targetSurfaceRating }: { targets: FreshTargets; targetSurfaceRating: number | null }) {
  return (
    <dl className="grid grid-cols-2 gap-x-6 gap-y-2 sm:grid-cols-4" aria-label="Targets of the study">
      {SHOWN.map((property) => {
        const field = FRESH_FIELDS[property];
        const target = targets[property];
        const unit = field.unit === "%" ? " %" : ` ${field.unit}`;
        return (
          <div key={property}>
            <dt className="text-sm text-basalt-700">{field.label}</dt>
            <dd className="whitespace-nowrap font-semibold tabular-nums">{target ? `${target.target} ± ${target.tolerance}${unit}` : "no target"}</dd>
          </div>
        );
      })}
      {targetSurfaceRating !== null && (
        <div>
          <dt className="text-sm text-basalt-700">Target surface rating</dt>
          <dd className="font-semibold tabular-nums">{targetSurfaceRating} on the 1–3 scale (1 smoothest)</dd>
        </div>
      )}
    </dl>
  );
}
