import type { Route } from "./+types/files";
import { notFound, requireUser } from "~/server/guards.server";
import { attachmentResponse } from "~/server/uploads.server";
import { readableAttachment } from "~/models/attachment.server";

/** Authorised download of an uploaded file under a neutral name (`?thumbnail` for an image's small copy); anyone not allowed gets 404. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const id = Number(params.fileId);
  if (!Number.isSafeInteger(id)) notFound();
  const readable = await readableAttachment(user, id);
  if (!readable) notFound();
  return attachmentResponse(readable.attachment, readable.downloadName, { thumbnail: new URL(request.url).searchParams.has("thumbnail") });
}
