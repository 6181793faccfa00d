import { Caution } from "~/components/cautions";
import { SimpleTable } from "~/components/ui";

export function StatementCaution() {
  return (
    <Caution id="statement" summary="A precision statement supports the committee; it does not replace it">
      <p>
        A precision statement from Ringbatch supports, and does not replace, the procedures of the standards body and the judgement of licensed
        engineers; local codes and specifications govern the acceptance of concrete.
      </p>
    </Caution>
  );
}

export function StatementTexts({ textE691, textC670 }: { textE691: string; textC670: string }) {
  return (
    <div className="grid gap-4 lg:grid-cols-2">
      {(
        [
          ["E691 form", textE691],
          ["C670 form", textC670],
        ] as const
      ).map(([title, text]) => (
        <div key={title}>
          <h3 className="mb-1 font-semibold text-basalt-800">{title}</h3>
          <div className="whitespace-pre-line rounded border border-basalt-100 bg-basalt-50 p-3">{text}</div>
        </div>
      ))}
    </div>
  );
}

export function ExcludedCells({ excluded }: { excluded: { lab: string; material: string; response: string; reason: string }[] }) {
  return excluded.length === 0 ? (
    <p>No cell was excluded.</p>
  ) : (
    <SimpleTable caption="Cells left out of the analysis" headers={["Lab", "Material", "Response", "Reason"]} rows={excluded.map((e) => [e.lab, e.material, e.response, e.reason])} />
  );
}
