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
  it("shows ten labs a page, one material at a time", async () => {
    const cookie = await demoCookie("coordinator@ringbatch.example");
    const page2 = await call(resultsPage.loader, get(`/studies/${studyId}/results?labs=2`, cookie), { studyId });
    expect(page2.data.labsPageCount).toBe(LARGE_STUDY.labs / 10);
    const codes = [...new Set(page2.data.rows.map((r: { labCode: string }) => r.labCode))];
    expect(codes).toEqual(Array.from({ length: 10 }, (_, i) => `L${i + 11}`));
    expect(page2.data.material).toBe("B01");
    expect(page2.data.rows.map((r: { materialCode: string }) => r.materialCode)).toEqual(Array(10).fill("B01"));
    expect(page2.data.rows[0].cells[0].values).toHaveLength(LARGE_STUDY.replicates);
    expect(page2.data.materials).toHaveLength(LARGE_STUDY.materials);
    const fifth = await call(resultsPage.loader, get(`/studies/${studyId}/results?material=B05&labs=4`, cookie), { studyId });
    expect(fifth.data.rows.map((r: { labCode: string; materialCode: string }) => `${r.labCode} ${r.materialCode}`)).toEqual(
      Array.from({ length: 10 }, (_, i) => `L${i + 31} B05`),
    );
    const unknown = await call(resultsPage.loader, get(`/studies/${studyId}/results?material=Z99`, cookie), { studyId });
    expect(unknown.data.material).toBe("B01");
    const beyond = await call(resultsPage.loader, get(`/studies/${studyId}/results?labs=99`, cookie), { studyId });
    expect(beyond.data.labsPage).toBe(4);
  });
});
