/**
 * Uploaded files (surface photos, receipt photos, protocol PDFs). The type is
 * read from the file's first bytes, never from its name or the browser's word;
 * files are stored under data/uploads by their SHA-256, so no user-chosen
 * name ever reaches the file system. Images are decoded and encoded again by
 * sharp: what is stored carries no metadata (author, copyright, comments, GPS,
 * camera serial), and a small JPEG beside it serves the pages. Files are
 * served under a neutral name chosen by the caller, never the uploaded one,
 * which could name the lab.
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

export const EXTENSION: Record<StoredType, string> = {
  "image/jpeg": "jpg",
  "image/png": "png",
  "image/webp": "webp",
  "application/pdf": "pdf",
};

/** Largest image accepted, in pixels (a 50-megapixel camera's frame): decoding a bigger one would take too much memory. */
export const MAX_IMAGE_PIXELS = 50_000_000;
/** Longest side of the thumbnails the pages show. */
export const THUMBNAIL_SIDE = 480;

/**
 * The image encoded again without any metadata, turned upright first (the
 * orientation tag goes with the rest), and its thumbnail.
 */
async function cleanImage(bytes: Uint8Array, type: Exclude<StoredType, "application/pdf">) {
  // Loaded on the first photo: the library is large, and most requests never need it.
  const { default: sharp } = await import("sharp");
  const source = () => sharp(bytes, { limitInputPixels: MAX_IMAGE_PIXELS, failOn: "error" }).rotate();
  try {
    const encoded = type === "image/jpeg" ? source().jpeg({ quality: 90 }) : type === "image/png" ? source().png() : source().webp({ quality: 90 });
    const thumbnail = source().resize(THUMBNAIL_SIDE, THUMBNAIL_SIDE, { fit: "inside", withoutEnlargement: true }).jpeg({ quality: 80 });
    const [image, thumb] = await Promise.all([encoded.toBuffer(), thumbnail.toBuffer()]);
    return { image: new Uint8Array(image), thumbnail: new Uint8Array(thumb) };
  } catch (error) {
    const message = error instanceof Error ? error.message : "";
    if (/pixel limit/i.test(message)) throw new UploadError(`The image has more than ${MAX_IMAGE_PIXELS / 1_000_000} million pixels; send a smaller one.`);
    throw new UploadError("This image cannot be read: it may be damaged or cut short.");
  }
}

const sha256Of = (bytes: Uint8Array) => createHash("sha256").update(bytes).digest("hex");

async function keep(bytes: Uint8Array, type: string) {
  const sha256 = sha256Of(bytes);
  if (!(await storage.has(sha256))) await storage.set(sha256, new File([bytes as BlobPart], sha256, { type }));
  return sha256;
}

/** Checks and stores one file; returns its attachment row. Throws UploadError with a message for the person. */
export async function storeUpload(
  file: File,
  { allowed, maxBytes, uploadedBy }: { allowed: readonly StoredType[]; maxBytes: number; uploadedBy: number },
) {
  if (file.size === 0) throw new UploadError("The file is empty.");
  if (file.size > maxBytes) throw new UploadError(`The file is larger than ${Math.round(maxBytes / 1024 / 1024)} MB.`);
  const received = new Uint8Array(await file.arrayBuffer());
  const type = sniffType(received);
  if (!type || !allowed.includes(type)) {
    const names = allowed.map((t) => EXTENSION[t].toUpperCase()).join(", ");
    throw new UploadError(`This file is not a ${names} file (judged from its contents, not its name).`);
  }
  let bytes = received;
  let thumbnailSha256: string | null = null;
  if (type !== "application/pdf") {
    const cleaned = await cleanImage(received, type);
    bytes = cleaned.image;
    thumbnailSha256 = await keep(cleaned.thumbnail, "image/jpeg");
  }
  const sha256 = await keep(bytes, type);
  // Kept for the uploader's own records only; downloads get a neutral name.
  const originalName = (file.name.split(/[\\/]/).pop() || "upload").slice(0, 120);
  const [row] = await db
    .insert(attachments)
    .values({ sha256, thumbnailSha256, contentType: type, sizeBytes: bytes.length, originalName, uploadedBy })
    .returning();
  return row!;
}

/**
 * The stored file of an attachment row (or its thumbnail), as a download
 * response with safe headers, named `downloadName` plus the type's extension.
 */
export async function attachmentResponse(attachment: typeof attachments.$inferSelect, downloadName: string, { thumbnail = false } = {}) {
  const useThumbnail = thumbnail && attachment.thumbnailSha256 !== null;
  const file = await storage.get(useThumbnail ? attachment.thumbnailSha256! : attachment.sha256);
  if (!file) return new Response("Not found", { status: 404 });
  const type = (useThumbnail ? "image/jpeg" : attachment.contentType) as StoredType;
  const safeName = `${downloadName.replace(/[^\w.-]/g, "_")}${useThumbnail ? "-thumbnail" : ""}.${EXTENSION[type] ?? "bin"}`;
  const disposition = type === "application/pdf" ? "attachment" : "inline";
  return new Response(file.stream(), {
    headers: {
      "Content-Type": type,
      "Content-Length": String(file.size),
      "Content-Disposition": `${disposition}; filename="${safeName}"`,
      "X-Content-Type-Options": "nosniff",
      "Cache-Control": "private, max-age=300",
    },
  });
}
