import { Link } from "react-router";
import { Card } from "~/components/ui";

/** What a ruggedness study's later pages show until its factors are laid out as a design. */
export function NoDesignYet({ studyId }: { studyId: number }) {
  return (
    <Card>
      <p>
        No design yet. <Link to={`/ruggedness/${studyId}`} className="font-semibold underline">Name the factors</Link> first.
      </p>
    </Card>
  );
}
