/**
 * The cautions, each shown once on the pages where it applies. Open on a
 * reader's first visit (and without scripts); afterwards folded to its
 * one-line summary, which still says the essential, and opened with a click.
 * Safety cautions appear only where someone handles concrete or heavy
 * batches: the batch sheet, result entry (and a ruggedness study's run sheet
 * and results, a round's material checks), packing and receiving shipments.
 */
import { type ReactNode, useEffect, useState } from "react";

const readKey = (id: string) => `ringbatch:caution-read:${id}`;

export function Caution({ id, summary, children }: { id: string; summary: ReactNode; children: ReactNode }) {
  const [open, setOpen] = useState(true);
  useEffect(() => {
    try {
      if (window.localStorage.getItem(readKey(id))) setOpen(false);
      else window.localStorage.setItem(readKey(id), "read");
    } catch {
      // Storage refused (private mode): the caution simply stays open.
    }
  }, [id]);
  return (
    <details
      open={open}
      onToggle={(event) => setOpen(event.currentTarget.open)}
      className="rounded-md border-l-4 border-ochre-600 bg-ochre-100 px-4 py-3 text-ochre-800"
    >
      <summary className="cursor-pointer font-semibold">{summary}</summary>
      <div className="mt-2">{children}</div>
    </details>
  );
}

const GOVERNS = "Local codes, specifications and licensed engineers govern; Ringbatch supports the committee's judgement and does not replace it.";

/** Where the analyst batches or tests fresh concrete. */
export function ConcreteCaution({ heavy = false }: { heavy?: boolean }) {
  return (
    <Caution id={heavy ? "concrete-heavy" : "concrete"} summary={heavy ? "Safety: caustic concrete, heavy batches" : "Safety: caustic concrete"}>
      <ul className="ml-5 list-disc">
        <li>Fresh concrete is caustic: wear gloves and eye protection, and keep it off your skin.</li>
        {heavy && <li>Forms and batches are heavy: lift with help.</li>}
      </ul>
      <p className="mt-1 text-sm">{GOVERNS}</p>
    </Caution>
  );
}

/** Where bags of cement and aggregate are packed or unpacked. */
export function MaterialsCaution({ packing }: { packing: boolean }) {
  return (
    <Caution id="materials" summary="Safety: bags of cement and aggregate are heavy">
      <ul className="ml-5 list-disc">
        <li>{packing ? "Pack and lift them with help, and mark the weight on each box." : "Lift them with help."}</li>
        <li>Cement is caustic when wet: wear gloves and eye protection.</li>
      </ul>
      <p className="mt-1 text-sm">{GOVERNS}</p>
    </Caution>
  );
}
