/**
 * The API's examples, filled in for one signed-in person: the app's own
 * address, the ids of studies they may read, their lab's enrollment, and the
 * calls their role may make. The account's API page shows them.
 */

export type ExampleStudy = { id: number; code: string };

export type ApiExampleContext = {
  /** the app's address, e.g. https://ringbatch.example.org */
  origin: string;
  email: string;
  /** a study the person reads: coordinates, reviews, or their lab takes part in */
  study: ExampleStudy | null;
  /** coordinators and admins: previews and progress; analysts: progress of their own lab */
  coordinates: boolean;
  /** coordinators and admins: a submitted cell of `study`, written lab code:material code:response key, for the what-if preview */
  whatIfCell: string | null;
  reviews: boolean;
  /** a published study of theirs, for the statement's bundle */
  published: ExampleStudy | null;
  /** a proficiency round of theirs */
  round: ExampleStudy | null;
  /** their lab's enrollment in a study taking results, with one of its materials and responses */
  entry: { enrollmentId: number; studyCode: string; material: string; response: string } | null;
};

export type ApiExample = { title: string; command: string };

const AUTH = '-H "Authorization: Bearer $TOKEN"';

/** The two lines every example starts from: where the app is, and the token. */
export function exampleSetup({ origin, email }: Pick<ApiExampleContext, "origin" | "email">) {
  return [
    `B=${origin}`,
    "TOKEN=rbt_…   # your token from the account page, shown once when made",
    "# or, instead of the token, sign in once and send -b ringbatch.jar in place of the -H header:",
    `# curl -s -c ringbatch.jar -o /dev/null -d email=${email} -d "password=$RINGBATCH_PASSWORD" $B/login`,
  ].join("\n");
}

export function apiExamples(context: ApiExampleContext): ApiExample[] {
  const { study, published, round, entry } = context;
  const examples: ApiExample[] = [
    { title: "Is the app up?", command: "curl -s $B/api/v1/healthz" },
    { title: "The API described (OpenAPI 3.1)", command: "curl -s $B/api/v1/openapi.json" },
    { title: "Your studies, 100 a page (?page=2 for the next)", command: `curl -s ${AUTH} $B/api/v1/studies` },
  ];
  if (study) {
    const base = `$B/api/v1/studies/${study.id}`;
    examples.push({ title: `${study.code}: setup, responses, materials and labs`, command: `curl -s ${AUTH} ${base}` });
    if (context.coordinates || entry) examples.push({ title: `${study.code}: progress, cell status per lab and material`, command: `curl -s ${AUTH} ${base}/progress` });
    if (context.coordinates || context.reviews) {
      examples.push(
        { title: `${study.code}: results in long form, with cell decisions`, command: `curl -s ${AUTH} ${base}/results` },
        { title: `${study.code}: the results as a spreadsheet`, command: `curl -s ${AUTH} -o ${study.code}-results.xlsx ${base}/results.xlsx` },
        { title: `${study.code}: the results as CSV`, command: `curl -s ${AUTH} -o ${study.code}-results.csv ${base}/results.csv` },
        { title: `${study.code}: precision figures at the 1 % level`, command: `curl -s ${AUTH} "${base}/precision?alpha=0.01"` },
        { title: `${study.code}: the analysis tables as a spreadsheet`, command: `curl -s ${AUTH} -o ${study.code}-analysis.xlsx ${base}/analysis.xlsx` },
      );
    }
    if (context.whatIfCell) {
      examples.push({
        title: `${study.code}: what the figures would be with cell ${context.whatIfCell} left out (nothing is saved)`,
        command: `curl -s ${AUTH} "${base}/what-if?exclude=${context.whatIfCell}"`,
      });
    }
  }
  if (published && (context.coordinates || context.reviews)) {
    examples.push({ title: `${published.code}: the published statement's bundle, to recompute it`, command: `curl -s ${AUTH} -o ${published.code}-bundle.zip $B/api/v1/studies/${published.id}/bundle.zip` });
  }
  if (round) {
    examples.push(
      { title: "Your proficiency rounds", command: `curl -s ${AUTH} $B/api/v1/rounds` },
      { title: `${round.code}: scores`, command: `curl -s ${AUTH} $B/api/v1/rounds/${round.id}/scores` },
    );
  }
  if (entry) {
    const row = (replicate: number, value: number) => `{"material":"${entry.material}","response":"${entry.response}","replicate":${replicate},"value":${value}}`;
    examples.push({
      title: `${entry.studyCode}: your lab sends draft results (all rows or none; the same request twice changes nothing)`,
      command: [
        `curl -s ${AUTH} -X POST -H "Content-Type: application/json" \\`,
        `  -d '{"results":[${row(1, 10)},`,
        `                  ${row(2, 11)}]}' \\`,
        `  $B/api/v1/enrollments/${entry.enrollmentId}/results`,
      ].join("\n"),
    });
  }
  return examples;
}
