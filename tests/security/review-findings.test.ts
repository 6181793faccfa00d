/**
 * The holes an outside review of the built server found, each checked where
 * the app decides it (loaders, actions, models), on a real SQLite file with
 * the demo. The checks that need the real server (body caps, Host, start-up
 * rules) are in review-findings-server.test.ts. Each finding is numbered as
 * in the review.
 */
import { and, eq, inArray } from "drizzle-orm";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { db } from "~/db/client.server";
import { apiTokens, attachments, cells, enrollments, labMembers, materials, queries, rateLimits, results, setupLinks, shipments, studies, users } from "~/db/schema";
import { resolveResultRows } from "~/lib/results/rows";
import { activeApiToken, createApiToken } from "~/models/api-token.server";
import { demoDataPresent, prepareFirstUse } from "~/models/first-use.server";
import { HIDDEN_TOKEN } from "~/models/mailbox.server";
import { loadSessionUser } from "~/models/user.server";
import * as root from "~/root";
import * as account from "~/routes/account";
import * as enrollmentResults from "~/routes/api/v1/enrollment-results";
import * as login from "~/routes/auth/login";
import * as setup from "~/routes/auth/setup";
import * as mailbox from "~/routes/dev/mailbox";
import * as mailboxMessage from "~/routes/dev/mailbox-message";
import * as files from "~/routes/files";
import * as labQueries from "~/routes/lab/queries";
import * as receipt from "~/routes/lab/study/receipt";
import * as entry from "~/routes/lab/study/result-entry";
import * as tasks from "~/routes/lab/study/tasks";
import * as studiesApi from "~/routes/api/v1/studies";
import * as resultsPage from "~/routes/studies/study/results";
import { composeEmail, sendEmail } from "~/server/email.server";
import { drawLabCode } from "~/server/lab-codes.server";
import { ADDRESS_SIGN_IN_FAILURES, recordHit } from "~/server/rate-limit.server";
import { DEMO_PASSWORD } from "../../seed/demo-data";
import { seedDemo } from "../../seed/seed";
import { useFreshDatabase } from "../support/database";
import { demoCookie } from "../support/demo";
import { errorsOf } from "../support/replies";
import { call, get, post, sessionCookieFor } from "../support/routes";
import { recordFigure } from "./figures";

// The file store reads its directory when first loaded, so point it at a scratch directory before any import.
vi.hoisted(() => {
  process.env.UPLOADS_DIR = require("node:fs").mkdtempSync(require("node:path").join(require("node:os").tmpdir(), "ringbatch-findings-"));
});

let findingsChecked = 0;
/** Counts a finding's test once its assertions have all passed. */
const checked = () => void findingsChecked++;

let testingStudyId: number;
let checkingStudyId: number;

beforeAll(async () => {
  await useFreshDatabase();
  await seedDemo(db);
  testingStudyId = (await db.query.studies.findFirst({ where: eq(studies.code, "FF-2026-B") }))!.id;
  checkingStudyId = (await db.query.studies.findFirst({ where: eq(studies.code, "FF-2026-A") }))!.id;
});

afterAll(() => recordFigure("review-findings", "findingsChecked", findingsChecked));

/** Sets environment variables for the length of `run`, then puts the old values back. */
async function withEnv<T>(values: Record<string, string | undefined>, run: () => Promise<T>) {
  const before = Object.fromEntries(Object.keys(values).map((k) => [k, process.env[k]]));
  const assign = (entries: Record<string, string | undefined>) => {
    for (const [k, v] of Object.entries(entries)) {
      if (v === undefined) delete process.env[k];
      else process.env[k] = v;
    }
  };
  assign(values);
  try {
    return await run();
  } finally {
    assign(before);
  }
}

const userId = async (email: string) => (await db.query.users.findFirst({ where: eq(users.email, email) }))!.id;

describe("1. the local mailbox", () => {
  const token = "Zq3vK8pL2mN5xR7tY1wB4cD6fH9jS0aE-gU_iO2kQ3l"; // 43 characters of base64url, as the app's link tokens
  let invitationId: number;
  let ownMessageId: number;
  let otherStudyMessageId: number;

  beforeAll(async () => {
    const invitation = composeEmail({
      to: "contact@quellmoor-lab.example",
      subject: "Invitation to FF-2026-B",
      greeting: "Hello",
      paragraphs: ["Your lab is invited."],
      action: { label: "Answer the invitation", url: `http://ringbatch.test/invite/${token}?study=${testingStudyId}` },
    });
    invitationId = (await sendEmail(invitation, { studyId: testingStudyId })).id;
    const toCoordinator = composeEmail({
      to: "coordinator@ringbatch.example",
      subject: "Your own link",
      greeting: "Hello",
      paragraphs: [],
      action: { label: "Open", url: `http://ringbatch.test/welcome/${token}` },
    });
    ownMessageId = (await sendEmail(toCoordinator, { studyId: testingStudyId })).id;
    // A study the demo coordinator does not coordinate.
    const otherOwner = (await db.insert(users).values({ email: "other-owner@ringbatch.example", name: "Other Owner", role: "coordinator" }).returning())[0]!;
    const [otherStudy] = await db.insert(studies).values({ code: "OTHER-MAIL", title: "Another study", testMethod: "Slump", replicatesPerCell: 2, ownerId: otherOwner.id }).returning();
    otherStudyMessageId = (await sendEmail(composeEmail({ to: "lab@elsewhere.example", subject: "Other study's mail", greeting: "Hi", paragraphs: [] }), { studyId: otherStudy!.id })).id;
  });

  it("is off in production unless MAILBOX=on", async () => {
    const admin = await demoCookie("admin@ringbatch.example");
    await withEnv({ NODE_ENV: "production", MAILBOX: undefined, RESEND_API_KEY: undefined }, async () => {
      expect((await call(mailbox.loader, get("/dev/mailbox", admin))).status).toBe(404);
      expect((await call(mailboxMessage.loader, get(`/dev/mailbox/${invitationId}`, admin), { messageId: String(invitationId) })).status).toBe(404);
    });
    await withEnv({ NODE_ENV: "production", MAILBOX: "on", RESEND_API_KEY: undefined }, async () => {
      expect((await call(mailbox.loader, get("/dev/mailbox", admin))).status).toBe(200);
    });
    checked();
  });

  it("shows a coordinator only the mail of the studies they coordinate; an admin all", async () => {
    const coordinator = await demoCookie("coordinator@ringbatch.example");
    const listed = (await call(mailbox.loader, get("/dev/mailbox", coordinator))).data.messages.map((m: { id: number }) => m.id);
    expect(listed).toEqual(expect.arrayContaining([invitationId, ownMessageId]));
    expect(listed).not.toContain(otherStudyMessageId);
    expect((await call(mailboxMessage.loader, get(`/dev/mailbox/${otherStudyMessageId}`, coordinator), { messageId: String(otherStudyMessageId) })).status).toBe(404);
    const otherCoordinator = (await db.insert(users).values({ email: "no-studies@ringbatch.example", name: "No Studies", role: "coordinator" }).returning())[0]!;
    const { sessionCookieFor } = await import("../support/routes");
    expect((await call(mailbox.loader, get("/dev/mailbox", await sessionCookieFor(otherCoordinator.id)))).data.messages).toEqual([]);
    const adminListed = (await call(mailbox.loader, get("/dev/mailbox", await demoCookie("admin@ringbatch.example")))).data.messages.map((m: { id: number }) => m.id);
    expect(adminListed).toEqual(expect.arrayContaining([invitationId, ownMessageId, otherStudyMessageId]));
    checked();
  });

  it("carries no live token in a message addressed to someone else, the admin's view included", async () => {
    for (const email of ["coordinator@ringbatch.example", "admin@ringbatch.example"]) {
      const shown = await call(mailboxMessage.loader, get(`/dev/mailbox/${invitationId}`, await demoCookie(email)), { messageId: String(invitationId) });
      expect(shown.status).toBe(200);
      expect(shown.data.message.text).not.toContain(token);
      expect(shown.data.message.html).not.toContain(token);
      expect(shown.data.message.text).toContain(`/invite/${HIDDEN_TOKEN}`);
    }
    // The viewer's own message keeps its link.
    const own = await call(mailboxMessage.loader, get(`/dev/mailbox/${ownMessageId}`, await demoCookie("coordinator@ringbatch.example")), { messageId: String(ownMessageId) });
    expect(own.data.message.text).toContain(token);
    checked();
  });
});

describe("2. demo data and the first administrator", () => {
  it("writes the demo only into a database without accounts, and only when wanted", async () => {
    // This database has accounts: nothing is written whatever DEMO says.
    const before = (await db.select().from(users)).length;
    expect(await prepareFirstUse(seedDemo, { NODE_ENV: "development", DEMO: "on" })).toEqual({ outcome: "has-accounts" });
    expect((await db.select().from(users)).length).toBe(before);

    await useFreshDatabase();
    try {
      const production = await prepareFirstUse(seedDemo, { NODE_ENV: "production" });
      expect(production.outcome).toBe("setup-link");
      expect(await db.select().from(users)).toEqual([]);
      expect(await demoDataPresent()).toBe(false);
      expect((await call(root.loader, get("/login"))).data.demo).toBe(false);
      expect(await prepareFirstUse(seedDemo, { NODE_ENV: "production", DEMO: "on" })).toEqual({ outcome: "demo-written" });
      expect(await demoDataPresent()).toBe(true);
      expect((await call(root.loader, get("/login"))).data.demo).toBe(true);
    } finally {
      await useFreshDatabase();
      await seedDemo(db);
    }
    checked();
  });

  it("gives a production start on an empty database a one-time link, valid 30 minutes, that creates the first administrator", async () => {
    await useFreshDatabase();
    try {
      const first = await prepareFirstUse(seedDemo, { NODE_ENV: "production" });
      if (first.outcome !== "setup-link") throw new Error(first.outcome);
      const token = first.path.split("/").at(-1)!;
      const minutes = (first.expiresAt.getTime() - Date.now()) / 60_000;
      expect(minutes).toBeGreaterThan(29);
      expect(minutes).toBeLessThanOrEqual(30);
      expect((await call(setup.loader, get(first.path), { token })).status).toBe(200);
      const fields = { name: "Mara Quellwood", email: "mara@quellwood.example", password: "a-long-first-password", confirm: "a-long-first-password" };
      const mismatch = await call(setup.action, post(first.path, { ...fields, confirm: "something-else-entirely" }), { token });
      expect(mismatch.status).toBe(400);
      expect(mismatch.data.result.error.confirm).toEqual(["The two passwords differ."]);
      const created = await call(setup.action, post(first.path, fields), { token });
      expect(created.status).toBe(302);
      expect(created.headers.get("Set-Cookie")).toMatch(/__ringbatch_session=/);
      const admins = await db.select().from(users);
      expect(admins.map((u) => [u.email, u.role])).toEqual([["mara@quellwood.example", "admin"]]);
      // Used once: gone.
      expect((await call(setup.action, post(first.path, { ...fields, email: "second@quellwood.example" }), { token })).status).toBe(404);
      expect((await db.select().from(users)).length).toBe(1);

      // An expired link does nothing either.
      await useFreshDatabase();
      const late = await prepareFirstUse(seedDemo, { NODE_ENV: "production" });
      if (late.outcome !== "setup-link") throw new Error(late.outcome);
      await db.update(setupLinks).set({ expiresAt: new Date(Date.now() - 1000) });
      expect((await call(setup.loader, get(late.path), { token: late.path.split("/").at(-1)! })).status).toBe(404);
    } finally {
      await useFreshDatabase();
      await seedDemo(db);
      testingStudyId = (await db.query.studies.findFirst({ where: eq(studies.code, "FF-2026-B") }))!.id;
      checkingStudyId = (await db.query.studies.findFirst({ where: eq(studies.code, "FF-2026-A") }))!.id;
    }
    checked();
  });
});

/** A JPEG whose header claims `width` × `height` pixels: the frame header (SOF0) of a real 8 × 8 JPEG, rewritten (ITU-T T.81, B.2.2). */
async function jpegClaiming(width: number, height: number) {
  const bytes = new Uint8Array(await sharp({ create: { width: 8, height: 8, channels: 3, background: "#808080" } }).jpeg().toBuffer());
  for (let i = 0; i < bytes.length - 9; i++) {
    if (bytes[i] === 0xff && (bytes[i + 1] === 0xc0 || bytes[i + 1] === 0xc2)) {
      bytes[i + 5] = height >> 8;
      bytes[i + 6] = height & 0xff;
      bytes[i + 7] = width >> 8;
      bytes[i + 8] = width & 0xff;
      return bytes;
    }
  }
  throw new Error("no frame header");
}

describe("3. photos keep the blinding", () => {
  const SECRETS = ["Quellmoor Testing Lab", "(c) Quellmoor 2026", "Camera serial QX-88812", "Batch from the Harrowgate plant"];
  let f1: number;
  let photoId: number;

  async function uploadPhoto(bytes: Uint8Array, name: string, email: string, replicate = "1") {
    const form = new FormData();
    form.set("intent", "photo");
    form.set("replicate", replicate);
    form.set("photo", new File([bytes as BlobPart], name, { type: "image/jpeg" }));
    const request = new Request(`http://ringbatch.test/lab/studies/${testingStudyId}/results/${f1}`, {
      method: "POST",
      headers: { Origin: "http://ringbatch.test", Cookie: await demoCookie(email) },
      body: form,
    });
    return call(entry.action, request, { studyId: String(testingStudyId), materialId: String(f1) });
  }

  beforeAll(async () => {
    f1 = (await db.query.materials.findFirst({ where: and(eq(materials.studyId, testingStudyId), eq(materials.code, "F1")) }))!.id;
  });

  it("strips EXIF and other metadata (author, copyright, comments, GPS, camera serial) when stored, and keeps a thumbnail", async () => {
    // A photo as a phone would send it: EXIF with author, copyright, description, serial and GPS (EXIF 2.32 tags, as sharp writes them).
    const photo = await sharp({ create: { width: 640, height: 480, channels: 3, background: "#a0a0a0" } })
      .withExif({
        IFD0: { Artist: SECRETS[0]!, Copyright: SECRETS[1]!, ImageDescription: SECRETS[3]! },
        IFD2: { BodySerialNumber: SECRETS[2]! },
        IFD3: { GPSLatitudeRef: "N", GPSLatitude: "47/1 30/1 0/1", GPSLongitudeRef: "E", GPSLongitude: "8/1 30/1 0/1" },
      })
      .jpeg()
      .toBuffer();
    expect((await sharp(photo).metadata()).exif).toBeDefined();
    expect(photo.includes(Buffer.from(SECRETS[0]!))).toBe(true);

    const outcome = await uploadPhoto(new Uint8Array(photo), "QuellmoorLab-surface.jpg", "analyst5@ringbatch.example");
    expect(outcome.status).toBe(302);
    const stored = (await db.select().from(attachments)).at(-1)!;
    photoId = stored.id;
    const storedBytes = await download(stored.id);
    const metadata = await sharp(storedBytes).metadata();
    expect(metadata.exif).toBeUndefined();
    expect(metadata.xmp).toBeUndefined();
    expect(metadata.iptc).toBeUndefined();
    expect(metadata.comments ?? []).toEqual([]);
    expect([metadata.width, metadata.height]).toEqual([640, 480]);
    for (const secret of SECRETS) expect(Buffer.from(storedBytes).includes(Buffer.from(secret)), secret).toBe(false);
    expect(stored.thumbnailSha256).toMatch(/^[0-9a-f]{64}$/);
    const thumbnail = await sharp(await download(stored.id, "?thumbnail")).metadata();
    expect(Math.max(thumbnail.width!, thumbnail.height!)).toBe(480);
    checked();
  });

  it("serves every photo under a neutral name, never the uploaded one", async () => {
    const response = await call(files.loader, get(`/files/${photoId}`, await demoCookie("coordinator@ringbatch.example")), { fileId: String(photoId) });
    expect(response.status).toBe(200);
    const labCode = (await db.query.enrollments.findFirst({ where: eq(enrollments.id, (await enrollmentOfAnalyst(5))) }))!.labCode;
    expect(response.headers.get("Content-Disposition")).toBe(`inline; filename="${labCode}-F1-holes-rep1.jpg"`);
    expect(response.headers.get("Content-Disposition")).not.toContain("Quellmoor");
    const thumb = await call(files.loader, get(`/files/${photoId}?thumbnail`, await demoCookie("coordinator@ringbatch.example")), { fileId: String(photoId) });
    expect(thumb.headers.get("Content-Disposition")).toBe(`inline; filename="${labCode}-F1-holes-rep1-thumbnail.jpg"`);
    checked();
  });

  it("shows reviewers photos of submitted results only", async () => {
    const reviewer = await demoCookie("reviewer1@ringbatch.example");
    expect((await call(files.loader, get(`/files/${photoId}`, reviewer), { fileId: String(photoId) })).status).toBe(404);
    const linked = await db.select({ cellId: results.cellId }).from(results).where(eq(results.photoAttachmentId, photoId));
    await db.update(cells).set({ status: "submitted", submittedAt: new Date() }).where(inArray(cells.id, linked.map((l) => l.cellId)));
    expect((await call(files.loader, get(`/files/${photoId}`, reviewer), { fileId: String(photoId) })).status).toBe(200);
    checked();
  });

  it("refuses an image of more pixels than the cap, beside the field, and stores nothing", async () => {
    const before = (await db.select().from(attachments)).length;
    const outcome = await uploadPhoto(await jpegClaiming(10_000, 10_000), "huge.jpg", "analyst6@ringbatch.example");
    expect(outcome.status).toBe(400);
    expect(errorsOf(outcome).photo).toBe("The image has more than 50 million pixels; send a smaller one.");
    expect((await db.select().from(attachments)).length).toBe(before);
    checked();
  });
});

/** The bytes the download route serves the coordinator for an attachment. */
async function download(attachmentId: number, query = "") {
  const request = get(`/files/${attachmentId}${query}`, await demoCookie("coordinator@ringbatch.example"));
  const response = (await files.loader({ request, params: { fileId: String(attachmentId) } } as never)) as Response;
  expect(response.status).toBe(200);
  return Buffer.from(await response.arrayBuffer());
}

async function enrollmentOfAnalyst(n: number, studyId = testingStudyId) {
  const user = await loadSessionUser(await userId(`analyst${n}@ringbatch.example`));
  const enrollment = await db.query.enrollments.findFirst({ where: and(eq(enrollments.studyId, studyId), inArray(enrollments.labId, user!.labIds)) });
  return enrollment!.id;
}

describe("5. tokens follow the account", () => {
  it("revokes the account's API tokens when it signs out everywhere or changes its password", async () => {
    const user = (await loadSessionUser(await userId("reviewer2@ringbatch.example")))!;
    for (const intent of ["sign-out-everywhere", "password"]) {
      const { token } = await createApiToken(user, { name: `script for ${intent}`, scope: "study:read", studyId: checkingStudyId });
      expect(await activeApiToken(token)).not.toBeNull();
      const fields: Record<string, string> =
        intent === "password" ? { intent, currentPassword: DEMO_PASSWORD, newPassword: "a-new-long-password", confirmPassword: "a-new-long-password" } : { intent };
      const outcome = await call(account.action, post("/account", fields, await demoCookie("reviewer2@ringbatch.example")));
      expect(outcome.status).toBe(302);
      expect(await activeApiToken(token)).toBeNull();
    }
    const live = await db.select().from(apiTokens).where(and(eq(apiTokens.userId, user.id)));
    expect(live.every((t) => t.revokedAt !== null)).toBe(true);
    checked();
  });
});

describe("6. no lock-out of someone else's account", () => {
  const signIn = (email: string, password: string, address: string) => {
    const request = post("/login", { email, password });
    request.headers.set("X-Forwarded-For", address);
    return call(login.action, request);
  };

  it("lets the owner in after 30 wrong passwords from 30 other addresses", { timeout: 180_000 }, async () => {
    for (let i = 0; i < 30; i++) expect((await signIn("analyst2@ringbatch.example", `guess-${i}`, `2001:db8::${i + 1}`)).status).toBe(401);
    expect((await signIn("analyst2@ringbatch.example", DEMO_PASSWORD, "192.0.2.50")).status).toBe(302);
    checked();
  });

  it("limits one address across accounts, with the counters in the database", async () => {
    for (let i = 0; i < ADDRESS_SIGN_IN_FAILURES.max; i++) await recordHit(ADDRESS_SIGN_IN_FAILURES, "198.51.100.66");
    expect((await signIn("analyst3@ringbatch.example", DEMO_PASSWORD, "198.51.100.66")).status).toBe(429);
    const [row] = await db.select().from(rateLimits).where(eq(rateLimits.key, "sign-in-address:198.51.100.66"));
    expect(row?.points).toBe(ADDRESS_SIGN_IN_FAILURES.max);
    checked();
  });

  it("counts API requests in the database, so every app instance shares the limit", async () => {
    await withEnv({ API_RATE_LIMIT_PER_MINUTE: "3" }, async () => {
      const cookie = await demoCookie("reviewer3@ringbatch.example");
      const statuses = [];
      for (let i = 0; i < 4; i++) statuses.push((await call(studiesApi.loader, get("/api/v1/studies", cookie))).status);
      expect(statuses).toEqual([200, 200, 200, 429]);
      const rows = await db.select().from(rateLimits).where(eq(rateLimits.key, `api:user:${await userId("reviewer3@ringbatch.example")}`));
      expect(rows[0]?.points).toBe(4);
    });
    checked();
  });
});

describe("7. links in e-mails come from configuration", () => {
  it("builds links from APP_URL whatever Host the request names", async () => {
    const { appUrl } = await import("~/server/email.server");
    await withEnv({ APP_URL: "https://ringbatch.example.org" }, async () => {
      const forged = new Request("http://attacker.example/studies/1/labs", { headers: { Host: "attacker.example" } });
      expect(appUrl(forged, "/invite/abc")).toBe("https://ringbatch.example.org/invite/abc");
    });
    checked();
  });
});

describe("8. one answer for everything that is not yours", () => {
  it("answers another lab's shipment and a made-up id with the same 404", async () => {
    const own = await enrollmentOfAnalyst(7);
    const otherLab = await enrollmentOfAnalyst(8);
    const otherShipment = (await db.query.shipments.findFirst({ where: eq(shipments.enrollmentId, otherLab) }))!;
    expect(own).not.toBe(otherLab);
    const confirm = async (shipmentId: string) => {
      const form = new FormData();
      for (const [k, v] of Object.entries({ shipmentId, receivedOn: "2026-11-25", condition: "good", receiptNotes: "" })) form.set(k, v);
      const request = new Request(`http://ringbatch.test/lab/studies/${testingStudyId}/receipt`, {
        method: "POST",
        headers: { Origin: "http://ringbatch.test", Cookie: await demoCookie("analyst7@ringbatch.example") },
        body: form,
      });
      return call(receipt.action, request, { studyId: String(testingStudyId) });
    };
    const others = await confirm(String(otherShipment.id));
    const madeUp = await confirm("987654");
    expect([others.status, madeUp.status]).toEqual([404, 404]);
    expect(others.data).toEqual(madeUp.data);
    expect((await db.query.shipments.findFirst({ where: eq(shipments.id, otherShipment.id) }))!.status).toBe(otherShipment.status);
    checked();
  });
});

describe("9. redirect targets after sign-in", () => {
  const signInTo = (redirectTo: string) =>
    call(login.action, post(`/login?${new URLSearchParams({ redirectTo })}`, { email: "coordinator@ringbatch.example", password: DEMO_PASSWORD }));

  it("refuses targets that leave the site after URL normalisation, and never answers 5xx", async () => {
    const leaving = ["/\t/evil.example", "/%09/evil.example", "/\\evil.example", "/%5Cevil.example", "//evil.example", "/%2F%2Fevil.example", "/\u0000x", "/\r\nSet-Cookie:x=1", "https://evil.example"];
    for (const target of leaving) {
      const outcome = await signInTo(target);
      expect(outcome.status, JSON.stringify(target)).toBe(302);
      expect(outcome.headers.get("Location"), JSON.stringify(target)).toBe("/studies");
    }
    // Non-ASCII stays on the site, percent-encoded into a valid header.
    const accented = await signInTo("/studies?q=Béton—essai");
    expect(accented.status).toBe(302);
    expect(accented.headers.get("Location")).toBe("/studies?q=B%C3%A9ton%E2%80%94essai");
    checked();
  });
});

describe("10. paging parameters", () => {
  it("answers the results page with out-of-range, exponent and negative page numbers as if none were given", async () => {
    const coordinator = await demoCookie("coordinator@ringbatch.example");
    const plain = await call(resultsPage.loader, get(`/studies/${checkingStudyId}/results`, coordinator), { studyId: String(checkingStudyId) });
    for (const query of ["page=1e20", "labs=1e20", "page=-3&labs=0", "page=99999999999999999999", "page=2.5", "page=0x10", "labs=NaN"]) {
      const outcome = await call(resultsPage.loader, get(`/studies/${checkingStudyId}/results?${query}`, coordinator), { studyId: String(checkingStudyId) });
      expect(outcome.status, query).toBe(200);
      expect(outcome.data.audit.page, query).toBe(plain.data.audit.page);
      expect(outcome.data.labsPage, query).toBe(plain.data.labsPage);
    }
    checked();
  });
});

describe("11. text and date hygiene", () => {
  it("refuses control and text-direction characters in a name, beside the field, and keeps the old name", async () => {
    const cookie = await demoCookie("analyst1@ringbatch.example");
    const before = (await db.query.users.findFirst({ where: eq(users.email, "analyst1@ringbatch.example") }))!.name;
    // U+202E RIGHT-TO-LEFT OVERRIDE makes "Ana\u202Enamdeeps" display as "Anaspeedman" reversed (Unicode Standard Annex #9).
    for (const name of ["Ana\u0000Lopez", "Ana\u202Enamdeeps", "Ana\u2066Lopez", "Ana\u0007Lopez"]) {
      const outcome = await call(account.action, post("/account", { intent: "profile", name }, cookie));
      expect(outcome.status, JSON.stringify(name)).toBe(400);
      expect(errorsOf(outcome).name, JSON.stringify(name)).toMatch(/^Remove the (control|text-direction) characters/);
    }
    expect((await db.query.users.findFirst({ where: eq(users.email, "analyst1@ringbatch.example") }))!.name).toBe(before);
    // Free text too: the lab's answer to an open query is refused beside the field and nothing is stored.
    const open = (await db.query.queries.findFirst({ where: eq(queries.state, "open") }))!;
    const cell = (await db.query.cells.findFirst({ where: eq(cells.id, open.cellId) }))!;
    const lab = (await db.query.enrollments.findFirst({ where: eq(enrollments.id, cell.enrollmentId) }))!.labId;
    const member = (await db.query.labMembers.findFirst({ where: eq(labMembers.labId, lab) }))!;
    const answerer = await sessionCookieFor(member.userId);
    const refused = await call(labQueries.action, post("/lab/queries", { queryId: String(open.id), answer: "Checked\u202E the float" }, answerer));
    expect(refused.status).toBe(400);
    expect(errorsOf(refused).answer).toMatch(/^Remove the text-direction characters/);
    expect((await db.query.queries.findFirst({ where: eq(queries.id, open.id) }))!.state).toBe("open");
    checked();
  });

  it("refuses an operator with hidden characters and test dates before 1990 or after the study's end, row by row", () => {
    const frame = {
      replicatesPerCell: 3,
      materials: [{ id: 1, code: "F1" }],
      responses: [{ id: 1, key: "holes", name: "Passes", unit: "", kind: "count" as const, decimals: 0, plausibleMin: null, plausibleMax: null }],
      submittedCells: new Set<string>(),
      studyEnd: "2026-10-30",
    };
    const row = (replicate: number, testedOn: string, operator: string) => ({ material: "F1", response: "holes", replicate, value: 8, testedOn, operator });
    const { problems, resolved } = resolveResultRows(
      frame,
      [row(1, "2026-10-14", "Ines Paravel"), row(2, "1989-12-31", "Ines Paravel"), row(3, "2026-10-31", "Ines Paravel")],
      { valueRequired: true },
    );
    expect(resolved.map((r) => r.replicate)).toEqual([1]);
    expect(problems).toEqual([
      { row: 2, field: "tested_on", message: "The test date is before 1990-01-01; check the year." },
      { row: 3, field: "tested_on", message: "The test date is after the study's end (2026-10-30)." },
    ]);
    const hidden = resolveResultRows(frame, [row(1, "2026-10-14", "Ines\u202EParavel"), row(2, "2026-10-14", "Ines\u0000")], { valueRequired: true });
    expect(hidden.problems.map((p) => [p.row, p.field])).toEqual([
      [1, "operator"],
      [2, "operator"],
    ]);
    checked();
  });

  it("refuses the same through the results API, with nothing stored", async () => {
    const enrollmentId = await enrollmentOfAnalyst(7);
    const before = await db.select().from(results).innerJoin(cells, eq(cells.id, results.cellId)).where(eq(cells.enrollmentId, enrollmentId));
    const request = new Request(`http://ringbatch.test/api/v1/enrollments/${enrollmentId}/results`, {
      method: "POST",
      headers: { "Content-Type": "application/json", Origin: "http://ringbatch.test", Cookie: await demoCookie("analyst7@ringbatch.example") },
      body: JSON.stringify({ results: [{ material: "F1", response: "holes", replicate: 1, value: 9, testedOn: "1985-06-01", operator: "Bo\u202ELindqvar" }] }),
    });
    const outcome = await call(enrollmentResults.action, request, { enrollmentId: String(enrollmentId) });
    expect(outcome.status).toBe(422);
    const after = await db.select().from(results).innerJoin(cells, eq(cells.id, results.cellId)).where(eq(cells.enrollmentId, enrollmentId));
    expect(after.length).toBe(before.length);
    checked();
  });
});

describe("12. small leaks", () => {
  it("draws lab codes from a range much wider than the number of labs", () => {
    // Two labs in a study: with codes from L01…L99, a code above L10 turns up in 200 draws all but surely ((10/99)^200 < 1e-199).
    const drawn = Array.from({ length: 200 }, () => Number(drawLabCode(new Set(), 2).slice(1)));
    expect(Math.max(...drawn)).toBeGreaterThan(10);
    expect(Math.max(...drawn)).toBeLessThanOrEqual(99);
    checked();
  });

  it("shows analysts of a lab that declined or was withdrawn the notice only", async () => {
    const enrollmentId = await enrollmentOfAnalyst(6);
    const cookie = await demoCookie("analyst6@ringbatch.example");
    const params = { studyId: String(testingStudyId) };
    expect((await call(receipt.loader, get(`/lab/studies/${testingStudyId}/receipt`, cookie), params)).status).toBe(200);
    for (const state of ["declined", "withdrawn"] as const) {
      await db.update(enrollments).set({ state }).where(eq(enrollments.id, enrollmentId));
      const notice = await call(tasks.loader, get(`/lab/studies/${testingStudyId}`, cookie), params);
      expect(notice.status).toBe(200);
      expect(notice.data).toEqual({ ended: state });
      expect((await call(receipt.loader, get(`/lab/studies/${testingStudyId}/receipt`, cookie), params)).status).toBe(404);
      const f1 = (await db.query.materials.findFirst({ where: and(eq(materials.studyId, testingStudyId), eq(materials.code, "F1")) }))!.id;
      expect((await call(entry.loader, get(`/lab/studies/${testingStudyId}/results/${f1}`, cookie), { ...params, materialId: String(f1) })).status).toBe(404);
    }
    await db.update(enrollments).set({ state: "accepted" }).where(eq(enrollments.id, enrollmentId));
    checked();
  });

  it("requires SESSION_SECRET and APP_URL in production", async () => {
    const { productionConfigProblems } = await import("~/server/deployment.server");
    expect(productionConfigProblems({ NODE_ENV: "production" })).toHaveLength(2);
    expect(productionConfigProblems({ NODE_ENV: "production", SESSION_SECRET: "s", APP_URL: "ftp://x" })).toHaveLength(1);
    expect(productionConfigProblems({ NODE_ENV: "production", SESSION_SECRET: "s", APP_URL: "https://ringbatch.example.org" })).toEqual([]);
    expect(productionConfigProblems({ NODE_ENV: "development" })).toEqual([]);
    checked();
  });
});
