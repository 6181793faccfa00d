/**
 * The exclusion preview, computed where it is shown: the same precision engine
 * the server runs, over one material's submitted results. Groups are analysed
 * one (material, response) at a time, so one material's rows give exactly the
 * figures the whole study's analysis gives for that material.
 */
import { analyzeStudy, type GroupResult, type ResponseKind } from "~/lib/precision";
import { type CellRef, sameCell } from "./cells";

/** One material's submitted results of the labs still in the study, with what the engine needs besides. */
export type MaterialResults = {
  material: string;
  alpha: number;
  responseKinds: Record<string, ResponseKind>;
  results: { lab: string; response: string; replicate: number; value: number }[];
};

/** The material's groups with exactly `exclusions` left out (cells of other materials are ignored). */
export function materialWhatIf(input: MaterialResults, exclusions: readonly CellRef[]): GroupResult[] {
  const rows = input.results.map((r) => ({ ...r, material: input.material }));
  const excludedCells = exclusions.filter((e) => e.material === input.material).map((e) => ({ ...e, reason: "what-if" }));
  return analyzeStudy(rows, { alpha: input.alpha, excludedCells, responseKinds: input.responseKinds }).groups;
}

/** The saved exclusions with `cell` added (excluded) or taken out (retained). */
export function exclusionsWith(saved: readonly CellRef[], cell: CellRef, decision: "retained" | "excluded"): CellRef[] {
  const others = saved.filter((e) => !sameCell(e, cell));
  return decision === "excluded" ? [...others, cell] : others;
}
