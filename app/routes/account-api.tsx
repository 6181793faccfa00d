import { Link } from "react-router";
import type { Route } from "./+types/account-api";
import { Card, Notice, PageHeader } from "~/components/ui";
import { apiExamples, exampleSetup } from "~/lib/api/examples";
import { apiExampleContext } from "~/models/api-token.server";
import { appUrl } from "~/server/email.server";
import { requireUser } from "~/server/guards.server";

export const meta: Route.MetaFunction = () => [{ title: "Using the API · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const context = await apiExampleContext(user, new URL(appUrl(request, "/")).origin);
  return { setup: exampleSetup(context), examples: apiExamples(context) };
}

export default function AccountApi({ loaderData }: Route.ComponentProps) {
  const { setup, examples } = loaderData;
  return (
    <>
      <PageHeader title="Using the API" subtitle="Scripts and lab information systems read studies and send results over HTTP." />
      <div className="grid gap-6 [&>*]:min-w-0">
        <Card title="Tokens">
          <div className="flex flex-col gap-3">
            <p>
              A script signs in with an API token instead of your password. Make one on{" "}
              <Link to="/account" className="font-semibold text-basalt-700 underline">
                your account page
              </Link>{" "}
              under "API tokens"; it is shown once, so copy it then. A token acts as you, for one study only: a <code>results:write</code> token
              writes your lab's draft results for one enrollment, a <code>study:read</code> token reads that study as your role allows (lab codes
              only for reviewers, your own lab only for an analyst). Revoke a token there when it is no longer used; changing your password revokes
              them all.
            </p>
            <Notice>Keep a token like a password: anyone who has it acts as you on that study. Never put it in a shared file or a web page.</Notice>
            <p>
              Every call and its answers are described in the{" "}
              <a href="/api/v1/openapi.json" className="font-semibold text-basalt-700 underline">
                OpenAPI document
              </a>
              , which API tools read to make a client. Every failure answers <code>{'{ "error": { "code", "message", "details"? } }'}</code>; reads send
              an ETag, and sending it back in <code>If-None-Match</code> gets 304 while nothing has changed.
            </p>
          </div>
        </Card>
        <Card title="Examples for you">
          <p className="mb-3">Filled in with this app's address and your own studies. First set where the app is and your token:</p>
          <pre className="mb-4 overflow-x-auto rounded-md bg-basalt-50 p-3 text-sm" tabIndex={0} aria-label="Setting up">
            <code>{setup}</code>
          </pre>
          <ul className="flex flex-col gap-4">
            {examples.map((example) => (
              <li key={example.title}>
                <h3 className="mb-1 font-semibold text-basalt-800">{example.title}</h3>
                <pre className="overflow-x-auto rounded-md bg-basalt-50 p-3 text-sm" tabIndex={0} aria-label={example.title}>
                  <code>{example.command}</code>
                </pre>
              </li>
            ))}
          </ul>
        </Card>
      </div>
    </>
  );
}
