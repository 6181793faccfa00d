import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/db/client.server";
import * as resultsPage from "~/routes/studies/study/results";
import { LARGE_STUDY, seedLargeStudy } from "../../seed/large-study";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "../support/database";
import { demoCookie } from "../support/demo";
import { call, get } from "../support/routes";

let studyId: string;

beforeAll(async () => {
  await useFreshDatabase();
  await seedDemo(db);
  studyId = String((await seedLargeStudy(db)).id);
});

describe("the coordinator's results page on a large study", () => {
  it("shows ten labs a page, every material of each", async () => {
    const cookie = await demoCookie("coordinator@ringbatch.example");
    const page2 = await call(resultsPage.loader, get(`/studies/${studyId}/results?labs=2`, cookie), { studyId });
    expect(page2.data.labsPageCount).toBe(LARGE_STUDY.labs / 10);
    const codes = [...new Set(page2.data.rows.map((r: { labCode: string }) => r.labCode))];
    expect(codes).toEqual(Array.from({ length: 10 }, (_, i) => `L${i + 11}`));
    expect(page2.data.rows).toHaveLength(10 * LARGE_STUDY.materials);
    expect(page2.data.rows[0].cells[0].values).toHaveLength(LARGE_STUDY.replicates);
    const beyond = await call(resultsPage.loader, get(`/studies/${studyId}/results?labs=99`, cookie), { studyId });
    expect(beyond.data.labsPage).toBe(4);
  });
});
