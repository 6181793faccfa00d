/**
 * Who may reach what: the expected status of every route for each persona,
 * in the order anonymous, admin, the study's coordinator, another study's
 * coordinator, an analyst of an enrolled lab, an analyst of another lab, the
 * study's reviewer, another study's reviewer (product design, "Roles and what
 * each may touch"). GET calls the loader; POST calls the action with an empty
 * form, so 400 means "allowed in, and the input was checked". Out of scope is
 * 404 (never 403); signed-out pages redirect to sign-in (302), the API says 401.
 */
import type { Persona } from "./personas";

export type Method = "GET" | "POST";

const row = (...statuses: number[]): Record<Persona, number> => {
  const [anonymous, admin, coordinator, otherCoordinator, analyst, otherAnalyst, reviewer, otherReviewer] = statuses as [number, number, number, number, number, number, number, number];
  return { anonymous, admin, coordinator, otherCoordinator, analyst, otherAnalyst, reviewer, otherReviewer };
};

export const EXPECTED: Record<string, Partial<Record<Method, Record<Persona, number>>>> = {
  "": { GET: row(302, 302, 302, 302, 302, 302, 302, 302) },
  "login": { GET: row(200, 302, 302, 302, 302, 302, 302, 302), POST: row(400, 400, 400, 400, 400, 400, 400, 400) },
  "logout": { GET: row(302, 302, 302, 302, 302, 302, 302, 302), POST: row(302, 302, 302, 302, 302, 302, 302, 302) },
  "account": { GET: row(302, 200, 200, 200, 200, 200, 200, 200), POST: row(302, 400, 400, 400, 400, 400, 400, 400) },
  "account/api": { GET: row(302, 200, 200, 200, 200, 200, 200, 200) },
  "studies": { GET: row(302, 200, 200, 200, 404, 404, 404, 404) },
  "studies/new": { GET: row(302, 404, 200, 200, 404, 404, 404, 404), POST: row(302, 404, 400, 400, 404, 404, 404, 404) },
  "studies/:studyId [layout]": { GET: row(302, 200, 200, 404, 404, 404, 200, 404) },
  "lab/studies/:studyId [layout]": { GET: row(302, 404, 404, 404, 200, 404, 404, 404) },
  "review/:studyId [layout]": { GET: row(302, 404, 404, 404, 404, 404, 200, 404) },
  "studies/:studyId": { GET: row(302, 200, 200, 404, 404, 404, 404, 404), POST: row(302, 404, 400, 404, 404, 404, 404, 404) },
  "studies/:studyId/setup": { GET: row(302, 200, 200, 404, 404, 404, 200, 404), POST: row(302, 404, 400, 404, 404, 404, 404, 404) },
  "studies/:studyId/results": { GET: row(302, 200, 200, 404, 404, 404, 404, 404) },
  "studies/:studyId/materials/:materialId": { GET: row(302, 200, 200, 404, 404, 404, 200, 404), POST: row(302, 404, 400, 404, 404, 404, 404, 404) },
  "studies/:studyId/labs": { GET: row(302, 200, 200, 404, 404, 404, 404, 404), POST: row(302, 404, 400, 404, 404, 404, 404, 404) },
  "studies/:studyId/shipments": { GET: row(302, 200, 200, 404, 404, 404, 404, 404), POST: row(302, 404, 400, 404, 404, 404, 404, 404) },
  "studies/:studyId/shipments/:shipmentId/packing-list": { GET: row(302, 200, 200, 404, 404, 404, 404, 404) },
  "lab/studies/:studyId/receipt": { GET: row(302, 404, 404, 404, 200, 404, 404, 404), POST: row(302, 404, 404, 404, 400, 404, 404, 404) },
  "api/v1/studies/:studyId/progress": { GET: row(401, 200, 200, 404, 200, 404, 404, 404) },
  "invite/:token": { GET: row(404, 404, 404, 404, 404, 404, 404, 404), POST: row(404, 404, 404, 404, 404, 404, 404, 404) },
  "welcome/:token": { GET: row(404, 404, 404, 404, 404, 404, 404, 404), POST: row(404, 404, 404, 404, 404, 404, 404, 404) },
  "setup/:token": { GET: row(404, 404, 404, 404, 404, 404, 404, 404), POST: row(404, 404, 404, 404, 404, 404, 404, 404) },
  "forgot-password": { GET: row(200, 302, 302, 302, 302, 302, 302, 302), POST: row(400, 400, 400, 400, 400, 400, 400, 400) },
  "reset-password/:token": { GET: row(404, 404, 404, 404, 404, 404, 404, 404), POST: row(404, 404, 404, 404, 404, 404, 404, 404) },
  "dev/mailbox": { GET: row(302, 200, 200, 200, 404, 404, 404, 404) },
  "dev/mailbox/:messageId": { GET: row(302, 200, 200, 404, 404, 404, 404, 404) },
  "lab": { GET: row(302, 404, 404, 404, 200, 200, 404, 404), POST: row(302, 404, 404, 404, 400, 400, 404, 404) },
  "lab/studies/:studyId": { GET: row(302, 404, 404, 404, 200, 404, 404, 404) },
  "lab/studies/:studyId/protocol": { GET: row(302, 404, 404, 404, 200, 404, 404, 404) },
  "lab/studies/:studyId/results/:materialId": { GET: row(302, 404, 404, 404, 200, 404, 404, 404), POST: row(302, 404, 404, 404, 400, 404, 404, 404) },
  "lab/studies/:studyId/batch/:materialId": { GET: row(302, 404, 404, 404, 200, 404, 404, 404), POST: row(302, 404, 404, 404, 400, 404, 404, 404) },
  "lab/studies/:studyId/import": { GET: row(302, 404, 404, 404, 200, 404, 404, 404), POST: row(302, 404, 404, 404, 400, 404, 404, 404) },
  "lab/studies/:studyId/results/:materialId/photo": { POST: row(302, 404, 404, 404, 400, 404, 404, 404) },
  "lab/studies/:studyId/import/template.csv": { GET: row(302, 404, 404, 404, 200, 404, 404, 404) },
  "lab/studies/:studyId/import/template.xlsx": { GET: row(302, 404, 404, 404, 200, 404, 404, 404) },
  "lab/queries": { GET: row(302, 404, 404, 404, 200, 200, 404, 404), POST: row(302, 404, 404, 404, 400, 400, 404, 404) },
  "review": { GET: row(302, 404, 404, 404, 404, 404, 200, 200) },
  "admin/users": { GET: row(302, 200, 404, 404, 404, 404, 404, 404), POST: row(302, 400, 404, 404, 404, 404, 404, 404) },
  "admin/labs": { GET: row(302, 200, 404, 404, 404, 404, 404, 404), POST: row(302, 400, 404, 404, 404, 404, 404, 404) },
  "files/:fileId": { GET: row(302, 200, 200, 404, 200, 404, 200, 404) },
  "healthz": { GET: row(200, 200, 200, 200, 200, 200, 200, 200) },
  "api/v1/healthz": { GET: row(200, 200, 200, 200, 200, 200, 200, 200) },
  "api/v1/openapi.json": { GET: row(200, 200, 200, 200, 200, 200, 200, 200) },
  "api/v1/studies": { GET: row(401, 200, 200, 200, 200, 200, 200, 200) },
  "api/v1/studies/:studyId": { GET: row(401, 200, 200, 404, 200, 404, 200, 404) },
  "api/v1/studies/:studyId/results": { GET: row(401, 200, 200, 404, 404, 404, 200, 404) },
  "api/v1/studies/:studyId/results.csv": { GET: row(401, 200, 200, 404, 404, 404, 200, 404) },
  "api/v1/studies/:studyId/results.xlsx": { GET: row(401, 200, 200, 404, 404, 404, 200, 404) },
  "api/v1/studies/:studyId/analysis.csv": { GET: row(401, 200, 200, 404, 404, 404, 200, 404) },
  "api/v1/studies/:studyId/analysis.xlsx": { GET: row(401, 200, 200, 404, 404, 404, 200, 404) },
  "api/v1/studies/:studyId/precision": { GET: row(401, 200, 200, 404, 404, 404, 200, 404) },
  "api/v1/enrollments/:enrollmentId/results": { GET: row(401, 404, 404, 404, 200, 404, 404, 404), POST: row(401, 404, 404, 404, 400, 404, 404, 404) },
  "studies/:studyId/queries": { GET: row(302, 200, 200, 404, 404, 404, 404, 404), POST: row(302, 404, 400, 404, 404, 404, 404, 404) },
  "studies/:studyId/statement": { GET: row(302, 200, 200, 404, 404, 404, 404, 404), POST: row(302, 404, 400, 404, 404, 404, 404, 404) },
  "studies/:studyId/report": { GET: row(302, 200, 200, 404, 404, 404, 200, 404) },
  "review/:studyId": { GET: row(302, 404, 404, 404, 404, 404, 200, 404), POST: row(302, 404, 404, 404, 404, 404, 400, 404) },
  "api/v1/studies/:studyId/what-if": { GET: row(401, 200, 200, 404, 404, 404, 404, 404) },
  "studies/:studyId/analysis": { GET: row(302, 200, 200, 404, 404, 404, 404, 404), POST: row(302, 404, 400, 404, 404, 404, 404, 404) },
  "rounds": { GET: row(302, 200, 200, 200, 404, 404, 404, 404) },
  "rounds/new": { GET: row(302, 404, 200, 200, 404, 404, 404, 404), POST: row(302, 404, 400, 400, 404, 404, 404, 404) },
  "rounds/:roundId [layout]": { GET: row(302, 200, 200, 404, 404, 404, 404, 404) },
  "rounds/:roundId": { GET: row(302, 200, 200, 404, 404, 404, 404, 404), POST: row(302, 404, 400, 404, 404, 404, 404, 404) },
  "rounds/:roundId/assigned-values": { GET: row(302, 200, 200, 404, 404, 404, 404, 404), POST: row(302, 404, 400, 404, 404, 404, 404, 404) },
  "rounds/:roundId/material-checks": { GET: row(302, 200, 200, 404, 404, 404, 404, 404), POST: row(302, 404, 400, 404, 404, 404, 404, 404) },
  "rounds/:roundId/scores": { GET: row(302, 200, 200, 404, 404, 404, 404, 404), POST: row(302, 404, 400, 404, 404, 404, 404, 404) },
  "rounds/:roundId/report": { GET: row(302, 200, 200, 404, 404, 404, 404, 404) },
  "lab/rounds": { GET: row(302, 404, 404, 404, 200, 200, 404, 404) },
  "lab/rounds/:roundId [layout]": { GET: row(302, 404, 404, 404, 200, 404, 404, 404) },
  "lab/rounds/:roundId": { GET: row(302, 404, 404, 404, 200, 404, 404, 404), POST: row(302, 404, 404, 404, 400, 404, 404, 404) },
  "lab/rounds/:roundId/letter": { GET: row(302, 404, 404, 404, 200, 404, 404, 404) },
  "api/v1/rounds": { GET: row(401, 200, 200, 200, 200, 200, 200, 200) },
  "api/v1/rounds/:roundId": { GET: row(401, 200, 200, 404, 200, 404, 404, 404) },
  "api/v1/rounds/:roundId/scores": { GET: row(401, 200, 200, 404, 200, 404, 404, 404) },
  // Method toolkit: ruggedness studies are their coordinator's (admins read); comparisons are anyone's own; bundles only for published studies.
  "ruggedness": { GET: row(302, 200, 200, 200, 404, 404, 404, 404) },
  "ruggedness/new": { GET: row(302, 404, 200, 200, 404, 404, 404, 404), POST: row(302, 404, 400, 400, 404, 404, 404, 404) },
  "ruggedness/:ruggednessStudyId [layout]": { GET: row(302, 200, 200, 404, 404, 404, 404, 404) },
  "ruggedness/:ruggednessStudyId": { GET: row(302, 200, 200, 404, 404, 404, 404, 404), POST: row(302, 404, 400, 404, 404, 404, 404, 404) },
  "ruggedness/:ruggednessStudyId/design": { GET: row(302, 200, 200, 404, 404, 404, 404, 404) },
  "ruggedness/:ruggednessStudyId/results": { GET: row(302, 200, 200, 404, 404, 404, 404, 404), POST: row(302, 404, 400, 404, 404, 404, 404, 404) },
  "ruggedness/:ruggednessStudyId/effects": { GET: row(302, 200, 200, 404, 404, 404, 404, 404) },
  "ruggedness/:ruggednessStudyId/conclusions": { GET: row(302, 200, 200, 404, 404, 404, 404, 404) },
  "compare": { GET: row(302, 200, 200, 200, 200, 200, 200, 200) },
  "compare/new": { GET: row(302, 200, 200, 200, 200, 200, 200, 200), POST: row(302, 400, 400, 400, 400, 400, 400, 400) },
  "compare/:comparisonId": { GET: row(302, 404, 404, 404, 200, 404, 404, 404) },
  // The matrix's study is not published, so no one gets its bundle; tests/integration/statement-bundle.test.ts covers a published one.
  "api/v1/studies/:studyId/bundle": { GET: row(401, 404, 404, 404, 404, 404, 404, 404) },
  "api/v1/studies/:studyId/bundle.zip": { GET: row(401, 404, 404, 404, 404, 404, 404, 404) },
};
