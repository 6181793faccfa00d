import { Link } from "react-router";
import type { Route } from "./+types/mailbox";
import { DataTable } from "~/components/data-table";
import { Card, Notice, PageHeader } from "~/components/ui";
import { listMessages, requireMailbox } from "~/models/mailbox.server";

export const meta: Route.MetaFunction = () => [{ title: "Mailbox · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const viewer = await requireMailbox(request);
  const messages = await listMessages(viewer);
  return { messages: messages.map((m) => ({ ...m, sentAt: m.createdAt.toISOString().replace("T", " ").slice(0, 16) })) };
}

export default function Mailbox({ loaderData }: Route.ComponentProps) {
  return (
    <>
      <PageHeader title="Mailbox" subtitle="Messages kept by the local mail transport; nothing leaves this machine." />
      <Notice tone="caution">
        A development stand-in for e-mail, unsafe for real users. You see the mail of the studies you coordinate (an
        administrator sees all); invitation and first-password links work only in messages addressed to you.
      </Notice>
      <Card className="mt-4">
        <DataTable
          caption="Messages, newest first"
          filterLabel="Filter messages"
          empty="No messages yet."
          data={loaderData.messages}
          columns={[
            { id: "sentAt", header: "Sent (UTC)", value: (m) => m.sentAt },
            { id: "to", header: "To", value: (m) => m.to },
            {
              id: "subject",
              header: "Subject",
              value: (m) => m.subject,
              cell: (m) => (
                <Link to={`/dev/mailbox/${m.id}`} className="font-semibold text-basalt-700 underline">
                  {m.subject}
                </Link>
              ),
            },
          ]}
        />
      </Card>
    </>
  );
}
