/**
 * How the run sheet and the results form both head a ruggedness run, so a result
 * written on the sheet is typed under the same words: its place in the order
 * performed, then its row of the design ("3. Run 7").
 */
export function RunHeading({ run, position, className }: { run: number; position: number; className: string }) {
  return (
    <p className={className}>
      {position + 1}. Run {run}
    </p>
  );
}
