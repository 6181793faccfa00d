import { Link } from "react-router";
import type { Route } from "./+types/mailbox-message";
import { Card, PageHeader } from "~/components/ui";
import { notFound } from "~/server/guards.server";
import { getMessage, requireMailbox } from "~/models/mailbox.server";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.message.subject ?? "Message"} · Mailbox · Ringbatch` }];

export async function loader({ request, params }: Route.LoaderArgs) {
  const viewer = await requireMailbox(request);
  const id = Number(params.messageId);
  const message = Number.isSafeInteger(id) ? await getMessage(viewer, id) : null;
  if (!message) notFound();
  return { message: { ...message, sentAt: message.createdAt.toISOString() } };
}

/** The text part, with its links made clickable; the HTML part is shown as the recipient's mail program would, in a sandboxed frame. */
export default function MailboxMessage({ loaderData }: Route.ComponentProps) {
  const { message } = loaderData;
  const parts = message.text.split(/(https?:\/\/\S+)/g);
  return (
    <>
      <PageHeader title={message.subject} subtitle={<>To {message.to} · {message.sentAt}</>} />
      <p className="mb-4">
        <Link to="/dev/mailbox" className="font-semibold text-basalt-700 underline">
          Back to the mailbox
        </Link>
      </p>
      <div className="grid gap-6 lg:grid-cols-2">
        <Card title="Text">
          <p className="whitespace-pre-wrap break-words">
            {parts.map((part, i) =>
              i % 2 === 1 ? (
                <a key={i} href={part} className="font-semibold text-basalt-700 underline">
                  {part}
                </a>
              ) : (
                part
              ),
            )}
          </p>
        </Card>
        <Card title="As sent (HTML)">
          <iframe title="Message as HTML" sandbox="" srcDoc={message.html} className="h-96 w-full rounded border border-basalt-100" />
        </Card>
      </div>
    </>
  );
}
