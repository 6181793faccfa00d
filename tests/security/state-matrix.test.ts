/**
 * The state dimension of access control: every write a page or the API
 * offers, tried on a study in every state, as the person allowed to make it.
 * Each try gets a study of its own (so no write depends on another), and
 * the expected outcomes are the table beside this test
 * (state-matrix.expected.ts). A refused write answers 4xx and leaves the
 * study's audit trail and rows as they were; an allowed one records itself.
 */
import { count, eq } from "drizzle-orm";
import { createHash } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { db, type Transaction } from "~/db/client.server";
import {
  auditEvents,
  batches,
  cells,
  enrollments,
  labMembers,
  labs,
  materials,
  precisionStatements,
  queries,
  responses,
  results,
  reviewRounds,
  roundAssignments,
  roundSettings,
  ruggednessFactors,
  ruggednessPlans,
  roundReviewers,
  shipments,
  studies,
  studyReviewers,
  users,
  votes,
} from "~/db/schema";
import { STUDY_STATES, type StudyState } from "~/db/values";
import * as apiResults from "~/routes/api/v1/enrollment-results";
import * as labRoundPage from "~/routes/lab/rounds/round/uncertainty";
import * as assignedValuesPage from "~/routes/rounds/round/assigned-values";
import * as materialChecksPage from "~/routes/rounds/round/material-checks";
import * as roundScoresPage from "~/routes/rounds/round/scores";
import * as ruggednessFactorsPage from "~/routes/ruggedness/study/factors";
import * as ruggednessResultsPage from "~/routes/ruggedness/study/results";
import { randomRunOrder } from "~/lib/ruggedness";
import * as labQueries from "~/routes/lab/queries";
import * as importPage from "~/routes/lab/study/import";
import * as receiptPage from "~/routes/lab/study/receipt";
import * as entryPage from "~/routes/lab/study/result-entry";
import * as ballotPage from "~/routes/review/study/ballot";
import * as analysisPage from "~/routes/studies/study/analysis";
import * as labsPage from "~/routes/studies/study/labs";
import * as queriesPage from "~/routes/studies/study/queries";
import * as setupPage from "~/routes/studies/study/setup";
import * as shipmentsPage from "~/routes/studies/study/shipments";
import * as statementPage from "~/routes/studies/study/statement";
import { useFreshDatabase } from "../support/database";
import { call, sessionCookieFor } from "../support/routes";
import { ALLOWED_IN, KIND_ALLOWED_IN, KIND_WRITES, type KindWrite, type Write, WRITES } from "./state-matrix.expected";

const ORIGIN = "http://ringbatch.test";
// A minimal PDF: the upload check judges the type from these bytes.
const PDF = new TextEncoder().encode("%PDF-1.4\n1 0 obj<<>>endobj\ntrailer<<>>\n%%EOF\n");

type People = { coordinator: number; otherCoordinator: number; analyst: number; reviewers: number[]; spareReviewer: number; spareLab: number; awaitingLab: number; lab: number };
let people: People;
let fixtureCount = 0;

beforeAll(async () => {
  await useFreshDatabase();
  const person = async (email: string, role: "coordinator" | "analyst" | "reviewer") =>
    (await db.insert(users).values({ email, name: email.split("@")[0]!.replace(/-/g, " "), role }).returning())[0]!.id;
  const [lab] = await db.insert(labs).values({ name: "Granite Flats Test Lab" }).returning();
  const [spareLab] = await db.insert(labs).values({ name: "Quarry Bend Materials Lab", contactName: "Wren Okafor", contactEmail: "lab@quarry-bend.example" }).returning();
  const [awaitingLab] = await db.insert(labs).values({ name: "Millrace Concrete Lab" }).returning();
  const analyst = await person("tess-ferrow@ringbatch.example", "analyst");
  await db.insert(labMembers).values({ labId: lab!.id, userId: analyst, isContact: true });
  people = {
    coordinator: await person("ines-marlow@ringbatch.example", "coordinator"),
    otherCoordinator: await person("odo-brandt@ringbatch.example", "coordinator"),
    analyst,
    reviewers: [
      await person("rhea-caldon@ringbatch.example", "reviewer"),
      await person("piet-vonk@ringbatch.example", "reviewer"),
      await person("sela-ortiz@ringbatch.example", "reviewer"),
      await person("uma-reyes@ringbatch.example", "reviewer"),
    ],
    spareReviewer: await person("kai-lindqvist@ringbatch.example", "reviewer"),
    spareLab: spareLab!.id,
    awaitingLab: awaitingLab!.id,
    lab: lab!.id,
  };
});

type Fixture = {
  studyId: number;
  enrollmentId: number;
  /** A second accepted lab, still without a shipment. */
  awaitingEnrollmentId: number;
  materials: { submitted: number; draft: number };
  shipments: { shipped: number; preparing: number };
  statementId: number | null;
  queryId: number;
  votes: { unanswered: number; awaitingReply: number; maintained: number };
  submittedCellVersion: number;
};

/**
 * A study in `state` with one enrolled lab: material M1 submitted (two
 * replicates, an open correction query on its holes cell, a batch with a
 * slump reading), M2 complete in draft, one shipment shipped and one being
 * prepared, four reviewers; in checking a draft statement, in review a round
 * chaired by the first reviewer with an unanswered objection, an objection
 * awaiting its reviewer's reply, one maintained, and one approval.
 */
async function studyIn(state: StudyState): Promise<Fixture> {
  fixtureCount++;
  return db.transaction(async (tx) => {
    const [study] = await tx
      .insert(studies)
      .values({ code: `SM-${fixtureCount}`, title: `State matrix study ${fixtureCount}`, testMethod: "Float finishing test of fresh concrete", state, replicatesPerCell: 2, ownerId: people.coordinator })
      .returning();
    const studyId = study!.id;
    const [holes] = await tx
      .insert(responses)
      .values({ studyId, key: "holes", name: "Passes to close the preformed holes", unit: "passes", kind: "count", plausibleMin: 1, plausibleMax: 40 })
      .returning();
    const [m1, m2] = await tx.insert(materials).values([{ studyId, code: "M1", sortOrder: 0 }, { studyId, code: "M2", sortOrder: 1 }]).returning();
    const [enrollment, awaiting] = await acceptLabs(tx, studyId, [
      [people.lab, "L01"],
      [people.awaitingLab, "L02"],
    ]);
    await tx.insert(studyReviewers).values(people.reviewers.map((userId) => ({ studyId, userId })));
    const [shipped, preparing] = await tx
      .insert(shipments)
      .values([
        { enrollmentId: enrollment!.id, status: "shipped", note: "M1, M2", carrier: "Ridgeway Freight", shippedOn: "2026-01-05" },
        { enrollmentId: enrollment!.id, status: "preparing", note: "Replacement sand" },
      ])
      .returning();
    const [submittedCell, draftCell] = await tx
      .insert(cells)
      .values([
        { enrollmentId: enrollment!.id, materialId: m1!.id, responseId: holes.id, status: "submitted", submittedAt: new Date(), submittedBy: people.analyst, version: 1 },
        { enrollmentId: enrollment!.id, materialId: m2!.id, responseId: holes.id },
      ])
      .returning();
    const tested = { testedOn: "2026-01-10", operator: "T. Ferrow" };
    await tx.insert(results).values([
      { cellId: submittedCell!.id, replicate: 1, value: 11, ...tested },
      { cellId: submittedCell!.id, replicate: 2, value: 12, ...tested },
      { cellId: draftCell!.id, replicate: 1, value: 13, ...tested },
      { cellId: draftCell!.id, replicate: 2, value: 14, ...tested },
    ]);
    await tx.insert(batches).values({ enrollmentId: enrollment!.id, materialId: m1!.id, slumpMm: 40 });
    const [query] = await tx
      .insert(queries)
      .values({ cellId: submittedCell!.id, raisedBy: people.coordinator, question: "Replicate 2 reads 12; your log says 21. Which is right?", asksCorrection: true })
      .returning();
    let statementId: number | null = null;
    const voteIds = { unanswered: 0, awaitingReply: 0, maintained: 0 };
    if (state === "checking" || state === "in_review" || state === "published") {
      const statementState = state === "checking" ? "draft" : state === "in_review" ? "in_review" : "approved";
      const [statement] = await tx
        .insert(precisionStatements)
        .values({ studyId, version: 1, state: statementState, textE691: "Repeatability and reproducibility of the float finishing test.", textC670: "1s and d2s limits of the float finishing test.", snapshot: {}, dataVersion: 0, createdBy: people.coordinator, sentAt: state === "checking" ? null : new Date() })
        .returning();
      statementId = statement!.id;
      if (state !== "checking") {
        const [round] = await tx
          .insert(reviewRounds)
          .values({ statementId, chairId: people.reviewers[0]!, openedBy: people.coordinator, outcome: state === "in_review" ? "open" : "published" })
          .returning();
        await tx.insert(roundReviewers).values(people.reviewers.map((userId) => ({ roundId: round!.id, userId })));
        const now = new Date();
        const answered = { answer: "not_upheld" as const, answerRationale: "Six labs meet the method's minimum.", answeredBy: people.coordinator, answeredAt: now };
        const inserted = await tx
          .insert(votes)
          .values([
            { statementId, reviewerId: people.reviewers[1]!, choice: "object", reason: "Too few labs for material M2.", updatedAt: now },
            { statementId, reviewerId: people.reviewers[2]!, choice: "object", reason: "M1 replicate spread looks too tight.", updatedAt: now, ...answered },
            { statementId, reviewerId: people.reviewers[3]!, choice: "object", reason: "The slump range is not stated.", updatedAt: now, ...answered, objectorReply: "maintained", objectorReplyNote: "Still missing." },
          ])
          .returning();
        voteIds.unanswered = inserted[0]!.id;
        voteIds.awaitingReply = inserted[1]!.id;
        voteIds.maintained = inserted[2]!.id;
      }
    }
    return {
      studyId,
      enrollmentId: enrollment!.id,
      awaitingEnrollmentId: awaiting!.id,
      materials: { submitted: m1!.id, draft: m2!.id },
      shipments: { shipped: shipped!.id, preparing: preparing!.id },
      statementId,
      queryId: query!.id,
      votes: voteIds,
      submittedCellVersion: 1,
    };
  });
}

function form(path: string, fields: Record<string, string> | FormData, cookie: string) {
  const body = fields instanceof FormData ? fields : new URLSearchParams(fields);
  const headers: Record<string, string> = { Cookie: cookie, Origin: ORIGIN };
  if (!(fields instanceof FormData)) headers["Content-Type"] = "application/x-www-form-urlencoded";
  return new Request(ORIGIN + path, { method: "POST", headers, body });
}

function multipart(fields: Record<string, string>, file?: { field: string; name: string; type: string; bytes: Uint8Array<ArrayBuffer> }) {
  const data = new FormData();
  for (const [k, v] of Object.entries(fields)) data.set(k, v);
  if (file) data.set(file.field, new File([file.bytes], file.name, { type: file.type }));
  return data;
}

const today = () => new Date().toISOString().slice(0, 10);

/** How each write is made: the route module's action, its path, who posts it, and what. */
function attempt(write: Write, f: Fixture): { action: (args: never) => unknown; path: string; as: number; fields: Record<string, string> | FormData; params?: Record<string, string>; json?: unknown } {
  const studyPath = `/studies/${f.studyId}`;
  const labPath = `/lab/studies/${f.studyId}`;
  const details = { code: `SM-${f.studyId}`, title: `State matrix study`, testMethod: "Float finishing test of fresh concrete", replicatesPerCell: "2", significanceLevel: "0.005", targetSurfaceRating: "2", enrollmentDeadline: "", shipDate: "", resultsDue: "", notes: "" };
  const setup = (fields: Record<string, string> | FormData) => ({ action: setupPage.action, path: `${studyPath}/setup`, as: people.coordinator, fields });
  const entry = (materialId: number, fields: Record<string, string>) => ({ action: entryPage.action, path: `${labPath}/results/${materialId}`, as: people.analyst, fields: multipart(fields), params: { materialId: String(materialId) } });
  const changes = (rows: object[]) => JSON.stringify({ rows, fresh: {} });
  switch (write) {
    case "setup: study details":
      return setup({ intent: "study", ...details, title: "A retitled study" });
    case "setup: replicates per cell":
      return setup({ intent: "study", ...details, replicatesPerCell: "3" });
    case "setup: significance level":
      return setup({ intent: "study", ...details, significanceLevel: "0.01" });
    case "setup: add a response":
      return setup({ intent: "response-add", key: "edge", name: "Passes to finish the edge", unit: "passes", kind: "count", decimals: "0", plausibleMin: "1", plausibleMax: "40" });
    case "setup: fresh-property targets":
      return setup({ intent: "targets", slumpTarget: "50", slumpUnit: "mm", slumpTolerance: "", airTarget: "6", airTolerance: "" });
    case "setup: add a material":
      return setup({ intent: "material-add", code: "M9", description: "Paving mix with slag" });
    case "setup: replace the protocol":
      return setup(multipart({ intent: "protocol" }, { field: "protocol", name: "protocol-v2.pdf", type: "application/pdf", bytes: PDF }));
    case "setup: add a co-coordinator":
      return setup({ intent: "coordinator-add", email: "odo-brandt@ringbatch.example" });
    case "setup: add a reviewer":
      return setup({ intent: "reviewer-add", email: "kai-lindqvist@ringbatch.example" });
    case "setup: remove a reviewer":
      return setup({ intent: "reviewer-remove", id: String(people.reviewers[3]) });
    case "setup: cancel the study":
      return setup({ intent: "transition", to: "cancelled" });
    case "labs: invite a lab":
      return { action: labsPage.action, path: `${studyPath}/labs`, as: people.coordinator, fields: { intent: "invite", labId: String(people.spareLab) } };
    case "labs: invite a lab from outside the directory":
      return { action: labsPage.action, path: `${studyPath}/labs`, as: people.coordinator, fields: { intent: "invite-outside", labName: `Saltmarsh Test Lab ${studyPath}`, contactName: "Ada Saltmarsh", contactEmail: `ada${studyPath.replace(/\D/g, "")}@saltmarsh.example` } };
    case "labs: withdraw a lab":
      return { action: labsPage.action, path: `${studyPath}/labs`, as: people.coordinator, fields: { intent: "withdraw", enrollmentId: String(f.enrollmentId), reason: "The lab's curing room failed." } };
    case "shipments: create":
      return { action: shipmentsPage.action, path: `${studyPath}/shipments`, as: people.coordinator, fields: { intent: "create", enrollmentId: String(f.awaitingEnrollmentId), "items[0].description": "Spare cement", "items[0].quantity": "25", "items[0].unit": "kg", "items[0].lot": "C-114", "items[0].containerCount": "1", carrier: "", trackingNumber: "" } };
    case "shipments: mark shipped":
      return { action: shipmentsPage.action, path: `${studyPath}/shipments`, as: people.coordinator, fields: { intent: "ship", shipmentId: String(f.shipments.preparing), shippedOn: today(), carrier: "Ridgeway Freight", trackingNumber: "RF-2231" } };
    case "shipments: mark lost":
      return { action: shipmentsPage.action, path: `${studyPath}/shipments`, as: people.coordinator, fields: { intent: "lost", shipmentId: String(f.shipments.shipped) } };
    case "lab: confirm receipt":
      return { action: receiptPage.action, path: `${labPath}/receipt`, as: people.analyst, fields: multipart({ shipmentId: String(f.shipments.shipped), receivedOn: "2026-01-08", condition: "good", receiptNotes: "" }) };
    case "lab: save draft results":
      return entry(f.materials.draft, { intent: "draft", draft: changes([{ response: "holes", replicate: 2, value: "15", testedOn: "2026-01-10", operator: "T. Ferrow", readVersion: 1 }]) });
    case "lab: submit a material":
      return entry(f.materials.draft, { intent: "submit", draft: changes([]) });
    case "lab: amend a submitted result":
      return entry(f.materials.submitted, { intent: "amend", responseId: "", replicate: "2", version: String(f.submittedCellVersion), value: "21", reason: "Transcription error: the log says 21." });
    case "lab: amend fresh properties":
      return entry(f.materials.submitted, { intent: "amend-fresh", slump: "45", reason: "Slump was read on the wrong scale mark." });
    case "lab: import CSV": {
      // The import's confirmation, as the page sends it after its check: the file's digest and the version each row was read at (the fixture's draft replicate 2, version 1).
      const bytes = new TextEncoder().encode("material,response,replicate,value,tested_on,operator\nM2,holes,2,16,2026-01-10,T. Ferrow\n");
      const digest = createHash("sha256").update(bytes).digest("hex");
      return {
        action: importPage.action,
        path: `${labPath}/import`,
        as: people.analyst,
        fields: multipart({ intent: "import", digest, seen: JSON.stringify({ 2: 1 }) }, { field: "file", name: "results.csv", type: "text/csv", bytes }),
      };
    }
    case "api: write results":
      return { action: apiResults.action, path: `/api/v1/enrollments/${f.enrollmentId}/results`, as: people.analyst, fields: {}, params: { enrollmentId: String(f.enrollmentId) }, json: { results: [{ material: "M2", response: "holes", replicate: 2, value: 17, testedOn: "2026-01-10", operator: "T. Ferrow" }] } };
    case "lab: answer a query":
      return { action: labQueries.action, path: "/lab/queries", as: people.analyst, fields: { queryId: String(f.queryId), answer: "Our log says 21; we typed 12 by mistake." } };
    case "analysis: raise a query":
      return { action: analysisPage.action, path: `${studyPath}/analysis`, as: people.coordinator, fields: { intent: "ask", lab: "L01", material: "M1", response: "holes", statistic: "", question: "Was the float angle checked before replicate 1?" } };
    case "analysis: decide on a cell":
      return { action: analysisPage.action, path: `${studyPath}/analysis`, as: people.coordinator, fields: { intent: "decide", lab: "L01", material: "M1", response: "holes", decision: "retained", reason: "The lab confirmed the counts are right." } };
    case "queries: close a query":
      return { action: queriesPage.action, path: `${studyPath}/queries`, as: people.coordinator, fields: { intent: "close", queryId: String(f.queryId) } };
    case "statement: edit the text":
      return { action: statementPage.action, path: `${studyPath}/statement`, as: people.coordinator, fields: { intent: "save-text", statementId: String(f.statementId ?? 1), textE691: "Edited repeatability and reproducibility text of the statement.", textC670: "Edited 1s and d2s text of the statement, long enough." } };
    case "statement: send to the committee":
      return { action: statementPage.action, path: `${studyPath}/statement`, as: people.coordinator, fields: { intent: "send", statementId: String(f.statementId ?? 1), chairId: String(people.reviewers[0]) } };
    case "statement: answer an objection":
      return { action: statementPage.action, path: `${studyPath}/statement`, as: people.coordinator, fields: { intent: "answer", voteId: String(f.votes.unanswered || 1), answer: "not_upheld", rationale: "Material M2 has as many labs as the others." } };
    case "statement: publish":
      // The fixture's round is not ready; the write then needs its objections resolved first, so it goes with the ballot writes below.
      return { action: statementPage.action, path: `${studyPath}/statement`, as: people.coordinator, fields: { intent: "publish" } };
    case "review: vote":
      return { action: ballotPage.action, path: `/review/${f.studyId}`, as: people.reviewers[0]!, fields: { intent: "vote", choice: "approve", reason: "" } };
    case "review: comment":
      return { action: ballotPage.action, path: `/review/${f.studyId}`, as: people.reviewers[0]!, fields: { intent: "comment", body: "The C670 text reads well." } };
    case "review: reply to an answer":
      return { action: ballotPage.action, path: `/review/${f.studyId}`, as: people.reviewers[2]!, fields: { intent: "reply", reply: "withdrawn", note: "" } };
    case "review: rule on an objection":
      return { action: ballotPage.action, path: `/review/${f.studyId}`, as: people.reviewers[0]!, fields: { intent: "rule", voteId: String(f.votes.maintained || 1), ruling: "not_upheld", reason: "The slump range is in the protocol the statement cites." } };
  }
}

/** Everything a write could change about the study, counted. */
async function footprint(studyId: number) {
  const [audit] = await db.select({ n: count() }).from(auditEvents).where(eq(auditEvents.studyId, studyId));
  const study = await db.query.studies.findFirst({ where: eq(studies.id, studyId) });
  const stored = await db
    .select({ value: results.value, replicate: results.replicate })
    .from(results)
    .innerJoin(cells, eq(cells.id, results.cellId))
    .innerJoin(materials, eq(materials.id, cells.materialId))
    .where(eq(materials.studyId, studyId));
  return JSON.stringify({ audit: audit!.n, study, results: stored.sort((a, b) => a.value - b.value) });
}

/** Makes the fixture's round publishable: the objections resolved, as the committee would. */
async function readyToPublish(f: Fixture) {
  const now = new Date();
  await db.update(votes).set({ choice: "approve", reason: null }).where(eq(votes.id, f.votes.unanswered));
  await db.update(votes).set({ objectorReply: "withdrawn" }).where(eq(votes.id, f.votes.awaitingReply));
  await db.update(votes).set({ ruling: "not_upheld", rulingReason: "Ruled.", ruledAt: now }).where(eq(votes.id, f.votes.maintained));
  await db.insert(votes).values({ statementId: f.statementId!, reviewerId: people.reviewers[0]!, choice: "approve", updatedAt: now });
}

type Attempt = ReturnType<typeof attempt>;

/** Tries each write on a fresh fixture in every state; returns the states where it succeeded, checking the record either way. */
async function statesWhereItSucceeds<W extends string, F extends { studyId: number }>(writes: readonly W[], fixtureIn: (state: StudyState, write: W) => Promise<F>, attemptOf: (write: W, f: F) => Promise<Attempt> | Attempt) {
  const observed = {} as Record<W, StudyState[]>;
  const cookies = new Map<number, string>();
  const cookieOf = async (userId: number) => cookies.get(userId) ?? cookies.set(userId, await sessionCookieFor(userId)).get(userId)!;
  for (const write of writes) {
    observed[write] = [];
    for (const state of STUDY_STATES) {
      const fixture = await fixtureIn(state, write);
      const how = await attemptOf(write, fixture);
      const before = await footprint(fixture.studyId);
      const request = how.json
        ? new Request(ORIGIN + how.path, { method: "POST", headers: { Cookie: await cookieOf(how.as), "Content-Type": "application/json" }, body: JSON.stringify(how.json) })
        : form(how.path, how.fields, await cookieOf(how.as));
      const outcome = await call(how.action, request, { studyId: String(fixture.studyId), ...how.params });
      const after = await footprint(fixture.studyId);
      if (outcome.status < 400) {
        observed[write].push(state);
        expect(after, `${write} in ${state} answered ${outcome.status} but recorded nothing`).not.toBe(before);
      } else {
        expect(after, `${write} in ${state} was refused (${outcome.status}) but changed the record`).toBe(before);
      }
    }
  }
  return observed;
}

describe("every write in every study state", () => {
  it("succeeds exactly where the table says, and elsewhere refuses and changes nothing", async () => {
    const observed = await statesWhereItSucceeds(
      WRITES,
      async (state, write) => {
        const fixture = await studyIn(state);
        if (write === "statement: publish" && state === "in_review") await readyToPublish(fixture);
        return fixture;
      },
      async (write, fixture) => {
        const how = attempt(write, fixture);
        if (write === "lab: amend a submitted result") {
          const [holes] = await db.select().from(responses).where(eq(responses.studyId, fixture.studyId));
          (how.fields as FormData).set("responseId", String(holes.id));
        }
        return how;
      },
    );
    expect(observed).toEqual(ALLOWED_IN);
  });

  it("lets nothing through on a published study", () => {
    for (const write of WRITES) expect(ALLOWED_IN[write], write).not.toContain("published");
    for (const write of WRITES) expect(ALLOWED_IN[write], write).not.toContain("cancelled");
  });
});

type KindFixture = { studyId: number; enrollmentId: number; materialId: number; responseId: number };

/** The labs enrolled in the study and accepted, each under its lab code. */
function acceptLabs(tx: Transaction, studyId: number, labsWithCodes: [labId: number, labCode: string][]) {
  return tx
    .insert(enrollments)
    .values(labsWithCodes.map(([labId, labCode]) => ({ studyId, labId, labCode, state: "accepted" as const })))
    .returning();
}

/** A float finishing study of `kind` in `state`, one replicate a cell, with its one response (holes). */
async function insertStudyWithHoles(tx: Transaction, study: { code: string; title: string; kind: "proficiency" | "ruggedness"; state: StudyState }) {
  const [row] = await tx
    .insert(studies)
    .values({ ...study, testMethod: "Float finishing test of fresh concrete", replicatesPerCell: 1, ownerId: people.coordinator })
    .returning();
  const studyId = row!.id;
  const [holes] = await tx.insert(responses).values({ studyId, key: "holes", name: "Passes to close the preformed holes", unit: "passes", kind: "count", plausibleMin: 1, plausibleMax: 40 }).returning();
  return { studyId, holes: holes! };
}

/**
 * A proficiency round in `state`: one material, one response, two enrolled
 * labs with their submitted results, a reference assigned value with a fixed
 * σ_pt, and a justification for publishing without the material checks.
 */
async function roundIn(state: StudyState): Promise<KindFixture> {
  fixtureCount++;
  return db.transaction(async (tx) => {
    const { studyId, holes } = await insertStudyWithHoles(tx, { code: `SMR-${fixtureCount}`, title: `State matrix round ${fixtureCount}`, kind: "proficiency", state });
    const [m1] = await tx.insert(materials).values({ studyId, code: "M1", sortOrder: 0 }).returning();
    const [enrollment, second] = await acceptLabs(tx, studyId, [
      [people.lab, "P01"],
      [people.spareLab, "P02"],
    ]);
    const submitted = { materialId: m1!.id, responseId: holes.id, status: "submitted" as const, submittedAt: new Date(), submittedBy: people.analyst, version: 1 };
    const [cell, secondCell] = await tx
      .insert(cells)
      .values([
        { enrollmentId: enrollment!.id, ...submitted },
        { enrollmentId: second!.id, ...submitted },
      ])
      .returning();
    await tx.insert(results).values([
      { cellId: cell!.id, replicate: 1, value: 13, testedOn: "2026-01-10", operator: "T. Ferrow" },
      { cellId: secondCell!.id, replicate: 1, value: 11, testedOn: "2026-01-11", operator: "W. Okafor" },
    ]);
    await tx.insert(roundSettings).values({ studyId, precision: { sourceCode: null, analysis: null } });
    await tx.insert(roundAssignments).values({
      studyId,
      materialId: m1!.id,
      responseId: holes.id,
      assignedMethod: "reference",
      referenceValue: 12,
      referenceUncertainty: 0.2,
      sigmaMethod: "fixed",
      fixedSigma: 2,
      checkJustification: "One homogenised batch, split by riffling; the checks were waived for this round.",
    });
    return { studyId, enrollmentId: enrollment!.id, materialId: m1!.id, responseId: holes.id };
  });
}

/** A ruggedness study in `state` with its design laid out and no results yet. */
async function ruggednessIn(state: StudyState): Promise<KindFixture> {
  fixtureCount++;
  return db.transaction(async (tx) => {
    const { studyId, holes } = await insertStudyWithHoles(tx, { code: `SMG-${fixtureCount}`, title: `State matrix ruggedness ${fixtureCount}`, kind: "ruggedness", state });
    await tx.insert(ruggednessPlans).values({ studyId, runs: 8, replicates: 1, runOrderSeed: 7, runOrder: randomRunOrder(8, 7) });
    await tx.insert(ruggednessFactors).values({ studyId, column: 1, name: "Float angle", unit: "°", low: "5", high: "10" });
    return { studyId, enrollmentId: 0, materialId: 0, responseId: holes.id };
  });
}

function kindAttempt(write: KindWrite, f: KindFixture): Attempt {
  const roundParams = { roundId: String(f.studyId) };
  const group = { materialId: String(f.materialId), responseId: String(f.responseId) };
  const ruggednessParams = { ruggednessStudyId: String(f.studyId) };
  switch (write) {
    case "round: choose the assigned value and σ_pt":
      return { action: assignedValuesPage.action, path: `/rounds/${f.studyId}/assigned-values`, as: people.coordinator, params: roundParams, fields: { intent: "assignment", ...group, assignedMethod: "reference", referenceValue: "12.5", referenceUncertainty: "0.2", sigmaMethod: "fixed", fixedSigma: "2" } };
    case "round: enter homogeneity and stability results":
      return { action: materialChecksPage.action, path: `/rounds/${f.studyId}/material-checks`, as: people.coordinator, params: roundParams, fields: { intent: "checks", ...group, homogeneity: "12 13\n12 12\n13 13", stability: "12\n13", justification: "" } };
    case "round: lab enters its uncertainty":
      return { action: labRoundPage.action, path: `/lab/rounds/${f.studyId}`, as: people.analyst, params: roundParams, fields: { intent: "uncertainty", ...group, standardUncertainty: "0.5" } };
    case "round: publish":
      return { action: roundScoresPage.action, path: `/rounds/${f.studyId}/scores`, as: people.coordinator, params: roundParams, fields: { intent: "publish", confirm: "yes" } };
    case "ruggedness: lay out factors and design":
      return { action: ruggednessFactorsPage.action, path: `/ruggedness/${f.studyId}`, as: people.coordinator, params: ruggednessParams, fields: {
          replicates: "2",
          ...Object.fromEntries(
            ["Float angle", "Bleed water wait", "Float pressure"].flatMap((name, i) => [
              [`factors[${i}].name`, name],
              [`factors[${i}].low`, "low"],
              [`factors[${i}].high`, "high"],
            ]),
          ),
        },
      };
    case "ruggedness: enter results":
      return { action: ruggednessResultsPage.action, path: `/ruggedness/${f.studyId}/results`, as: people.coordinator, params: ruggednessParams, fields: { r1_1_holes: "12" } };
  }
}

describe("every write of a round or a ruggedness study in every state", () => {
  it("succeeds exactly where the table says, and elsewhere refuses and changes nothing", async () => {
    const observed = await statesWhereItSucceeds(KIND_WRITES, (state, write) => (write.startsWith("round") ? roundIn(state) : ruggednessIn(state)), kindAttempt);
    expect(observed).toEqual(KIND_ALLOWED_IN);
  });

  it("lets nothing through on a published or cancelled round", () => {
    for (const write of KIND_WRITES) expect(KIND_ALLOWED_IN[write], write).not.toContain("published");
    for (const write of KIND_WRITES) expect(KIND_ALLOWED_IN[write], write).not.toContain("cancelled");
  });
});
