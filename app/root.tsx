import "~/lib/zod-without-eval";
import { data, isRouteErrorResponse, Links, Meta, Outlet, Scripts, ScrollRestoration, useRouteLoaderData } from "react-router";
import type { Route } from "./+types/root";
import { AppHeader } from "~/components/app-header";
import { getUser } from "~/server/guards.server";
import { isForeignOrigin } from "~/server/origin-check.server";
import { demoDataPresent } from "~/models/first-use.server";
import { mailboxEnabled } from "~/models/mailbox.server";
import { takeToast } from "~/server/toast.server";
import { Notice } from "~/components/ui";
import "./app.css";

// The security headers are set by the express layer (server/app.ts), on every answer.
const guardRequests: Route.MiddlewareFunction = async ({ request }, next) => {
  if (isForeignOrigin(request)) return new Response("Cross-site request refused", { status: 403 });
  return next();
};

export const middleware: Route.MiddlewareFunction[] = [guardRequests];

export async function loader({ request }: Route.LoaderArgs) {
  const [user, { toast, headers }, demo] = await Promise.all([getUser(request), takeToast(request), demoDataPresent()]);
  return data({ user: user && { name: user.name, roles: user.roles }, mailbox: mailboxEnabled(), demo, toast }, { headers });
}

// The browser's icons and manifest, from public/ (drawn by scripts/make-icons.ts from the mark).
export const links: Route.LinksFunction = () => [
  { rel: "icon", href: "/favicon.svg", type: "image/svg+xml" },
  { rel: "icon", href: "/favicon.png", type: "image/png", sizes: "32x32" },
  { rel: "apple-touch-icon", href: "/apple-touch-icon.png" },
  { rel: "manifest", href: "/site.webmanifest" },
];

export const meta: Route.MetaFunction = () => [{ title: "Ringbatch" }];

export function Layout({ children }: { children: React.ReactNode }) {
  const rootData = useRouteLoaderData<typeof loader>("root");
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <Meta />
        <Links />
      </head>
      <body className="min-h-screen font-sans">
        <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-10 focus:rounded focus:bg-white focus:px-3 focus:py-2">
          Skip to content
        </a>
        {rootData?.demo && (
          <p role="note" className="no-print bg-ochre-100 px-4 py-1 text-center text-sm text-basalt-900">
            Demo data: the people, labs and results here are fictional, and the demo password is published. Do not enter
            real results.
          </p>
        )}
        <AppHeader user={rootData?.user ?? null} mailbox={rootData?.mailbox ?? false} />
        <main id="main" className="mx-auto max-w-6xl px-4 py-8">
          {rootData?.toast && (
            <div className="no-print mb-4">
              <Notice tone={rootData.toast.tone}>{rootData.toast.message}</Notice>
            </div>
          )}
          {children}
        </main>
        <ScrollRestoration />
        <Scripts />
      </body>
    </html>
  );
}

export default function App() {
  return <Outlet />;
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  let title = "Something went wrong";
  let message = "The page could not be shown. Try again; if it keeps happening, tell the study coordinator.";
  if (isRouteErrorResponse(error)) {
    if (error.status === 404) {
      title = "Not found";
      message = "There is nothing here, or it is not yours to see.";
    } else {
      title = `Error ${error.status}`;
      message = typeof error.data === "string" ? error.data : error.statusText;
    }
  }
  return (
    <div className="max-w-xl">
      <h1 className="text-2xl font-bold">{title}</h1>
      <p className="mt-2 text-basalt-700">{message}</p>
      <a href="/" className="mt-4 inline-block font-semibold text-basalt-700 underline">
        Go to your start page
      </a>
    </div>
  );
}
