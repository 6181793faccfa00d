import { eq, isNotNull } from "drizzle-orm";
import { beforeAll, describe, expect, it, vi } from "vitest";
import { db } from "~/db/client.server";
import { attachments, results } from "~/db/schema";
import * as files from "~/routes/files";
import * as entry from "~/routes/lab/study/result-entry";
import { demoCookie, useDemoStudyInTesting } from "../support/demo";
import * as photoUpload from "~/routes/lab/study/result-photo";
import { call, get } from "../support/routes";
import { errorsOf, toastOf, valuesOf } from "../support/replies";

// The file store reads its directory when first loaded, so point it at a scratch directory before any import.
vi.hoisted(() => {
  process.env.UPLOADS_DIR = require("node:fs").mkdtempSync(require("node:path").join(require("node:os").tmpdir(), "ringbatch-uploads-"));
});

let studyId: string;
let f1: string;

beforeAll(async () => {
  ({ studyId, f1 } = await useDemoStudyInTesting());
});

// A 1 × 1 pixel PNG: the 8-byte PNG signature (89 50 4E 47 0D 0A 1A 0A, PNG specification) and its chunks.
const PNG = Uint8Array.from(atob("iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNk+M9QDwADhgGAWjR9awAAAABJRU5ErkJggg=="), (c) => c.charCodeAt(0));

function uploadPhoto(bytes: Uint8Array, name: string, cookie: string, replicate = "1", path = "") {
  const form = new FormData();
  form.set("intent", "photo");
  form.set("replicate", replicate);
  form.set("photo", new File([bytes as BlobPart], name, { type: "image/jpeg" }));
  return new Request(`http://ringbatch.test/lab/studies/${studyId}/results/${f1}${path}`, { method: "POST", headers: { Origin: "http://ringbatch.test", Cookie: cookie }, body: form });
}

describe("surface photos per replicate", () => {
  it("accepts a PNG named .jpg as a PNG, judged from its bytes, and links it to the replicate", async () => {
    const cookie = await demoCookie("analyst5@ringbatch.example"); // lab index 4: a draft of F1
    const outcome = await call(entry.action, uploadPhoto(PNG, "surface.jpg", cookie), { studyId, materialId: f1 });
    expect(await toastOf(outcome)).toBe("Photo of replicate 1 added.");
    const attachment = (await db.select().from(attachments)).at(-1)!;
    expect(attachment).toMatchObject({ contentType: "image/png", originalName: "surface.jpg" });
    const linked = await db.select().from(results).where(eq(results.photoAttachmentId, attachment.id));
    expect(linked.map((r) => r.replicate)).toEqual([1, 1]); // both responses of replicate 1
  });

  it("refuses a text file named .png beside the field", async () => {
    const cookie = await demoCookie("analyst5@ringbatch.example");
    const before = (await db.select().from(attachments)).length;
    const outcome = await call(entry.action, uploadPhoto(new TextEncoder().encode("just some notes, not a picture"), "notes.png", cookie, "2"), { studyId, materialId: f1 });
    expect(outcome.status).toBe(400);
    expect(errorsOf(outcome).photo).toBe("This file is not a JPG, PNG, WEBP file (judged from its contents, not its name).");
    expect(valuesOf(outcome).replicate).toBe("2");
    expect((await db.select().from(attachments)).length).toBe(before);
  });

  it("serves the photo to its lab and the coordinator with safe headers, and 404 to another lab", async () => {
    const [linked] = await db.select().from(results).where(isNotNull(results.photoAttachmentId));
    const url = `/files/${linked!.photoAttachmentId}`;
    const params = { fileId: String(linked!.photoAttachmentId) };
    const own = await call(files.loader, get(url, await demoCookie("analyst5@ringbatch.example")), params);
    expect(own.status).toBe(200);
    expect(own.headers.get("Content-Type")).toBe("image/png");
    expect(own.headers.get("X-Content-Type-Options")).toBe("nosniff");
    // A neutral name from the blind lab code, material, response and replicate, never the uploaded name.
    expect(own.headers.get("Content-Disposition")).toMatch(/^inline; filename="L\d{2}-F1-[a-z_]+-rep1\.png"$/);
    expect((await call(files.loader, get(url, await demoCookie("coordinator@ringbatch.example")), params)).status).toBe(200);
    expect((await call(files.loader, get(url, await demoCookie("analyst6@ringbatch.example")), params)).status).toBe(404);
    expect((await call(files.loader, get(url, await demoCookie("analyst1@ringbatch.example")), params)).status).toBe(404);
  });

  it("refuses a photo over 10 MB beside the field, before storing anything", async () => {
    const cookie = await demoCookie("analyst5@ringbatch.example");
    const before = (await db.select().from(attachments)).length;
    const outcome = await call(entry.action, uploadPhoto(new Uint8Array(10 * 1024 * 1024 + 1), "huge.jpg", cookie, "3"), { studyId, materialId: f1 });
    expect(outcome.status).toBe(413);
    expect(errorsOf(outcome).photo).toBe("The photo is larger than 10 MB. Choose a smaller one, or save it from the camera at a lower resolution.");
    expect((await db.select().from(attachments)).length).toBe(before);
  });

  it("asks for a result before a photo of a replicate with none", async () => {
    const cookie = await demoCookie("analyst7@ringbatch.example"); // lab index 6: nothing entered
    const outcome = await call(entry.action, uploadPhoto(PNG, "surface.png", cookie), { studyId, materialId: f1 });
    expect(outcome.status).toBe(400);
    expect(errorsOf(outcome).photo).toBe("Enter a result of replicate 1 before adding its photo.");
  });
});

// The page's script sends the photo here to show its progress; the answer is JSON for the script to place beside the replicate.
describe("the photo upload that reports its progress", () => {
  const send = (bytes: Uint8Array, name: string, cookie: string, replicate: string) => call(photoUpload.action, uploadPhoto(bytes, name, cookie, replicate, "/photo"), { studyId, materialId: f1 });

  it("stores the photo, links it to the replicate and carries the page's confirmation for the reload", async () => {
    const cookie = await demoCookie("analyst5@ringbatch.example");
    const outcome = await send(PNG, "surface.png", cookie, "2");
    expect(outcome.status).toBe(200);
    expect(outcome.data).toEqual({ stored: true });
    const toastCookie = outcome.headers.get("Set-Cookie")!;
    expect(toastCookie).toMatch(/^__ringbatch_toast=/);
    const attachment = (await db.select().from(attachments)).at(-1)!;
    const linked = await db.select().from(results).where(eq(results.photoAttachmentId, attachment.id));
    expect(linked.map((r) => r.replicate)).toEqual([2, 2]);
  });

  it("answers an oversize photo with the size message and 413, storing nothing", async () => {
    const cookie = await demoCookie("analyst5@ringbatch.example");
    const before = (await db.select().from(attachments)).length;
    const outcome = await send(new Uint8Array(10 * 1024 * 1024 + 1), "huge.jpg", cookie, "3");
    expect(outcome.status).toBe(413);
    expect(outcome.data).toEqual({ refusal: "The photo is larger than 10 MB. Choose a smaller one, or save it from the camera at a lower resolution." });
    expect((await db.select().from(attachments)).length).toBe(before);
  });

  it("answers a file that is no image, and a replicate without a result, with the model's words", async () => {
    const cookie = await demoCookie("analyst5@ringbatch.example");
    const notImage = await send(new TextEncoder().encode("just some notes, not a picture"), "notes.png", cookie, "2");
    expect(notImage.status).toBe(400);
    expect(notImage.data).toEqual({ refusal: "This file is not a JPG, PNG, WEBP file (judged from its contents, not its name)." });
    const empty = await send(PNG, "surface.png", await demoCookie("analyst7@ringbatch.example"), "1");
    expect(empty.data).toEqual({ refusal: "Enter a result of replicate 1 before adding its photo." });
  });

});
