import { Notice } from "./ui";

const GOVERNS = "Local codes, specifications and licensed engineers govern; Ringbatch supports the committee's judgement and does not replace it.";

/** Shown wherever the analyst handles fresh concrete. */
export function ConcreteCaution({ heavy = false }: { heavy?: boolean }) {
  return (
    <Notice tone="caution">
      <p className="font-semibold">Safety</p>
      <ul className="ml-5 list-disc">
        <li>Fresh concrete is caustic: wear gloves and eye protection, and keep it off your skin.</li>
        {heavy && <li>Forms and batches are heavy: lift with help.</li>}
      </ul>
      <p className="mt-1 text-sm">{GOVERNS}</p>
    </Notice>
  );
}
