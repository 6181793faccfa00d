import type { Route } from "./+types/files";
import { notFound, requireUser } from "~/server/guards.server";
import { attachmentResponse } from "~/server/uploads.server";
import { readableAttachment } from "~/models/attachment.server";

/** Authorised download of an uploaded file; anyone not allowed gets 404. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const id = Number(params.fileId);
  if (!Number.isSafeInteger(id)) notFound();
  const attachment = await readableAttachment(user, id);
  if (!attachment) notFound();
  return attachmentResponse(attachment);
}
