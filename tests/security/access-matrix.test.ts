/**
 * Walks every route in app/routes.ts — pages, actions and API — as each kind
 * of person, and compares the status with the expected matrix beside this
 * test (access-matrix.expected.ts). A route without an entry fails the test,
 * so a new route cannot ship without someone deciding who may reach it.
 * On the way, every answer an analyst or a reviewer gets is checked for what
 * they must never see: another lab's data or code, or any lab's name.
 */
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { cells, comparisons, enrollments, labs, materials, results, shipments, studies } from "~/db/schema";
import { composeEmail, sendEmail } from "~/server/email.server";
import { storeUpload } from "~/server/uploads.server";
import routeConfig from "~/routes";
import { DEMO_LABS } from "../../seed/demo-data";
import { RUGGEDNESS_STUDY_CODE } from "../../seed/toolkit-demo";
import { ONE_PIXEL_PNG } from "./support";
import { useFreshDatabase } from "../support/database";
import { call, type RouteOutcome } from "../support/routes";
import { EXPECTED, type Method } from "./access-matrix.expected";
import { recordFigure } from "./figures";
import { type Persona, PERSONAS, seedPersonas } from "./personas";

type RouteEntry = { path?: string; file: string; index?: boolean; children?: RouteEntry[] };

const ORIGIN = "http://ringbatch.test";
const PNG = ONE_PIXEL_PNG;

let cookieFor: (persona: Persona) => Promise<string | undefined>;
let params: Record<string, string>;
let ownLabCode: string;
/** Codes other labs hold in the study and the analyst's own lab holds in none. */
let otherLabCodes: string[];

beforeAll(async () => {
  await useFreshDatabase();
  ({ cookieFor } = await seedPersonas());
  const study = (await db.query.studies.findFirst({ where: eq(studies.code, "FF-2026-B") }))!;
  const material = (await db.query.materials.findFirst({ where: and(eq(materials.studyId, study.id), eq(materials.code, "F1")) }))!;
  const studyEnrollments = await db
    .select({ id: enrollments.id, code: enrollments.labCode, labName: labs.name, labId: labs.id })
    .from(enrollments)
    .innerJoin(labs, eq(labs.id, enrollments.labId))
    .where(eq(enrollments.studyId, study.id));
  const own = studyEnrollments.find((e) => e.labName === DEMO_LABS[0].name)!;
  ownLabCode = own.code!;
  const ownCodes = (await db.select({ code: enrollments.labCode }).from(enrollments).where(eq(enrollments.labId, own.labId))).map((e) => e.code);
  otherLabCodes = studyEnrollments.filter((e) => e.id !== own.id && !ownCodes.includes(e.code)).map((e) => e.code!);
  // A surface photo on one of the analyst's own results, for /files/:fileId.
  const analyst = (await db.query.users.findFirst({ where: (u, { eq }) => eq(u.email, "analyst1@ringbatch.example") }))!;
  const photo = await storeUpload(new File([PNG], "surface.png"), { allowed: ["image/png"], maxBytes: 1024, uploadedBy: analyst.id });
  const [cell] = await db.select().from(cells).where(and(eq(cells.enrollmentId, own.id), eq(cells.materialId, material.id)));
  await db.update(results).set({ photoAttachmentId: photo.id }).where(eq(results.cellId, cell!.id));
  // The demo's published proficiency round, where the analyst's lab has a letter.
  const round = (await db.query.studies.findFirst({ where: eq(studies.code, "PT-2026-1") }))!;
  const message = await sendEmail(composeEmail({ to: "someone@ringbatch.example", subject: "Test", greeting: "Hello", paragraphs: ["Body"] }), { studyId: study.id });
  const ruggednessStudy = (await db.query.studies.findFirst({ where: eq(studies.code, RUGGEDNESS_STUDY_CODE) }))!;
  const comparison = (await db.query.comparisons.findFirst({ where: eq(comparisons.userId, analyst.id) }))!;
  const shipment = (await db.query.shipments.findFirst({ where: eq(shipments.enrollmentId, own.id) }))!;
  params = {
    studyId: String(study.id),
    shipmentId: String(shipment.id),
    roundId: String(round.id),
    ruggednessStudyId: String(ruggednessStudy.id),
    comparisonId: String(comparison.id),
    materialId: String(material.id),
    enrollmentId: String(own.id),
    fileId: String(photo.id),
    messageId: String(message.id),
    token: "not-a-real-invitation-token",
  };
});

function concretePath(pattern: string) {
  return "/" + pattern.replace(/:(\w+)/g, (_, name: string) => {
    if (!(name in params)) throw new Error(`No test value for route parameter :${name}`);
    return params[name]!;
  });
}

function routeParams(pattern: string) {
  return Object.fromEntries([...pattern.matchAll(/:(\w+)/g)].map(([, name]) => [name!, params[name!]!]));
}

/** Pages that show other labs by code on purpose (a round's letter: the distribution of all results); names stay checked. */
const CODES_BY_DESIGN = new Set(["lab/rounds/:roundId/letter"]);

let requestCount = 0;

async function request(method: Method, path: string, persona: Persona) {
  // A new client address per request, so the rate limits (tested on their own) never answer instead of the guards.
  requestCount++;
  // (Documentation-range addresses: nothing is sent anywhere, the calls are in-process.)
  const headers: Record<string, string> = { "X-Forwarded-For": `2001:db8::${requestCount.toString(16)}` };
  const cookie = await cookieFor(persona);
  if (cookie) headers.Cookie = cookie;
  if (method === "GET") return new Request(ORIGIN + path, { headers });
  // An empty form from the same site: enough to reach the guard and the input check.
  headers["Content-Type"] = "application/x-www-form-urlencoded";
  headers.Origin = ORIGIN;
  return new Request(ORIGIN + path, { method: "POST", headers, body: "" });
}

async function bodyText(outcome: RouteOutcome) {
  return JSON.stringify(outcome.data ?? "");
}

/** Every route of the nested table by its whole URL pattern; a parent route (its loader) is marked "[layout]". */
function flatten(entries: RouteEntry[], base = ""): { pattern: string; file: string }[] {
  return entries.flatMap((r) => {
    const pattern = [base, r.path ?? ""].filter(Boolean).join("/");
    if (!r.children) return [{ pattern, file: r.file }];
    return [{ pattern: `${pattern} [layout]`, file: r.file }, ...flatten(r.children, pattern)];
  });
}
const routes = flatten(routeConfig as RouteEntry[]);

describe("access-control matrix", () => {
  it("has an expected row for every route, and no row for a route that is gone", () => {
    const patterns = routes.map((r) => r.pattern).sort();
    expect(Object.keys(EXPECTED).sort()).toEqual(patterns);
  });

  it("answers every route, method and persona as the matrix says", async () => {
    const observed: Record<string, Partial<Record<Method, Partial<Record<Persona, number>>>>> = {};
    const leaks: string[] = [];
    let checked = 0;
    for (const route of routes) {
      const module = await import(`../../app/${route.file}`);
      const path = concretePath(route.pattern);
      for (const method of ["GET", "POST"] as const) {
        const handler = method === "GET" ? module.loader : module.action;
        if (!handler) continue;
        for (const persona of PERSONAS) {
          const outcome = await call(handler, await request(method, path, persona), routeParams(route.pattern));
          ((observed[route.pattern] ??= {})[method] ??= {})[persona] = outcome.status;
          checked++;
          if (outcome.status !== 200) continue;
          const text = await bodyText(outcome);
          if (persona === "analyst") {
            for (const lab of DEMO_LABS.slice(1)) if (text.includes(lab.name)) leaks.push(`${method} ${path}: analyst sees lab name ${lab.name}`);
            if (!CODES_BY_DESIGN.has(route.pattern)) for (const code of otherLabCodes) if (new RegExp(`\\b${code}\\b`).test(text)) leaks.push(`${method} ${path}: analyst sees lab code ${code}`);
          }
          if (persona === "reviewer" || persona === "otherReviewer") {
            for (const lab of DEMO_LABS) if (text.includes(lab.name)) leaks.push(`${method} ${path}: reviewer sees lab name ${lab.name}`);
          }
        }
      }
    }
    recordFigure("access-matrix", "routesTimesRoles", checked);
    expect(leaks).toEqual([]);
    expect(observed).toEqual(EXPECTED);
    expect(ownLabCode).toMatch(/^L\d\d$/);
  }, 180_000); // every route × method × persona through the real modules: well over the default on a 2-core machine
});
