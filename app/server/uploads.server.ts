/**
 * Uploaded files (surface photos, receipt photos, protocol PDFs). The type is
 * read from the file's first bytes, never from its name or the browser's word;
 * files are stored under data/uploads by their SHA-256, so no user-chosen
 * name ever reaches the file system.
 */
import { createHash } from "node:crypto";
import { resolve } from "node:path";
import { createFsFileStorage } from "@remix-run/file-storage/fs";
import { db } from "~/db/client.server";
import { attachments } from "~/db/schema";

export const IMAGE_TYPES = ["image/jpeg", "image/png", "image/webp"] as const;
export const PDF_TYPES = ["application/pdf"] as const;
export type StoredType = (typeof IMAGE_TYPES)[number] | (typeof PDF_TYPES)[number];

const storage = createFsFileStorage(resolve(process.env.UPLOADS_DIR ?? "data/uploads"));

const startsWith = (bytes: Uint8Array, signature: number[], offset = 0) => signature.every((b, i) => bytes[offset + i] === b);

/** The type a file's bytes say it is (JPEG, PNG, WebP or PDF), or null. SVG and everything else: null. */
export function sniffType(bytes: Uint8Array): StoredType | null {
  if (startsWith(bytes, [0xff, 0xd8, 0xff])) return "image/jpeg";
  if (startsWith(bytes, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return "image/png";
  if (startsWith(bytes, [0x52, 0x49, 0x46, 0x46]) && startsWith(bytes, [0x57, 0x45, 0x42, 0x50], 8)) return "image/webp";
  if (startsWith(bytes, [0x25, 0x50, 0x44, 0x46, 0x2d])) return "application/pdf";
  return null;
}

export class UploadError extends Error {}

const EXTENSION: Record<StoredType, string> = {
  "image/jpeg": "jpg",
  "image/png": "png",
  "image/webp": "webp",
  "application/pdf": "pdf",
};

/** Checks and stores one file; returns its attachment row. Throws UploadError with a message for the person. */
export async function storeUpload(
  file: File,
  { allowed, maxBytes, uploadedBy }: { allowed: readonly StoredType[]; maxBytes: number; uploadedBy: number },
) {
  if (file.size === 0) throw new UploadError("The file is empty.");
  if (file.size > maxBytes) throw new UploadError(`The file is larger than ${Math.round(maxBytes / 1024 / 1024)} MB.`);
  const bytes = new Uint8Array(await file.arrayBuffer());
  const type = sniffType(bytes);
  if (!type || !allowed.includes(type)) {
    const names = allowed.map((t) => EXTENSION[t].toUpperCase()).join(", ");
    throw new UploadError(`This file is not a ${names} file (judged from its contents, not its name).`);
  }
  const sha256 = createHash("sha256").update(bytes).digest("hex");
  if (!(await storage.has(sha256))) await storage.set(sha256, new File([bytes], sha256, { type }));
  // Keep only the base name, for the download's suggested name.
  const originalName = (file.name.split(/[\\/]/).pop() || "upload").slice(0, 120);
  const [row] = await db.insert(attachments).values({ sha256, contentType: type, sizeBytes: bytes.length, originalName, uploadedBy }).returning();
  return row!;
}

/** The stored file of an attachment row, as a download response with safe headers. */
export async function attachmentResponse(attachment: typeof attachments.$inferSelect) {
  const file = await storage.get(attachment.sha256);
  if (!file) return new Response("Not found", { status: 404 });
  const safeName = attachment.originalName.replace(/[^\w.\- ]/g, "_");
  const disposition = attachment.contentType === "application/pdf" ? "attachment" : "inline";
  return new Response(file.stream(), {
    headers: {
      "Content-Type": attachment.contentType,
      "Content-Length": String(attachment.sizeBytes),
      "Content-Disposition": `${disposition}; filename="${safeName}"`,
      "X-Content-Type-Options": "nosniff",
      "Cache-Control": "private, max-age=300",
    },
  });
}
