/**
 * Lists that grow over the years come a page at a time, on the generated
 * ten-year archive (seed/archive.ts) beside the demo: every row is listed
 * exactly once across the pages, and a page past the end shows the last one.
 */
import { sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import { PAGE_SIZE } from "~/lib/paging";
import * as apiList from "~/routes/api/v1/studies";
import * as labHome from "~/routes/lab/index";
import * as studyList from "~/routes/studies/index";
import { ARCHIVE, archiveCounts, seedArchive } from "../../seed/archive";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "../support/database";
import { demoCookie } from "../support/demo";
import { call, get } from "../support/routes";

let coordinator: string;
let analyst: string;

beforeAll(async () => {
  await useFreshDatabase();
  await seedDemo(db);
  await seedArchive(db);
  coordinator = await demoCookie("coordinator@ringbatch.example");
  analyst = await demoCookie("analyst1@ringbatch.example");
}, 120_000);

const count = async (query: ReturnType<typeof sql>) => (await db.all<{ n: number }>(query))[0]!.n;

describe("the generated archive", () => {
  it("holds the sizes it promises, and running it again adds nothing", async () => {
    expect(await archiveCounts(db)).toEqual({ studies: ARCHIVE.studies, enrollments: ARCHIVE.studies * ARCHIVE.labsPerStudy, results: ARCHIVE.results });
    expect(await seedArchive(db)).toEqual({ created: false });
    expect((await archiveCounts(db)).results).toBe(ARCHIVE.results);
    // A submitted cell has all its replicates; the short ones are drafts of the studies still collecting.
    expect(await count(sql`select count(*) as n from cells c join enrollments e on e.id = c.enrollment_id join studies s on s.id = e.study_id
      where s.code like 'AR-%' and c.status = 'submitted' and (select count(*) from results r where r.cell_id = c.id) <> ${ARCHIVE.replicates}`)).toBe(0);
  });
});

describe("paging", () => {
  it("shows the coordinator's precision studies newest first, each exactly once across the pages", async () => {
    // Proficiency rounds and ruggedness studies have lists of their own.
    const total = await count(sql`select count(*) as n from studies where kind = 'precision'`);
    const first = await call(studyList.loader, get("/studies", coordinator));
    expect(first.data.page).toMatchObject({ page: 1, total, pageCount: Math.ceil(total / PAGE_SIZE) });
    expect(first.data.studies).toHaveLength(PAGE_SIZE);
    const seen: string[] = [];
    for (let page = 1; page <= first.data.page.pageCount; page++) {
      seen.push(...(await call(studyList.loader, get(`/studies?page=${page}`, coordinator))).data.studies.map((s: { code: string }) => s.code));
    }
    expect(seen).toHaveLength(total);
    expect(new Set(seen).size).toBe(total);
    // The archive's first study (2016) comes last.
    expect(seen.at(-1)).toBe("AR-2016-001");
  });

  it("shows the last page for a page number past the end, and the first for nonsense", async () => {
    const past = await call(studyList.loader, get("/studies?page=9999", coordinator));
    expect(past.data.page.page).toBe(past.data.page.pageCount);
    expect((await call(studyList.loader, get("/studies?page=-3", coordinator))).data.page.page).toBe(1);
    expect((await call(studyList.loader, get("/studies?page=2.5", coordinator))).data.page.page).toBe(1);
  });

  it("pages a lab's enrollments on the lab home", async () => {
    const first = await call(labHome.loader, get("/lab", analyst));
    const total = first.data.page.total;
    expect(total).toBeGreaterThan(PAGE_SIZE);
    const seen: number[] = [];
    for (let page = 1; page <= first.data.page.pageCount; page++) {
      seen.push(...(await call(labHome.loader, get(`/lab?page=${page}`, analyst))).data.enrollments.map((e: { enrollmentId: number }) => e.enrollmentId));
    }
    expect(new Set(seen).size).toBe(total);
  });

  it("pages the API's study list, by code, and says how many pages there are", async () => {
    const total = await count(sql`select count(*) as n from studies`);
    const first = await call(apiList.loader, get("/api/v1/studies", coordinator));
    expect(first.data.page).toMatchObject({ page: 1, total, pageSize: 100, pageCount: Math.ceil(total / 100) });
    const second = await call(apiList.loader, get("/api/v1/studies?page=2", coordinator));
    const codes = [...first.data.studies, ...second.data.studies].map((s: { code: string }) => s.code);
    expect(codes).toEqual([...codes].sort());
    expect(new Set(codes).size).toBe(200);
  });
});
