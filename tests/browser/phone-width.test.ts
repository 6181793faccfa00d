/**
 * Every page of the coordinator and of the admin fits a 390 px phone: nothing
 * pushes the page sideways (a wide table scrolls inside its own region). One
 * pass per person over the pages they reach from the menu and the study tabs,
 * with the forms a fresh study shows (labs awaiting materials, a merge).
 */
import { createClient } from "@libsql/client";
import { describe, expect, it } from "vitest";
import { DEMO_PASSWORD } from "../../seed/demo-data";
import { signInAs, useServerAndBrowser } from "../support/browser";

const running = useServerAndBrowser();

const PHONE = { width: 390, height: 844 };
const STUDY_TABS = ["", "/setup", "/labs", "/shipments", "/results", "/analysis", "/queries", "/statement", "/report"];

/** The demo's ids for the pages below a study, and two late labs in the study in testing so its shipments page shows the packing-list form. */
async function demoPages() {
  const database = createClient({ url: running.server.databaseUrl });
  try {
    const id = async (sql: string) => (await database.execute(sql)).rows[0]![0] as number;
    const testing = await id("select id from studies where code = 'FF-2026-B'");
    for (const [i, name] of ["Harrowgate Bench Lab", "Pellmoor Field Lab"].entries()) {
      const lab = (await database.execute({ sql: "insert into labs (name) values (?) returning id", args: [name] })).rows[0]![0] as number;
      await database.execute({ sql: "insert into enrollments (study_id, lab_id, state, lab_code) values (?, ?, 'accepted', ?)", args: [testing, lab, `L${11 + i}`] });
    }
    const studyIds = (await database.execute("select id from studies where kind = 'precision' order by id")).rows.map((r) => r[0] as number);
    const material = await id(`select min(id) from materials where study_id = ${testing}`);
    const shipment = await id(`select min(s.id) from shipments s join enrollments e on e.id = s.enrollment_id where e.study_id = ${testing}`);
    const round = await id("select id from studies where code = 'PT-2026-2'");
    const publishedRound = await id("select id from studies where code = 'PT-2026-1'");
    const ruggedness = await id("select id from studies where kind = 'ruggedness'");
    const lab = await id("select min(id) from labs");
    return {
      shared: [
        "/studies",
        ...studyIds.flatMap((studyId) => STUDY_TABS.map((tab) => `/studies/${studyId}${tab}`)),
        `/studies/${testing}/materials/${material}`,
        `/studies/${testing}/shipments/${shipment}/packing-list`,
        "/rounds",
        ...["", "/assigned-values", "/material-checks", "/scores"].map((tab) => `/rounds/${round}${tab}`),
        `/rounds/${publishedRound}/report`,
        "/ruggedness",
        ...["", "/design", "/results", "/effects", "/conclusions"].map((tab) => `/ruggedness/${ruggedness}${tab}`),
        "/compare",
        "/account",
        "/account/api",
      ],
      coordinator: ["/studies/new", "/rounds/new", "/ruggedness/new", "/compare/new", "/dev/mailbox"],
      admin: ["/admin/users", "/admin/users?role=analyst", "/admin/labs", `/admin/labs?edit=${lab}`, `/admin/labs?merge=${lab}`],
    };
  } finally {
    database.close();
  }
}

describe("coordinator and admin pages on a phone", { timeout: 240_000 }, () => {
  it("are never wider than the screen", async () => {
    const pages = await demoPages();
    const tooWide: string[] = [];
    for (const person of ["coordinator", "admin"] as const) {
      const page = await (await running.browser.newContext({ viewport: PHONE })).newPage();
      await signInAs(page, running.server.url, `${person}@ringbatch.example`, DEMO_PASSWORD);
      await page.waitForURL((url) => url.pathname !== "/login");
      for (const path of [...pages.shared, ...pages[person]]) {
        const response = await page.goto(running.server.url + path);
        expect(response?.status(), `${person} ${path}`).toBe(200);
        const { scrollWidth, innerWidth } = await page.evaluate(() => ({ scrollWidth: document.documentElement.scrollWidth, innerWidth: window.innerWidth }));
        if (scrollWidth > innerWidth) tooWide.push(`${person} ${path}: ${scrollWidth} px`);
      }
      await page.context().close();
    }
    expect(tooWide).toEqual([]);
  });
});
