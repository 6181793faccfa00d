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
  /**
   * Relative residual standard deviation √(Σ((s − ŝ)/ŝ)²/(q − k)), q materials,
   * k fitted parameters: the residuals the weights 1/ŝ² judge, so the three
   * relations are compared on one scale (0.05 = 5 %)
   */
  residualSd: number;
  /** weighted fits of s = a + b·m: how many reweightings it took */
  iterations: number;
};

export interface LevelFitResult {
  candidates: LevelFitCandidate[];
  chosen: LevelRelation | null;
  /** why the chosen relation was chosen, in words; null when none could be */
  reason: string | null;
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

/** Fewest materials that leave a residual degree of freedom for the two-parameter relations. */
export const LEVEL_FIT_MIN_MATERIALS = 3;

function relativeResidualSd(model: LevelModel, points: readonly LevelPoint[]): number {
  const parameters = model.relation === "proportional" ? 1 : 2;
  let sum = 0;
  for (const point of points) {
    const fitted = predictLevelModel(model, point.level);
    sum += ((point.s - fitted) / fitted) ** 2;
  }
  return Math.sqrt(sum / (points.length - parameters));
}

/** A power of two near the largest magnitude, so scaling by it is exact. */
function powerOfTwoScale(values: readonly number[]): number {
  const largest = Math.max(...values.map(Math.abs));
  return largest > 0 && Number.isFinite(largest) ? 2 ** Math.floor(Math.log2(largest)) : 1;
}

/** Weighted least squares of s = a + b·m with weights w (centred sums). */
function weightedLine(points: readonly LevelPoint[], weights: readonly number[]): { a: number; b: number } {
  let w = 0;
  let wm = 0;
  let ws = 0;
  for (let i = 0; i < points.length; i++) {
    w += weights[i];
    wm += weights[i] * points[i].level;
    ws += weights[i] * points[i].s;
  }
  const mBar = wm / w;
  const sBar = ws / w;
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < points.length; i++) {
    const dm = points[i].level - mBar;
    sxy += weights[i] * dm * (points[i].s - sBar);
    sxx += weights[i] * dm * dm;
  }
  const b = sxy / sxx;
  return { a: sBar - b * mBar, b };
}

/**
 * ISO 5725-2 §7.5, relation II s = a + b·m by weighted least squares with
 * weights W = 1/ŝ², ŝ the fitted values, iterated: the first weights come from
 * the observed s (or equal weights when an s is 0), each fit gives new ŝ and
 * new weights, until the fitted values change by less than 1e-12 (ISO notes
 * one or two rounds usually suffice). Fails (null, with the reason) when a
 * fitted value is not above 0, since weights 1/ŝ² need ŝ > 0.
 */
export function weightedLinearFit(points: readonly LevelPoint[]): { a: number; b: number; iterations: number } | { failure: string } {
  const levelScale = powerOfTwoScale(points.map((p) => p.level));
  const sScale = powerOfTwoScale(points.map((p) => p.s));
  const scaled = points.map((p) => ({ level: p.level / levelScale, s: p.s / sScale }));
  let fitted = scaled.map((p) => p.s);
  if (fitted.some((s) => !(s > 0))) fitted = fitted.map(() => 1);
  let line = { a: 0, b: 0 };
  let iterations = 0;
  for (; iterations < 100; iterations++) {
    line = weightedLine(scaled, fitted.map((s) => 1 / (s * s)));
    const next = scaled.map((p) => line.a + line.b * p.level);
    const bad = next.findIndex((s) => !(s > 0));
    if (bad >= 0) {
      return { failure: `s = a + b·m predicts s ≤ 0 at level ${points[bad].level}, so it cannot be weighted by 1/ŝ²` };
    }
    const change = Math.max(...next.map((s, i) => Math.abs(s - fitted[i]) / s));
    fitted = next;
    if (change < 1e-12) break;
  }
  return { a: line.a * sScale, b: (line.b * sScale) / levelScale, iterations: iterations + 1 };
}

/**
 * ISO 5725-2 §7.5, dependence of precision on level, the three relations:
 * I s = b·m, weighted by 1/ŝ² ∝ 1/m², which gives b = Σ(s_j/m_j)/q;
 * II s = a + b·m, weighted by 1/ŝ² and iterated (`weightedLinearFit`);
 * III log10 s = c + d·log10 m, unweighted (the logarithm already evens out the scatter).
 * I is not fitted when the levels include 0 or both signs (s would be 0 or
 * negative somewhere); III needs every level and s above 0.
 * Chosen: the smallest relative residual standard deviation (which charges each
 * relation for its parameters); within 1e-9 of each other, the simpler one.
 * The reason is given in words.
 */
export function levelFit(points: readonly LevelPoint[]): LevelFitResult {
  const notes: string[] = [];
  if (points.length < LEVEL_FIT_MIN_MATERIALS) {
    notes.push(`a level fit needs at least ${LEVEL_FIT_MIN_MATERIALS} materials, got ${points.length}`);
    return { candidates: [], chosen: null, reason: null, notes };
  }
  const candidates: LevelFitCandidate[] = [];
  const add = (model: LevelModel, iterations = 0) => {
    candidates.push({ ...model, residualSd: relativeResidualSd(model, points), iterations });
  };

  const oneSign = points.every((p) => p.level > 0) || points.every((p) => p.level < 0);
  if (oneSign) {
    let sum = 0;
    for (const { level, s } of points) sum += s / level;
    const b = sum / points.length;
    if (b !== 0) add({ relation: "proportional", formula: "s = b·m", b });
    else notes.push("every s is 0: s = b·m gives b = 0");
  } else {
    notes.push("the levels include 0 or cross it: s = b·m would make the precision 0 or negative there, so it is not fitted");
  }

  if (points.some((point) => point.level !== points[0].level)) {
    const line = weightedLinearFit(points);
    if ("failure" in line) notes.push(line.failure);
    else add({ relation: "linear", formula: "s = a + b·m", a: line.a, b: line.b }, line.iterations);
    if (points.every((point) => point.level > 0 && point.s > 0)) {
      const xs = points.map((p) => Math.log10(p.level));
      const ys = points.map((p) => Math.log10(p.s));
      const logLine = weightedLine(xs.map((x, i) => ({ level: x, s: ys[i] })), xs.map(() => 1));
      add({ relation: "log-linear", formula: "log10 s = c + d·log10 m", c: logLine.a, d: logLine.b });
    } else {
      notes.push("log s = c + d·log m needs every level and every s above 0");
    }
  } else {
    notes.push("all materials share one level: only s = b·m can be fitted");
  }

  let chosen: LevelFitCandidate | null = null;
  for (const candidate of candidates) {
    if (chosen === null || candidate.residualSd < chosen.residualSd * (1 - 1e-9) - 1e-15) chosen = candidate;
  }
  let reason: string | null = null;
  if (chosen !== null) {
    const percent = (x: number) => (Number.isFinite(x) ? `${(100 * x).toPrecision(2)} %` : "—");
    const others = candidates.filter((c) => c !== chosen).map((c) => `${c.formula} ${percent(c.residualSd)}`);
    reason =
      `${chosen.formula} has the smallest relative residual standard deviation, ${percent(chosen.residualSd)}` +
      (others.length > 0 ? ` (${others.join("; ")}); the simpler relation wins a tie` : "; the only relation that could be fitted");
  }
  return { candidates, chosen: chosen?.relation ?? null, reason, notes };
}
