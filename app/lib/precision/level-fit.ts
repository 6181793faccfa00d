import { linearRegression } from "simple-statistics";

export type LevelRelation = "proportional" | "linear" | "log-linear";

/** One material: its level m (the general mean) and a precision figure s (s_r or s_R). */
export interface LevelPoint {
  level: number;
  s: number;
}

export type LevelModel =
  | { relation: "proportional"; formula: "s = b·m"; b: number }
  | { relation: "linear"; formula: "s = a + b·m"; a: number; b: number }
  | { relation: "log-linear"; formula: "log10 s = c + d·log10 m"; c: number; d: number };

export type LevelFitCandidate = LevelModel & {
  /** √(Σ(s − ŝ)²/(k − q)) in the units of s, q the number of fitted parameters */
  residualSd: number;
};

export interface LevelFitResult {
  candidates: LevelFitCandidate[];
  chosen: LevelRelation | null;
  notes: string[];
}

/** The precision figure a fitted relation predicts at level m. */
export function predictLevelModel(model: LevelModel, m: number): number {
  switch (model.relation) {
    case "proportional":
      return model.b * m;
    case "linear":
      return model.a + model.b * m;
    case "log-linear":
      return 10 ** (model.c + model.d * Math.log10(m));
  }
}

function withResidualSd(model: LevelModel, points: readonly LevelPoint[]): LevelFitCandidate {
  const parameters = model.relation === "proportional" ? 1 : 2;
  let sumSquares = 0;
  for (const point of points) sumSquares += (point.s - predictLevelModel(model, point.level)) ** 2;
  return { ...model, residualSd: Math.sqrt(sumSquares / (points.length - parameters)) };
}

/** Fewest materials that leave a residual degree of freedom for the two-parameter relations. */
export const LEVEL_FIT_MIN_MATERIALS = 3;

/**
 * ISO 5725-2, dependence of precision on level: fits s = b·m, s = a + b·m and
 * log s = c + d·log m (least squares; the last in log10 space) over the materials.
 * Chosen: the smallest residual standard deviation in the units of s, which
 * charges each relation for its parameters; on a tie the simpler relation
 * (listed first) wins.
 */
export function levelFit(points: readonly LevelPoint[]): LevelFitResult {
  const notes: string[] = [];
  if (points.length < LEVEL_FIT_MIN_MATERIALS) {
    notes.push(`a level fit needs at least ${LEVEL_FIT_MIN_MATERIALS} materials, got ${points.length}`);
    return { candidates: [], chosen: null, notes };
  }
  const candidates: LevelFitCandidate[] = [];

  let crossProducts = 0;
  let levelSquares = 0;
  for (const { level, s } of points) {
    crossProducts += level * s;
    levelSquares += level * level;
  }
  if (levelSquares > 0) {
    candidates.push(withResidualSd({ relation: "proportional", formula: "s = b·m", b: crossProducts / levelSquares }, points));
  }

  if (points.some((point) => point.level !== points[0].level)) {
    const line = linearRegression(points.map((point) => [point.level, point.s]));
    candidates.push(withResidualSd({ relation: "linear", formula: "s = a + b·m", a: line.b, b: line.m }, points));
    if (points.every((point) => point.level > 0 && point.s > 0)) {
      const logLine = linearRegression(points.map((point) => [Math.log10(point.level), Math.log10(point.s)]));
      candidates.push(
        withResidualSd({ relation: "log-linear", formula: "log10 s = c + d·log10 m", c: logLine.b, d: logLine.m }, points),
      );
    } else {
      notes.push("log s = c + d·log m needs every level and every s above 0");
    }
  } else {
    notes.push("all materials share one level: only s = b·m can be fitted");
  }

  let chosen: LevelFitCandidate | null = null;
  for (const candidate of candidates) {
    if (chosen === null || candidate.residualSd < chosen.residualSd) chosen = candidate;
  }
  return { candidates, chosen: chosen?.relation ?? null, notes };
}
