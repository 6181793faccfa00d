import type { ReactNode } from "react";
import { Link } from "react-router";
import { StateBadge } from "~/components/state-badge";
import { Card, PageHeader, SimpleTable } from "~/components/ui";
import type { StudyState } from "~/db/values";
import { STUDY_STATE } from "~/lib/state-labels";

/**
 * A page that lists one kind of record: heading, an optional link to start a new
 * one, then the table, or a sentence saying there is nothing to list yet.
 */
export function ListPage({
  title,
  subtitle,
  newRecord,
  empty,
  caption,
  headers,
  rows,
}: {
  title: string;
  subtitle: ReactNode;
  newRecord?: { to: string; label: string };
  empty: string;
  caption: string;
  headers: string[];
  rows: ReactNode[][];
}) {
  return (
    <>
      <PageHeader
        title={title}
        subtitle={subtitle}
        actions={
          newRecord && (
            <Link to={newRecord.to} className="inline-flex min-h-11 items-center rounded-md bg-basalt-700 px-4 py-2 font-semibold text-white hover:bg-basalt-800">
              {newRecord.label}
            </Link>
          )
        }
      />
      <Card>{rows.length === 0 ? <p>{empty}</p> : <SimpleTable caption={caption} headers={headers} rows={rows} />}</Card>
    </>
  );
}

/** A row's first cell: what names the record (its code), linking to its page. */
export function recordLink(to: string, text: string) {
  return (
    <Link key="record" to={to} className="keep-whole font-semibold text-basalt-700 underline">
      {text}
    </Link>
  );
}

/** A row's cell for a study's (or round's) state. */
export function stateCell(state: StudyState) {
  return <StateBadge key="state" view={STUDY_STATE[state]} />;
}
