/**
 * The OpenAPI 3.1 document of /api/v1, generated from the schemas the routes
 * parse with (./schemas.ts, through zod's JSON Schema output, draft 2020-12 as
 * OpenAPI 3.1 uses). One entry per route; a test checks that every /api/v1
 * route of app/routes.ts is here.
 */
import { z } from "zod";
import {
  apiErrorAnswer,
  bundleSummaryAnswer,
  describedObject,
  healthAnswer,
  idParam,
  importAnswer,
  pageQuery,
  resultsAnswer,
  resultsBody,
  roundListAnswer,
  significanceQuery,
  studyListAnswer,
  whatIfQuery,
} from "./schemas";

type PathId = "studyId" | "roundId" | "enrollmentId";

type Answer = { schema: z.ZodType } | { file: string };

export type ApiEndpoint = {
  method: "get" | "post";
  /** as app/routes.ts writes it, e.g. api/v1/studies/:studyId */
  path: string;
  summary: string;
  /** who may call it, in words; `null`: anyone, no credentials */
  who: string | null;
  query?: z.ZodObject;
  body?: z.ZodType;
  answer: Answer;
  /** failures besides 401 and 429, which every authenticated call can meet, and 404, which every id in the path can */
  errors?: number[];
};

const SIGNED_IN = "Everyone signed in.";
const STUDY_READERS = "The study's coordinators and admins (lab names), its reviewers (lab codes, submitted results only).";
const BUNDLE_READERS = "Coordinators, admins, reviewers; published studies only.";
const LAB_WRITERS = "Analysts of the enrollment's lab, or their results:write token for it.";
const ROUND_READERS = "Coordinators, admins, analysts of an enrolled lab.";

export const API_ENDPOINTS: ApiEndpoint[] = [
  { method: "get", path: "api/v1/healthz", summary: "Process up and database reachable (503 with the same shape when it is not).", who: null, answer: { schema: healthAnswer } },
  { method: "get", path: "api/v1/openapi.json", summary: "This document.", who: null, answer: { schema: describedObject("An OpenAPI 3.1 document.") } },
  {
    method: "get",
    path: "api/v1/studies",
    summary: "The studies the caller may see (a token: the one study it was made for), by code, 100 a page.",
    who: SIGNED_IN,
    query: pageQuery,
    answer: { schema: studyListAnswer },
  },
  {
    method: "get",
    path: "api/v1/studies/:studyId",
    summary: "Setup, responses, materials with mixture designs, and labs, blinded as the caller's role requires.",
    who: "Coordinators, admins, reviewers (lab codes), analysts of an enrolled lab (their own lab only).",
    answer: { schema: describedObject("{ study, responses[], materials[], labs[] }") },
  },
  {
    method: "get",
    path: "api/v1/studies/:studyId/progress",
    summary: "Cell status per lab × material, and counts per material.",
    who: "Coordinators and admins (every lab), analysts (their own lab's row).",
    answer: { schema: describedObject("{ labs[], materials[] } with each cell's status.") },
  },
  { method: "get", path: "api/v1/studies/:studyId/results", summary: "Results in long form, one row per replicate, with each cell's status and decision.", who: STUDY_READERS, answer: { schema: resultsAnswer } },
  { method: "get", path: "api/v1/studies/:studyId/results.csv", summary: "The same rows as CSV, headed by the JSON's keys.", who: STUDY_READERS, answer: { file: "text/csv" } },
  { method: "get", path: "api/v1/studies/:studyId/results.xlsx", summary: "The same rows as a spreadsheet.", who: STUDY_READERS, answer: { file: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet" } },
  {
    method: "get",
    path: "api/v1/studies/:studyId/analysis.csv",
    summary: "Each lab's cell statistics (mean, s, d, h, k, flags) beside its material's precision figures (s_r, s_R, r, R …), one row per material × response × lab.",
    who: STUDY_READERS,
    query: significanceQuery,
    answer: { file: "text/csv" },
    errors: [422],
  },
  {
    method: "get",
    path: "api/v1/studies/:studyId/analysis.xlsx",
    summary: "A spreadsheet with the precision figures, the labs' cell statistics and the excluded cells, one sheet each.",
    who: STUDY_READERS,
    query: significanceQuery,
    answer: { file: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet" },
    errors: [422],
  },
  {
    method: "get",
    path: "api/v1/studies/:studyId/precision",
    summary: "The precision engine's output over the submitted results, with the coordinator's exclusions applied.",
    who: "Coordinators, admins, reviewers.",
    query: significanceQuery,
    answer: { schema: describedObject("{ alpha, groups[] (per material × response: p, n, mean, s_r, s_R, r, R, labs[] with h, k, flags), excluded[], problems[], levelFits[], warnings[] }") },
    errors: [422],
  },
  {
    method: "get",
    path: "api/v1/studies/:studyId/what-if",
    summary: "The precision engine's output with exactly the listed cells left out instead of the saved decisions. Nothing is written.",
    who: "Coordinators and admins.",
    query: whatIfQuery,
    answer: { schema: describedObject("The same shape as …/precision.") },
    errors: [422],
  },
  {
    method: "get",
    path: "api/v1/studies/:studyId/bundle",
    summary: "The published statement's bundle: its SHA-256 and each file's.",
    who: BUNDLE_READERS,
    answer: { schema: bundleSummaryAnswer },
  },
  {
    method: "get",
    path: "api/v1/studies/:studyId/bundle.zip",
    summary: "Everything behind the published statement, to recompute it: results by lab code, decisions, design, figures, text, README, SHA256SUMS.",
    who: BUNDLE_READERS,
    answer: { file: "application/zip" },
  },
  {
    method: "get",
    path: "api/v1/enrollments/:enrollmentId/results",
    summary: "The lab's own stored results, each replicate with its version for a later write to name (readVersion).",
    who: LAB_WRITERS,
    answer: { schema: describedObject("{ enrollment: { id, studyId, labCode }, results[] } with each replicate's value and version.") },
  },
  {
    method: "post",
    path: "api/v1/enrollments/:enrollmentId/results",
    summary: "A lab writes draft results: all rows or none; the same request twice changes nothing; rows of submitted cells, and rows whose readVersion is no longer the stored one, are refused (409).",
    who: LAB_WRITERS,
    body: resultsBody,
    answer: { schema: importAnswer },
    errors: [400, 405, 409, 413, 422],
  },
  { method: "get", path: "api/v1/rounds", summary: "The proficiency rounds the caller may see.", who: SIGNED_IN, answer: { schema: roundListAnswer } },
  {
    method: "get",
    path: "api/v1/rounds/:roundId",
    summary: "Per material × response the assigned value, σ_pt and their basis (a lab: once the round is published). No lab scores, never lab names.",
    who: ROUND_READERS,
    answer: { schema: describedObject("{ round, figures[] }") },
  },
  {
    method: "get",
    path: "api/v1/rounds/:roundId/scores",
    summary: "Every lab's scores by code; a lab: its own scores and its history across rounds.",
    who: ROUND_READERS,
    answer: { schema: describedObject("{ published, scores[] } and, for a lab, { labCode, history[] }") },
  },
];

const STATUS_TEXT: Record<number, string> = {
  400: "Malformed JSON, or a body that is not UTF-8.",
  401: "No credentials, a bad or revoked token.",
  404: "Not found, or not yours (a study's existence does not leak).",
  405: "Wrong method.",
  409: "Conflict with the study's state or data (a submitted cell, a study not in testing).",
  413: "Body over 1 MB.",
  422: "Valid JSON or query, invalid content; details name the rows or fields.",
  429: "More requests in a minute than the limit; details give retryAfterSeconds.",
  503: "The database is unreachable.",
};

/** A zod schema as JSON Schema for the document: what a client sends (input) or receives (output). */
function jsonSchema(schema: z.ZodType, io: "input" | "output") {
  const { $schema: _dialect, ...rest } = z.toJSONSchema(schema, { io, unrepresentable: "any" });
  return rest;
}

/** `api/v1/studies/:studyId` → `/api/v1/studies/{studyId}` */
export const openApiPath = (routePath: string) => "/" + routePath.replace(/:(\w+)/g, "{$1}");

const pathIds = (endpoint: ApiEndpoint) => [...endpoint.path.matchAll(/:(\w+)/g)].map((m) => m[1] as PathId);

/** 401 and 429 for every authenticated call, 404 for an id in the path, then the endpoint's own. */
const failureStatuses = (endpoint: ApiEndpoint) =>
  [...(endpoint.who ? [401, 429] : []), ...(pathIds(endpoint).length ? [404] : []), ...(endpoint.errors ?? [])].sort((a, b) => a - b);

function operation(endpoint: ApiEndpoint) {
  const querySchema = endpoint.query ? jsonSchema(endpoint.query, "input") : null;
  const queryProperties = (querySchema?.properties ?? {}) as Record<string, { description?: string }>;
  const parameters = [
    ...pathIds(endpoint).map((name) => ({ name, in: "path", required: true, schema: jsonSchema(idParam, "input") })),
    ...Object.entries(queryProperties).map(([name, schema]) => ({ name, in: "query", required: false, description: schema.description, schema })),
  ];
  const success = "file" in endpoint.answer
    ? { description: "The file, as a download (Content-Disposition names it).", content: { [endpoint.answer.file]: { schema: { type: "string", contentMediaType: endpoint.answer.file } } } }
    : { description: "Success.", content: { "application/json": { schema: jsonSchema(endpoint.answer.schema, "output") } } };
  return {
    summary: endpoint.summary,
    description: endpoint.who ? `Who: ${endpoint.who}` : "Anyone; no credentials needed.",
    ...(endpoint.who ? {} : { security: [] }),
    ...(parameters.length ? { parameters } : {}),
    ...(endpoint.body ? { requestBody: { required: true, content: { "application/json": { schema: jsonSchema(endpoint.body, "input") } } } } : {}),
    responses: {
      200: success,
      ...(endpoint.method === "get" ? { 304: { description: "Not modified: the If-None-Match tag is still current." } } : {}),
      ...Object.fromEntries(failureStatuses(endpoint).map((status) => [String(status), { $ref: `#/components/responses/Error${status}` }])),
    },
  };
}

/** The document, with `origin` (the app's address) as its server. */
export function openApiDocument(origin: string) {
  const paths: Record<string, Record<string, ReturnType<typeof operation>>> = {};
  for (const endpoint of API_ENDPOINTS) (paths[openApiPath(endpoint.path)] ??= {})[endpoint.method] = operation(endpoint);
  const statuses = [...new Set(API_ENDPOINTS.flatMap(failureStatuses))].sort((a, b) => a - b);
  return {
    openapi: "3.1.0",
    info: {
      title: "Ringbatch API",
      version: "1",
      description:
        "Studies, results, precision figures and proficiency rounds. Authenticate with an API token from your account page (Authorization: Bearer rbt_…) " +
        "or with the browser's session. A token acts as its user for one study: results:write writes one enrollment's draft results, study:read reads that study as the user's role allows. " +
        "Reads answer with a strong ETag; send it back in If-None-Match to get 304 while nothing you may see has changed.",
    },
    servers: [{ url: origin }],
    security: [{ bearerToken: [] }, { session: [] }],
    paths,
    components: {
      securitySchemes: {
        bearerToken: { type: "http", scheme: "bearer", description: "An API token made on the account page (/account), shown once: rbt_…" },
        session: { type: "apiKey", in: "cookie", name: "__ringbatch_session", description: "The browser's session after signing in." },
      },
      schemas: { Error: jsonSchema(apiErrorAnswer, "output") },
      responses: Object.fromEntries(
        statuses.map((status) => [`Error${status}`, { description: STATUS_TEXT[status] ?? "Refused.", content: { "application/json": { schema: { $ref: "#/components/schemas/Error" } } } }]),
      ),
    },
  };
}
