import { describe, expect, it } from "vitest";
import { precisionNearLevel, roundPrecisionFromAnalysis } from "./round-precision";
import { analyzeStudy, type ResultRow } from "../precision";

// Three materials × 4 labs × 2 replicates of a fictional count response.
function rows(): ResultRow[] {
  const out: ResultRow[] = [];
  const base = { M1: 10, M2: 20, M3: 30 } as const;
  const spread = [[-1, 0], [0, 1], [1, 2], [-2, -1]];
  for (const [material, level] of Object.entries(base)) {
    spread.forEach((offsets, lab) =>
      offsets.forEach((offset, replicate) =>
        out.push({ lab: `L0${lab + 1}`, material, response: "passes", replicate: replicate + 1, value: level + offset * (level / 10) }),
      ),
    );
  }
  return out;
}

describe("round precision", () => {
  const analysis = analyzeStudy(rows());
  const precision = roundPrecisionFromAnalysis("FF-2025-A", analysis);

  it("keeps each computed material's s_r and s_R and the fitted relations", () => {
    const entry = precision.responses.passes!;
    expect(entry.materials.map((m) => m.code)).toEqual(["M1", "M2", "M3"]);
    const m2 = analysis.groups.find((g) => g.material === "M2" && g.status === "computed");
    expect(entry.materials[1]).toMatchObject({ sr: (m2 as { sr: number }).sr, sR: (m2 as { sR: number }).sR });
    expect(entry.relations).not.toBeNull();
  });

  it("uses the relations at the level, or else the nearest material", () => {
    expect(precisionNearLevel(precision.responses.passes, 20)!.precision.basis).toBe("level-relation");
    const withoutRelations = { ...precision.responses.passes!, relations: null };
    const near = precisionNearLevel(withoutRelations, 28)!;
    expect(near.precision).toMatchObject({ basis: "material", sr: withoutRelations.materials[2]!.sr });
    expect(near.basis).toMatch(/material M3/);
    expect(precisionNearLevel(undefined, 1)).toBeNull();
  });
});
