import type { ReactNode } from "react";
import { NavLink, Outlet, useMatches } from "react-router";
import { StateBadge } from "~/components/state-badge";
import type { StudyState } from "~/db/values";
import { STUDY_STATE } from "~/lib/state-labels";

/**
 * What a study's child route tells the frame around it: the page's name in the
 * title, fixed ("Results") or read from the page's loader data ("Results of M2").
 */
export type StudyPageHandle<LoaderData = unknown> = { pageTitle: string | ((loaderData: LoaderData) => string) };

export type StudyTab = { to: string; label: string; end?: boolean };

/** Tabs for the pages under `base`; the "" page is `base` itself and is active only there, not under its siblings. */
export function tabsUnder(base: string, pages: [path: string, label: string][]): StudyTab[] {
  return pages.map(([path, label]) => ({ to: base + path, label, end: path === "" }));
}

/** The few fields the frame shows, so a parent loader sends no more of the study than that. */
export function frameStudy({ id, code, title, state }: { id: number; code: string; title: string; state: StudyState }) {
  return { id, code, title, state };
}

/**
 * The whole component of a parent route whose loader returns `{ study: frameStudy(…) }`
 * and whose tabs are fixed: `pages` under `${base}/${study.id}`.
 */
export function framedStudyLayout(base: string, pages: [path: string, label: string][]) {
  return function FramedStudyLayout({ loaderData }: { loaderData: { study: ReturnType<typeof frameStudy> } }) {
    return <StudyFrame study={loaderData.study} tabs={tabsUnder(`${base}/${loaderData.study.id}`, pages)} />;
  };
}

/** The name of the deepest page that gives one, for the heading "Results — FF-2026-A". */
function usePageTitle() {
  const matches = useMatches();
  for (let i = matches.length - 1; i >= 0; i--) {
    const { handle, loaderData } = matches[i]! as { handle?: Partial<StudyPageHandle>; loaderData?: unknown };
    if (typeof handle?.pageTitle === "string") return handle.pageTitle;
    // Without its data (an error page below) the page has no name to give.
    if (handle?.pageTitle && loaderData !== undefined) return handle.pageTitle(loaderData);
  }
  return null;
}

/** The header and tabs a study's parent route draws once around whichever child page is open. */
export function StudyFrame({
  study,
  tabs,
  detail,
}: {
  study: { code: string; title: string; state: StudyState };
  tabs: StudyTab[];
  detail?: ReactNode;
}) {
  const pageTitle = usePageTitle();
  return (
    <>
      <div className="mb-4">
        <h1 className="text-2xl font-bold text-basalt-900">
          {pageTitle ? `${pageTitle} — ` : ""}
          <span className="whitespace-nowrap">{study.code}</span>
        </h1>
        <p className="mt-1 text-basalt-700">
          {study.title} · <StateBadge view={STUDY_STATE[study.state]} />
          {detail}
        </p>
      </div>
      {tabs.length > 1 && (
        <nav aria-label="Study pages" className="no-print mb-6 flex gap-1 overflow-x-auto border-b border-basalt-200 whitespace-nowrap">
          {tabs.map((tab) => (
            <NavLink
              key={tab.to}
              to={tab.to}
              end={tab.end}
              className={({ isActive }) =>
                `-mb-px rounded-t border-b-2 px-3 py-2 font-semibold ${isActive ? "border-basalt-700 text-basalt-900" : "border-transparent text-basalt-700 hover:border-basalt-200"}`
              }
            >
              {tab.label}
            </NavLink>
          ))}
        </nav>
      )}
      <Outlet />
    </>
  );
}
