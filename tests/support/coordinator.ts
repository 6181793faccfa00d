import { eq } from "drizzle-orm";
import { db } from "~/db/client.server";
import { enrollments, labs, studies } from "~/db/schema";
import * as newStudy from "~/routes/studies/new";
import { call, post } from "./routes";

const ORIGIN = "http://ringbatch.test";

/** A multipart form post, as a browser sends a form with a file. */
export function postMultipart(path: string, form: FormData, cookie?: string) {
  return new Request(ORIGIN + path, { method: "POST", headers: { Origin: ORIGIN, ...(cookie ? { Cookie: cookie } : {}) }, body: form });
}

export const STUDY_FIELDS = {
  template: "float_finishing",
  code: "FF-2027-T",
  title: "Finishability trial",
  testMethod: "Float finishing test of fresh concrete",
  replicatesPerCell: "3",
  significanceLevel: "0.005",
  targetSurfaceRating: "2",
  enrollmentDeadline: "2027-02-01",
  shipDate: "2027-02-15",
  resultsDue: "2027-04-30",
  notes: "",
};

/** Creates a study through the new-study action and returns its row. */
export async function createStudyAs(cookie: string, fields: Partial<typeof STUDY_FIELDS> = {}) {
  const values = { ...STUDY_FIELDS, ...fields };
  const outcome = await call(newStudy.action, post("/studies/new", values, cookie));
  if (outcome.status !== 302) throw new Error(`Study not created: ${JSON.stringify(outcome.data)}`);
  return (await db.query.studies.findFirst({ where: eq(studies.code, values.code) }))!;
}

/** Accepted enrollments for the first `n` demo labs, with codes, without going through invitations. */
export async function enrollDemoLabs(studyId: number, n: number) {
  const all = await db.select().from(labs).orderBy(labs.id).limit(n);
  for (const [i, lab] of all.entries()) {
    await db.insert(enrollments).values({ studyId, labId: lab.id, state: "accepted", labCode: `L${String(i + 1).padStart(2, "0")}` });
  }
  return all;
}
