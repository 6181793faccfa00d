import { Form, Link, NavLink, useLocation } from "react-router";
import type { Role } from "~/db/schema";
import { Wordmark } from "./wordmark";

type HeaderUser = { name: string; roles: Role[] };

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
const MAILBOX_LINK: NavItem = { to: "/dev/mailbox", label: "Mailbox" };

type NavItem = { to: string; label: string };

/** The main menu's links; on a phone they sit in a disclosure, which closes when one is followed. */
function MainNav({ items, className }: { items: NavItem[]; className: string }) {
  const current = currentItem(useLocation().pathname, items);
  return (
    <nav aria-label="Main" className={className}>
      {items.map((item) => (
        <Link
          key={item.to}
          to={item.to}
          aria-current={item.to === current ? "page" : undefined}
          onClick={(event) => event.currentTarget.closest("details")?.removeAttribute("open")}
          className={`rounded px-3 py-2 font-semibold ${item.to === current ? "bg-basalt-700 text-ochre-300" : "text-basalt-100 hover:bg-basalt-700"}`}
        >
          {item.label}
        </Link>
      ))}
    </nav>
  );
}

function Account({ user }: { user: HeaderUser }) {
  return (
    <div className="flex items-center gap-3">
      <NavLink to="/account" className="rounded px-2 py-1 text-basalt-100 hover:bg-basalt-700">
        <span className="font-semibold text-white">{user.name}</span>
        <span className="block text-xs">{user.roles.map((r) => ROLE_LABEL[r]).join(" · ")}</span>
      </NavLink>
      <Form method="post" action="/logout">
        <button type="submit" className="rounded border border-basalt-200 px-3 py-1.5 font-semibold text-white hover:bg-basalt-700">
          Sign out
        </button>
      </Form>
    </div>
  );
}

/** The links of every role the person holds, each once, in the order of their roles. */
function navOf(user: HeaderUser, mailbox: boolean) {
  const links = [
    ...user.roles.flatMap((r) => NAV_BY_ROLE[r]),
    ...user.roles.flatMap((r) => TOOLKIT_NAV[r]),
    ...(mailbox && user.roles.some((r) => r === "admin" || r === "coordinator") ? [MAILBOX_LINK] : []),
  ];
  return links.filter((link, i) => links.findIndex((other) => other.to === link.to) === i);
}

/** The one menu item for the page: the longest that leads to it, so "/studies/new" lights "New study" and not "Studies" as well. */
function currentItem(pathname: string, items: { to: string }[]) {
  const leading = items.filter((item) => pathname === item.to || pathname.startsWith(`${item.to}/`));
  return leading.reduce<string | null>((best, item) => (best === null || item.to.length > best.length ? item.to : best), null);
}

export function AppHeader({ user, mailbox = false }: { user: HeaderUser | null; mailbox?: boolean }) {
  const nav = user ? navOf(user, mailbox) : [];
  return (
    <header className="no-print relative bg-basalt-800 text-white">
      <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-3">
        <a href="/" className="rounded text-white">
          <Wordmark />
        </a>
        {user && (
          <>
            <MainNav items={nav} className="hidden flex-1 flex-wrap gap-1 md:flex" />
            <div className="hidden md:block">
              <Account user={user} />
            </div>
            {/* Narrow screens: the menu folds into a disclosure, which works without JavaScript. */}
            <details className="group ml-auto md:hidden">
              <summary className="flex min-h-11 cursor-pointer list-none items-center gap-2 rounded border border-basalt-200 px-3 font-semibold [&::-webkit-details-marker]:hidden">
                <span aria-hidden="true" className="text-lg leading-none">
                  ☰
                </span>
                Menu
              </summary>
              <div className="absolute right-0 left-0 z-30 mt-3 grid gap-3 bg-basalt-800 px-4 pb-4 shadow-lg">
                <MainNav items={nav} className="grid gap-1" />
                <Account user={user} />
              </div>
            </details>
          </>
        )}
      </div>
    </header>
  );
}
