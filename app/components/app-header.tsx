import { Form, Link, NavLink, useLocation } from "react-router";
import type { Role } from "~/db/schema";
import { Wordmark } from "./wordmark";

type HeaderUser = { name: string; role: Role };

const NAV_BY_ROLE: Record<Role, { to: string; label: string }[]> = {
  admin: [
    { to: "/admin/users", label: "Users" },
    { to: "/admin/labs", label: "Labs" },
    { to: "/studies", label: "Studies" },
    { to: "/rounds", label: "Rounds" },
  ],
  coordinator: [
    { to: "/studies", label: "Studies" },
    { to: "/studies/new", label: "New study" },
    { to: "/rounds", label: "Rounds" },
  ],
  analyst: [
    { to: "/lab", label: "My lab" },
    { to: "/lab/rounds", label: "Rounds" },
  ],
  reviewer: [{ to: "/review", label: "Reviews" }],
};

/** The method toolkit: ruggedness studies for those who plan studies, mixture comparisons for everyone. */
const TOOLKIT_NAV: Record<Role, { to: string; label: string }[]> = {
  admin: [{ to: "/ruggedness", label: "Ruggedness" }, { to: "/compare", label: "Compare mixtures" }],
  coordinator: [{ to: "/ruggedness", label: "Ruggedness" }, { to: "/compare", label: "Compare mixtures" }],
  analyst: [{ to: "/compare", label: "Compare mixtures" }],
  reviewer: [{ to: "/compare", label: "Compare mixtures" }],
};

const ROLE_LABEL: Record<Role, string> = {
  admin: "Administrator",
  coordinator: "Study coordinator",
  analyst: "Lab analyst",
  reviewer: "Committee reviewer",
};

/** The local mailbox, while no real mail provider is set; its messages carry sign-in links. */
const MAILBOX_LINK = { to: "/dev/mailbox", label: "Mailbox" };

/** The one menu item for the page: the longest that leads to it, so "/studies/new" lights "New study" and not "Studies" as well. */
function currentItem(pathname: string, items: { to: string }[]) {
  const leading = items.filter((item) => pathname === item.to || pathname.startsWith(`${item.to}/`));
  return leading.reduce<string | null>((best, item) => (best === null || item.to.length > best.length ? item.to : best), null);
}

export function AppHeader({ user, mailbox = false }: { user: HeaderUser | null; mailbox?: boolean }) {
  const nav = user ? [...NAV_BY_ROLE[user.role], ...TOOLKIT_NAV[user.role], ...(mailbox && (user.role === "admin" || user.role === "coordinator") ? [MAILBOX_LINK] : [])] : [];
  const current = currentItem(useLocation().pathname, nav);
  return (
    <header className="no-print bg-basalt-800 text-white">
      <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-3">
        <a href="/" className="rounded text-white">
          <Wordmark />
        </a>
        {user && (
          <nav aria-label="Main" className="flex flex-1 flex-wrap gap-1">
            {nav.map((item) => (
              <Link
                key={item.to}
                to={item.to}
                aria-current={item.to === current ? "page" : undefined}
                className={`rounded px-3 py-1.5 font-semibold ${item.to === current ? "bg-basalt-700 text-ochre-300" : "text-basalt-100 hover:bg-basalt-700"}`}
              >
                {item.label}
              </Link>
            ))}
          </nav>
        )}
        {user && (
          <div className="flex items-center gap-3">
            <NavLink to="/account" className="rounded px-2 py-1 text-basalt-100 hover:bg-basalt-700">
              <span className="font-semibold text-white">{user.name}</span>
              <span className="block text-xs">{ROLE_LABEL[user.role]}</span>
            </NavLink>
            <Form method="post" action="/logout">
              <button type="submit" className="rounded border border-basalt-200 px-3 py-1.5 font-semibold text-white hover:bg-basalt-700">
                Sign out
              </button>
            </Form>
          </div>
        )}
      </div>
    </header>
  );
}
