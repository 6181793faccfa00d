import { Link } from "react-router";
import type { Route } from "./+types/index";
import { ListPage } from "~/components/list-page";
import { formatDateTime, formatFixed } from "~/lib/format";
import { listComparisons } from "~/models/comparison.server";
import { requireUser } from "~/server/guards.server";

export const meta: Route.MetaFunction = () => [{ title: "Your comparisons · Ringbatch" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  return { comparisons: await listComparisons(user.id) };
}

const one = (x: number) => formatFixed(x, 1);

export default function ComparisonHistory({ loaderData }: Route.ComponentProps) {
  const { comparisons } = loaderData;
  return (
    <ListPage
      title="Your comparisons"
      subtitle="Each comparison keeps the statement version it used; open one for its printable sheet."
      newRecord={{ to: "/compare/new", label: "New comparison" }}
      empty="No comparisons yet."
      caption="Your comparisons, newest first"
      headers={["Made", "Statement", "Response", "Mixtures", "Difference", "Critical difference", "Verdict"]}
      rows={comparisons.map((c) => [
        <Link key="made" to={`/compare/${c.id}`} className="font-semibold underline">
          {formatDateTime(c.createdAt)}
        </Link>,
        `${c.studyCode} v${c.statementVersion}`,
        c.responseName,
        `${c.trialLabel} vs ${c.referenceLabel}`,
        `${one(c.outcome.comparison.difference)} ${c.unit}`,
        `${one(c.outcome.comparison.criticalDifference)} ${c.unit}`,
        c.outcome.comparison.real ? "real difference" : "within the test's scatter",
      ])}
    />
  );
}
