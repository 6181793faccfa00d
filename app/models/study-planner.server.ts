/**
 * The study planner's data: γ = σ_R/σ_r from the coordinator's earlier studies
 * (their analysed results), the materials' mixture designs for the cost, and
 * the plan itself (app/lib/study-planner.ts).
 */
import { asc, eq, inArray } from "drizzle-orm";
import { db } from "~/db/client.server";
import { materials, mixtureConstituents, type StudyState } from "~/db/schema";
import { studyAnalysis } from "~/models/analysis.server";
import { constituentFromRow } from "~/models/study-setup.server";
import { listCoordinatedStudies } from "~/models/study.server";
import type { SessionUser } from "~/models/user.server";
import {
  DEFAULT_GAMMA,
  DEFAULT_TARGET_AR,
  designCost,
  gammaFromEarlierStudy,
  planStudy,
  type DesignCost,
  type PlannedMaterial,
  type StudyPlan,
} from "~/lib/study-planner";

/** States in which a study's results have been analysed. */
const ANALYSED: readonly StudyState[] = ["checking", "in_review", "published"];

export type EarlierGamma = { studyId: number; code: string; testMethod: string; gamma: number };

/** γ = median s_R/s_r of each earlier study the user coordinates that has analysed results, newest first. */
export async function earlierGammas(user: SessionUser, exceptStudyId?: number): Promise<EarlierGamma[]> {
  const studies = (await listCoordinatedStudies(user))
    .filter((s) => ANALYSED.includes(s.state) && s.id !== exceptStudyId)
    .sort((a, b) => b.id - a.id);
  const out: EarlierGamma[] = [];
  for (const study of studies) {
    const gamma = gammaFromEarlierStudy((await studyAnalysis(study)).groups);
    if (gamma !== null) out.push({ studyId: study.id, code: study.code, testMethod: study.testMethod, gamma });
  }
  return out;
}

/** The study's materials with their mixture designs, for the cost of a design. */
export async function plannedMaterials(studyId: number): Promise<PlannedMaterial[]> {
  const rows = await db.select().from(materials).where(eq(materials.studyId, studyId)).orderBy(asc(materials.sortOrder), asc(materials.code));
  if (rows.length === 0) return [];
  const constituents = await db
    .select()
    .from(mixtureConstituents)
    .where(inArray(mixtureConstituents.materialId, rows.map((m) => m.id)))
    .orderBy(asc(mixtureConstituents.sortOrder));
  return rows.map((m) => ({ code: m.code, constituents: constituents.filter((c) => c.materialId === m.id).map(constituentFromRow) }));
}

export type PlannerView = {
  plan: StudyPlan;
  cost: DesignCost;
  /** where γ came from */
  gammaSource: string;
  earlier: EarlierGamma[];
  /** the design the cost is for */
  chosen: { labs: number; replicates: number; materials: number };
};

function numberParam(params: URLSearchParams, name: string): number | null {
  const raw = params.get(name);
  if (raw === null || raw.trim() === "") return null;
  const value = Number(raw);
  return Number.isFinite(value) ? value : null;
}

/**
 * The planner for a page: γ from `?gamma=`, else from an earlier study of the
 * same test method, else 2; the target from `?target=` (percent, default 30);
 * the cost for `?labs=` × `?replicates=` or the smallest design meeting the
 * target, over the study's materials (or `?materials=` on a new study).
 */
export async function plannerView(
  user: SessionUser,
  params: URLSearchParams,
  study: { id: number; testMethod: string; replicatesPerCell?: number | null } | null,
): Promise<PlannerView> {
  const earlier = await earlierGammas(user, study?.id);
  const sameMethod = study ? earlier.find((e) => e.testMethod.trim().toLowerCase() === study.testMethod.trim().toLowerCase()) : undefined;
  const asked = numberParam(params, "gamma");
  const gamma = asked !== null && asked >= 1 && asked <= 20 ? asked : (sameMethod?.gamma ?? DEFAULT_GAMMA);
  const gammaSource =
    asked !== null && asked >= 1 && asked <= 20
      ? "entered"
      : sameMethod
        ? `from ${sameMethod.code}, an earlier study of the same method (median s_R/s_r)`
        : "the default guess (no earlier study of this method)";
  const targetPercent = numberParam(params, "target");
  const targetAR = targetPercent !== null && targetPercent > 0 && targetPercent < 100 ? targetPercent / 100 : DEFAULT_TARGET_AR;
  const plan = planStudy({ gamma, targetAR });
  const designs = study ? await plannedMaterials(study.id) : [];
  const materialCount = designs.length > 0 ? designs.length : Math.min(20, Math.max(1, Math.round(numberParam(params, "materials") ?? 3)));
  const labs = Math.round(numberParam(params, "labs") ?? plan.smallest?.labs ?? 8);
  const replicates = Math.round(numberParam(params, "replicates") ?? plan.smallest?.replicates ?? study?.replicatesPerCell ?? 3);
  const chosen = { labs: Math.min(200, Math.max(3, labs)), replicates: Math.min(20, Math.max(2, replicates)), materials: materialCount };
  const cost = designCost({ labs: chosen.labs, replicates: chosen.replicates, materials: designs.length > 0 ? designs : materialCount });
  return { plan, cost, gammaSource, earlier, chosen };
}
