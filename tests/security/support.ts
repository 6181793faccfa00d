/**
 * Shared ground of the security suites: a seeded random source (so a failing
 * generated case can be replayed), demo look-ups, testing studies of any size
 * written straight into a database file, and sign-in over HTTP.
 */
import { and, count, eq } from "drizzle-orm";
import { closeDatabase, db } from "~/db/client.server";
import { cells, enrollments, labMembers, labs, materials, responses, results, studies, users } from "~/db/schema";
import { hashPassword } from "~/models/user.server";
import { FLOAT_FINISHING_RESPONSES, generator } from "../../seed/demo-data";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "../support/database";

export type Random = ReturnType<typeof randomSource>;

/**
 * A whole 1 × 1 pixel PNG (PNG specification: the 8-byte signature 89 50 4E 47
 * 0D 0A 1A 0A, then IHDR, IDAT and IEND chunks): stored photos are decoded and
 * encoded again, so a test photo must be a real image, not just the signature.
 */
export const ONE_PIXEL_PNG = Uint8Array.from(Buffer.from("iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNk+M9QDwADhgGAWjR9awAAAABJRU5ErkJggg==", "base64"));

/** Whole numbers, picks and shuffles from one seed: the same seed gives the same cases on every run. */
export function randomSource(seed: number) {
  const next = generator(seed);
  const int = (min: number, max: number) => min + Math.floor(next() * (max - min + 1));
  return {
    next,
    int,
    chance: (p: number) => next() < p,
    pick: <T>(items: readonly T[]): T => items[int(0, items.length - 1)]!,
    shuffle: <T>(items: readonly T[]): T[] => {
      const out = [...items];
      for (let i = out.length - 1; i > 0; i--) {
        const j = int(0, i);
        [out[i], out[j]] = [out[j]!, out[i]!];
      }
      return out;
    },
  };
}

export const demoStudyId = async (code: string) => (await db.query.studies.findFirst({ where: eq(studies.code, code) }))!.id;

/** The enrollment of the lab `email` belongs to, in one study. */
export async function enrollmentOf(studyId: number, email: string) {
  const [row] = await db
    .select({ enrollment: enrollments })
    .from(enrollments)
    .innerJoin(labMembers, eq(labMembers.labId, enrollments.labId))
    .innerJoin(users, eq(users.id, labMembers.userId))
    .where(and(eq(enrollments.studyId, studyId), eq(users.email, email)));
  if (!row) throw new Error(`${email} has no enrollment in study ${studyId}`);
  return row.enrollment;
}

export async function resultCountOf(enrollmentId: number) {
  const [row] = await db.select({ n: count() }).from(results).innerJoin(cells, eq(cells.id, results.cellId)).where(eq(cells.enrollmentId, enrollmentId));
  return row!.n;
}

export const TEST_PASSWORD = "security-suite-password";

export type TestingStudy = {
  studyId: number;
  replicates: number;
  materials: { id: number; code: string }[];
  responseKeys: string[];
  labs: { email: string; enrollmentId: number }[];
};

/**
 * A study in testing with its own labs, each with one analyst (password
 * TEST_PASSWORD) and an accepted enrollment, and the float finishing test's
 * two count responses. Written directly: the setup pages have tests of their own.
 */
export async function createTestingStudy({ code, materialCount, replicates, labCount }: { code: string; materialCount: number; replicates: number; labCount: number }): Promise<TestingStudy> {
  const coordinator = await db.query.users.findFirst({ where: eq(users.email, "coordinator@ringbatch.example") });
  const passwordHash = await hashPassword(TEST_PASSWORD);
  return db.transaction(async (tx) => {
    const [study] = await tx
      .insert(studies)
      .values({ code, title: `Security suite study ${code}`, testMethod: "Float finishing test of fresh concrete", state: "testing", replicatesPerCell: replicates, ownerId: coordinator!.id })
      .returning();
    await tx.insert(responses).values(FLOAT_FINISHING_RESPONSES.map((r, i) => ({ ...r, studyId: study!.id, decimals: 0, sortOrder: i })));
    const materialRows = await tx
      .insert(materials)
      .values(Array.from({ length: materialCount }, (_, i) => ({ studyId: study!.id, code: `T${String(i + 1).padStart(3, "0")}`, sortOrder: i })))
      .returning({ id: materials.id, code: materials.code });
    const labRows = [];
    for (let i = 1; i <= labCount; i++) {
      const email = `${code.toLowerCase()}-analyst${i}@ringbatch.example`;
      const [lab] = await tx.insert(labs).values({ name: `${code} test lab ${i}` }).returning();
      const [user] = await tx.insert(users).values({ email, name: `Analyst ${i} of ${code}`, role: "analyst", passwordHash }).returning();
      await tx.insert(labMembers).values({ labId: lab!.id, userId: user!.id, isContact: true });
      const [enrollment] = await tx
        .insert(enrollments)
        .values({ studyId: study!.id, labId: lab!.id, state: "accepted", labCode: `L${String(i).padStart(2, "0")}` })
        .returning();
      labRows.push({ email, enrollmentId: enrollment!.id });
    }
    return { studyId: study!.id, replicates, materials: materialRows, responseKeys: FLOAT_FINISHING_RESPONSES.map((r) => r.key), labs: labRows };
  });
}

/** A migrated, seeded database file with `prepare` applied, its handle closed so a server can own it. */
export async function prepareDatabaseFile<T>(prepare: () => Promise<T>) {
  const databaseUrl = await useFreshDatabase();
  await seedDemo(db);
  const prepared = await prepare();
  closeDatabase();
  return { databaseUrl, ...prepared };
}

/** Signs in through the real form over HTTP (as a same-site browser would) and returns the Cookie header. */
export async function signInOverHttp(baseUrl: string, email: string, password: string) {
  const response = await fetch(`${baseUrl}/login`, {
    method: "POST",
    headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: baseUrl },
    body: new URLSearchParams({ email, password }),
    redirect: "manual",
  });
  const setCookie = response.headers.get("Set-Cookie");
  if (response.status !== 302 || !setCookie) throw new Error(`Sign-in of ${email} answered ${response.status}`);
  return setCookie.split(";")[0]!;
}

/** A valid results file: every response × replicate of the given materials, with test date and operator. */
export function fullResultsCsv(materialCodes: string[], responseKeys: string[], replicates: number, random: Random) {
  const lines = ["material,response,replicate,value,tested_on,operator"];
  for (const material of materialCodes) {
    for (const response of responseKeys) {
      for (let replicate = 1; replicate <= replicates; replicate++) lines.push(`${material},${response},${replicate},${random.int(2, 30)},2026-10-14,Ines Paravel`);
    }
  }
  return `${lines.join("\n")}\n`;
}
