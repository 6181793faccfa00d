import { NavLink } from "react-router";

/** Links between the coordinator's pages of one study. */
export function StudyNav({ studyId }: { studyId: number }) {
  const links = [
    { to: `/studies/${studyId}`, label: "Overview", end: true },
    { to: `/studies/${studyId}/setup`, label: "Setup", end: false },
    { to: `/studies/${studyId}/labs`, label: "Labs", end: false },
    { to: `/studies/${studyId}/shipments`, label: "Shipments", end: false },
    { to: `/studies/${studyId}/results`, label: "Results", end: false },
    { to: `/studies/${studyId}/analysis`, label: "Analysis", end: false },
    { to: `/studies/${studyId}/queries`, label: "Queries", end: false },
    { to: `/studies/${studyId}/statement`, label: "Statement", end: false },
    { to: `/studies/${studyId}/report`, label: "Report", end: false },
  ];
  return (
    <nav aria-label="Study pages" className="mb-6 flex flex-wrap gap-1 border-b border-basalt-200">
      {links.map((l) => (
        <NavLink
          key={l.to}
          to={l.to}
          end={l.end}
          className={({ isActive }) =>
            `-mb-px rounded-t border-b-2 px-3 py-2 font-semibold ${isActive ? "border-basalt-700 text-basalt-900" : "border-transparent text-basalt-700 hover:border-basalt-200"}`
          }
        >
          {l.label}
        </NavLink>
      ))}
    </nav>
  );
}
