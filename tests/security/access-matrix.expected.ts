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

// Access that several routes share, by name; a route whose access changes needs its own row (or another name) to pass.
/** The study's (round's, ruggedness study's) own coordinator works here; an admin reads. */
const OWN_COORDINATOR_WRITES = { GET: row(302, 200, 200, 404, 404, 404, 404, 404), POST: row(302, 404, 400, 404, 404, 404, 404, 404) };
const OWN_COORDINATOR_READS = { GET: OWN_COORDINATOR_WRITES.GET };
/** The enrolled lab's analyst works here, no one else. */
const OWN_LAB_WRITES = { GET: row(302, 404, 404, 404, 200, 404, 404, 404), POST: row(302, 404, 404, 404, 400, 404, 404, 404) };
const OWN_LAB_READS = { GET: OWN_LAB_WRITES.GET };
/** Any coordinator (and an admin) lists; any coordinator, not an admin, starts a new one. */
const COORDINATORS_READ = { GET: row(302, 200, 200, 200, 404, 404, 404, 404) };
const COORDINATORS_CREATE = { GET: row(302, 404, 200, 200, 404, 404, 404, 404), POST: row(302, 404, 400, 400, 404, 404, 404, 404) };
/** A study's data through the API: its coordinator, admins and its reviewers. */
const API_STUDY_READERS = { GET: row(401, 200, 200, 404, 404, 404, 200, 404) };
/** Through the API: the coordinator, admins and the enrolled lab (its own part). */
const API_COORDINATOR_AND_OWN_LAB = { GET: row(401, 200, 200, 404, 200, 404, 404, 404) };
/** A link's page with a token no one was sent. */
const NO_SUCH_TOKEN = { GET: row(404, 404, 404, 404, 404, 404, 404, 404), POST: row(404, 404, 404, 404, 404, 404, 404, 404) };
const ANYONE = { GET: row(200, 200, 200, 200, 200, 200, 200, 200) };

export const EXPECTED: Record<string, Partial<Record<Method, Record<Persona, number>>>> = {
  "": { GET: row(302, 302, 302, 302, 302, 302, 302, 302) },
  "login": { GET: row(200, 302, 302, 302, 302, 302, 302, 302), POST: row(400, 400, 400, 400, 400, 400, 400, 400) },
  "logout": { GET: row(302, 302, 302, 302, 302, 302, 302, 302), POST: row(302, 302, 302, 302, 302, 302, 302, 302) },
  "account": { GET: row(302, 200, 200, 200, 200, 200, 200, 200), POST: row(302, 400, 400, 400, 400, 400, 400, 400) },
  "account/api": { GET: row(302, 200, 200, 200, 200, 200, 200, 200) },
  "studies": COORDINATORS_READ,
  "studies/new": COORDINATORS_CREATE,
  "studies/:studyId [layout]": { GET: row(302, 200, 200, 404, 404, 404, 200, 404) },
  "lab/studies/:studyId [layout]": OWN_LAB_READS,
  "review/:studyId [layout]": { GET: row(302, 404, 404, 404, 404, 404, 200, 404) },
  "studies/:studyId": OWN_COORDINATOR_WRITES,
  "studies/:studyId/setup": { GET: row(302, 200, 200, 404, 404, 404, 200, 404), POST: row(302, 404, 400, 404, 404, 404, 404, 404) },
  "studies/:studyId/results": OWN_COORDINATOR_READS,
  "studies/:studyId/materials/:materialId": { GET: row(302, 200, 200, 404, 404, 404, 200, 404), POST: row(302, 404, 400, 404, 404, 404, 404, 404) },
  "studies/:studyId/labs": OWN_COORDINATOR_WRITES,
  "studies/:studyId/shipments": OWN_COORDINATOR_WRITES,
  "studies/:studyId/shipments/:shipmentId/packing-list": OWN_COORDINATOR_READS,
  "lab/studies/:studyId/receipt": OWN_LAB_WRITES,
  "api/v1/studies/:studyId/progress": API_COORDINATOR_AND_OWN_LAB,
  "invite/:token": NO_SUCH_TOKEN,
  "welcome/:token": NO_SUCH_TOKEN,
  "setup/:token": NO_SUCH_TOKEN,
  "forgot-password": { GET: row(200, 302, 302, 302, 302, 302, 302, 302), POST: row(400, 400, 400, 400, 400, 400, 400, 400) },
  "reset-password/:token": NO_SUCH_TOKEN,
  "dev/mailbox": COORDINATORS_READ,
  "dev/mailbox/:messageId": OWN_COORDINATOR_READS,
  "lab": { GET: row(302, 404, 404, 404, 200, 200, 404, 404), POST: row(302, 404, 404, 404, 400, 400, 404, 404) },
  "lab/studies/:studyId": OWN_LAB_READS,
  "lab/studies/:studyId/protocol": OWN_LAB_READS,
  "lab/studies/:studyId/results/:materialId": OWN_LAB_WRITES,
  "lab/studies/:studyId/batch/:materialId": OWN_LAB_WRITES,
  "lab/studies/:studyId/import": OWN_LAB_WRITES,
  "lab/studies/:studyId/results/:materialId/photo": { POST: row(302, 404, 404, 404, 400, 404, 404, 404) },
  "lab/studies/:studyId/import/template.csv": OWN_LAB_READS,
  "lab/studies/:studyId/import/template.xlsx": OWN_LAB_READS,
  "lab/queries": { GET: row(302, 404, 404, 404, 200, 200, 404, 404), POST: row(302, 404, 404, 404, 400, 400, 404, 404) },
  "review": { GET: row(302, 404, 404, 404, 404, 404, 200, 200) },
  "admin/users": { GET: row(302, 200, 404, 404, 404, 404, 404, 404), POST: row(302, 400, 404, 404, 404, 404, 404, 404) },
  "admin/labs": { GET: row(302, 200, 404, 404, 404, 404, 404, 404), POST: row(302, 400, 404, 404, 404, 404, 404, 404) },
  "files/:fileId": { GET: row(302, 200, 200, 404, 200, 404, 200, 404) },
  "healthz": ANYONE,
  "api/v1/healthz": ANYONE,
  "api/v1/openapi.json": ANYONE,
  "api/v1/studies": { GET: row(401, 200, 200, 200, 200, 200, 200, 200) },
  "api/v1/studies/:studyId": { GET: row(401, 200, 200, 404, 200, 404, 200, 404) },
  "api/v1/studies/:studyId/results": API_STUDY_READERS,
  "api/v1/studies/:studyId/results.csv": API_STUDY_READERS,
  "api/v1/studies/:studyId/results.xlsx": API_STUDY_READERS,
  "api/v1/studies/:studyId/analysis.csv": API_STUDY_READERS,
  "api/v1/studies/:studyId/analysis.xlsx": API_STUDY_READERS,
  "api/v1/studies/:studyId/precision": API_STUDY_READERS,
  "api/v1/enrollments/:enrollmentId/results": { GET: row(401, 404, 404, 404, 200, 404, 404, 404), POST: row(401, 404, 404, 404, 400, 404, 404, 404) },
  "studies/:studyId/queries": OWN_COORDINATOR_WRITES,
  "studies/:studyId/statement": OWN_COORDINATOR_WRITES,
  "studies/:studyId/report": { GET: row(302, 200, 200, 404, 404, 404, 200, 404) },
  "review/:studyId": { GET: row(302, 404, 404, 404, 404, 404, 200, 404), POST: row(302, 404, 404, 404, 404, 404, 400, 404) },
  "api/v1/studies/:studyId/what-if": { GET: row(401, 200, 200, 404, 404, 404, 404, 404) },
  "studies/:studyId/analysis": OWN_COORDINATOR_WRITES,
  "rounds": COORDINATORS_READ,
  "rounds/new": COORDINATORS_CREATE,
  "rounds/:roundId [layout]": OWN_COORDINATOR_READS,
  "rounds/:roundId": OWN_COORDINATOR_WRITES,
  "rounds/:roundId/assigned-values": OWN_COORDINATOR_WRITES,
  "rounds/:roundId/material-checks": OWN_COORDINATOR_WRITES,
  "rounds/:roundId/scores": OWN_COORDINATOR_WRITES,
  "rounds/:roundId/report": OWN_COORDINATOR_READS,
  "lab/rounds": { GET: row(302, 404, 404, 404, 200, 200, 404, 404) },
  "lab/rounds/:roundId [layout]": OWN_LAB_READS,
  "lab/rounds/:roundId": OWN_LAB_WRITES,
  "lab/rounds/:roundId/letter": OWN_LAB_READS,
  "api/v1/rounds": { GET: row(401, 200, 200, 200, 200, 200, 200, 200) },
  "api/v1/rounds/:roundId": API_COORDINATOR_AND_OWN_LAB,
  "api/v1/rounds/:roundId/scores": API_COORDINATOR_AND_OWN_LAB,
  // Method toolkit: ruggedness studies are their coordinator's (admins read); comparisons are anyone's own; bundles only for published studies.
  "ruggedness": COORDINATORS_READ,
  "ruggedness/new": COORDINATORS_CREATE,
  "ruggedness/:ruggednessStudyId [layout]": OWN_COORDINATOR_READS,
  "ruggedness/:ruggednessStudyId": OWN_COORDINATOR_WRITES,
  "ruggedness/:ruggednessStudyId/design": OWN_COORDINATOR_READS,
  "ruggedness/:ruggednessStudyId/results": OWN_COORDINATOR_WRITES,
  "ruggedness/:ruggednessStudyId/effects": OWN_COORDINATOR_READS,
  "ruggedness/:ruggednessStudyId/conclusions": OWN_COORDINATOR_READS,
  "compare": { GET: row(302, 200, 200, 200, 200, 200, 200, 200) },
  "compare/new": { GET: row(302, 200, 200, 200, 200, 200, 200, 200), POST: row(302, 400, 400, 400, 400, 400, 400, 400) },
  "compare/:comparisonId": { GET: row(302, 404, 404, 404, 200, 404, 404, 404) },
  // The matrix's study is not published, so no one gets its bundle; tests/integration/statement-bundle.test.ts covers a published one.
  "api/v1/studies/:studyId/bundle": { GET: row(401, 404, 404, 404, 404, 404, 404, 404) },
  "api/v1/studies/:studyId/bundle.zip": { GET: row(401, 404, 404, 404, 404, 404, 404, 404) },
};
