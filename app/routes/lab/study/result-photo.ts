/**
 * A replicate's photo sent from the result entry page by a script that shows
 * the upload's progress. It answers in JSON: the refusal to show beside the
 * replicate, or that the photo is stored (with the page's confirmation as a
 * flash message for the reload that follows). Without scripts the page's own
 * form posts the photo to the page, which stores it the same way.
 */
import { parseWithZod } from "@conform-to/zod/v4";
import type { Route } from "./+types/result-photo";
import { PHOTO_MAX_BYTES, PHOTO_TOO_LARGE, photoAdded, type PhotoUploadReply, photoSchema } from "~/lib/results/entry-forms";
import { attachReplicatePhotoOrRefusal, materialEntry } from "~/models/results.server";
import { notFound } from "~/server/guards.server";
import { requireStudy } from "~/server/study-context.server";
import { toastCookie } from "~/server/toast.server";
import { readUploadForm } from "~/server/upload-form.server";

const refused = (refusal: string, status: number) => Response.json({ refusal } satisfies PhotoUploadReply, { status });

export async function action({ request, params, context }: Route.ActionArgs) {
  const { user, enrollment } = requireStudy(context, ["analyst"]);
  const entry = await materialEntry(enrollment!, Number(params.materialId));
  if (!entry) notFound();
  const upload = await readUploadForm(request, "photo", PHOTO_MAX_BYTES);
  if (upload.tooLarge) return refused(PHOTO_TOO_LARGE, 413);
  const submission = parseWithZod(upload.formData, { schema: photoSchema });
  if (submission.status !== "success") return refused(Object.values(submission.error ?? {}).flat()[0] ?? "Choose a photo to upload.", 400);
  const { replicate, photo } = submission.value;
  const refusal = await attachReplicatePhotoOrRefusal(enrollment!, entry.material.id, replicate, photo, user);
  if (refusal) return refused(refusal, 400);
  return Response.json({ stored: true } satisfies PhotoUploadReply, { headers: { "Set-Cookie": await toastCookie(photoAdded(replicate)) } });
}
