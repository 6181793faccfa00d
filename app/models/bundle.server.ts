/**
 * The bundle behind a published precision statement: one zip with the
 * blinded results, the cell decisions with reasons, the design and the
 * engine's settings, the figures as published, a README and the SHA-256 of
 * each file. Built the same, byte for byte, every time (fixed entry dates),
 * so the zip's own SHA-256 can be printed beside the statement.
 */
import { createHash } from "node:crypto";
import { asc, and, eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { precisionStatements, responses, type Study } from "~/db/schema";
import { decisionsCsv } from "~/lib/bundle/decisions-csv";
import { bundleReadme } from "~/lib/bundle/readme";
import { RESULT_COLUMNS } from "~/lib/precision";
import type { StatementSnapshot } from "~/lib/statement-text";
import { studyResultRows } from "~/models/analysis.server";
import { listCellDecisions } from "~/models/decisions.server";
import Papa from "papaparse";


export type BundleFile = { name: string; sha256: string; bytes: number };
export type StatementBundle = { fileName: string; zip: Buffer; sha256: string; statementVersion: number; files: BundleFile[] };

export class BundleUnavailable extends Error {}

const sha256 = (data: Buffer | string) => createHash("sha256").update(data).digest("hex");

/** The command that recomputes the figures with Ringbatch's own engine, for the bundle unpacked in `bundle/`. */
function recomputeCommand(alpha: number, countResponses: readonly string[]) {
  const counts = countResponses.map((key) => ` --count ${key}`).join("");
  return `npm run -s precision -- bundle/results.csv --alpha ${alpha}${counts} --decisions bundle/decisions.csv`;
}

async function zip(entries: { name: string; content: Buffer }[], date: Date): Promise<Buffer> {
  // Loaded on the first bundle: most requests never need it.
  const { ZipArchive } = await import("archiver");
  return new Promise((resolve, reject) => {
    const archive = new ZipArchive({ zlib: { level: 9 } });
    const chunks: Buffer[] = [];
    archive.on("data", (chunk: Buffer) => chunks.push(chunk));
    archive.on("error", reject);
    archive.on("end", () => resolve(Buffer.concat(chunks)));
    for (const entry of entries) archive.append(entry.content, { name: entry.name, date });
    void archive.finalize();
  });
}

/** Builds the bundle afresh (the pages use the cached `statementBundle`). */
export async function buildStatementBundle(study: Study): Promise<StatementBundle> {
  const statement = await db.query.precisionStatements.findFirst({
    where: and(eq(precisionStatements.studyId, study.id), eq(precisionStatements.state, "approved")),
    orderBy: (s, { desc }) => [desc(s.version)],
  });
  if (!statement) throw new BundleUnavailable("This study has no approved statement.");
  if (statement.dataVersion !== study.dataVersion) throw new BundleUnavailable("The study's results changed after the statement was frozen; the bundle would not match it.");
  const snapshot = statement.snapshot as StatementSnapshot;
  const [rows, decisions, responseRows] = await Promise.all([
    studyResultRows(study.id, { submittedOnly: true, withoutWithdrawn: true }),
    listCellDecisions(study.id),
    db.select().from(responses).where(eq(responses.studyId, study.id)).orderBy(asc(responses.sortOrder)),
  ]);
  const alpha = snapshot.analysis.alpha;
  const responseKinds = Object.fromEntries(responseRows.map((r) => [r.key, r.kind]));
  const command = recomputeCommand(alpha, responseRows.filter((r) => r.kind === "count").map((r) => r.key));

  const resultsCsv = `${Papa.unparse({ fields: [...RESULT_COLUMNS], data: rows.map((r) => [r.labCode, r.material, r.response, r.replicate, r.value]) }, { newline: "\n" })}\n`;
  const design = {
    study: snapshot.study,
    statement: { version: statement.version, frozenAt: snapshot.frozenAt, dataVersion: snapshot.dataVersion },
    labs: snapshot.labs,
    replicatesPerCell: snapshot.replicates,
    materials: snapshot.materials,
    responses: responseRows.map(({ key, name, unit, kind, decimals }) => ({ key, name, unit, kind, decimals })),
    engine: { name: "Ringbatch precision engine (app/lib/precision)", alpha, responseKinds },
    recompute: command,
  };
  const statementText = `${statement.textE691.trim()}\n\n---\n\n${statement.textC670.trim()}\n`;
  const described = [
    { name: "results.csv", about: "every submitted result the analysis used, one row per replicate (lab, material, response, replicate, value); labs by blind code", content: resultsCsv },
    { name: "decisions.csv", about: "the coordinator's decision on each questioned cell (retained or excluded) with its reason", content: decisionsCsv(decisions.map((d) => ({ lab: d.lab, material: d.material, response: d.response, decision: d.decision, reason: d.reason }))) },
    { name: "design.json", about: "the study design (materials, responses and their kinds, replicates) and the engine's settings (significance level, count responses)", content: `${JSON.stringify(design, null, 2)}\n` },
    { name: "figures.json", about: "the analysis as frozen in the published statement: per material and response p, n, x̿, s_r, s_L, s_R, r, R, 1s, d2s, h, k, the outlier tests and the level relations", content: `${JSON.stringify(snapshot.analysis, null, 2)}\n` },
    { name: "statement.txt", about: "the published statement's text, in the ASTM E691 form and then the ASTM C670 form", content: statementText },
  ];
  const readme = bundleReadme({ study: snapshot.study, statementVersion: statement.version, frozenAt: snapshot.frozenAt, alpha, command, files: described });
  const entries = [{ name: "README.md", content: Buffer.from(readme) }, ...described.map((f) => ({ name: f.name, content: Buffer.from(f.content) }))];
  const sums = entries.map((e) => `${sha256(e.content)}  ${e.name}\n`).join("");
  entries.push({ name: "SHA256SUMS", content: Buffer.from(sums) });
  const archive = await zip(entries, new Date(snapshot.frozenAt));
  return {
    fileName: `${study.code}-statement-v${statement.version}-bundle.zip`,
    zip: archive,
    sha256: sha256(archive),
    statementVersion: statement.version,
    files: entries.map((e) => ({ name: e.name, sha256: sha256(e.content), bytes: e.content.length })),
  };
}

// A published study never changes, so one bundle per (study, data version) is kept.
const built = new Map<string, Promise<StatementBundle>>();

/** The bundle of a published study's approved statement; throws BundleUnavailable otherwise. */
export function statementBundle(study: Study): Promise<StatementBundle> {
  if (study.state !== "published") return Promise.reject(new BundleUnavailable("Bundles are made for published statements only."));
  const key = `${study.id}:${study.dataVersion}`;
  let bundle = built.get(key);
  if (!bundle) {
    bundle = buildStatementBundle(study);
    bundle.catch(() => built.delete(key));
    if (built.size > 50) built.delete(built.keys().next().value!);
    built.set(key, bundle);
  }
  return bundle;
}
