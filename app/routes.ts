import { type RouteConfig, index, prefix, route } from "@react-router/dev/routes";

/**
 * The route table, grouped by who uses it. A study's pages sit under a parent
 * route whose middleware checks access once and hands the study to its
 * children; the parent draws the header and the tabs.
 */
export default [
  index("routes/home.tsx"),

  // Signing in, invitations, the account
  route("login", "routes/auth/login.tsx"),
  route("logout", "routes/auth/logout.tsx"),
  route("invite/:token", "routes/auth/invite.tsx"),
  route("welcome/:token", "routes/auth/welcome.tsx"),
  route("setup/:token", "routes/auth/setup.tsx"),
  route("forgot-password", "routes/auth/forgot-password.tsx"),
  route("reset-password/:token", "routes/auth/reset-password.tsx"),
  route("account", "routes/account.tsx"),
  route("account/api", "routes/account-api.tsx"),

  // Coordinator (admins read)
  ...prefix("studies", [
    index("routes/studies/index.tsx"),
    route("new", "routes/studies/new.tsx"),
    route(":studyId", "routes/studies/study/layout.tsx", [
      index("routes/studies/study/overview.tsx"),
      route("setup", "routes/studies/study/setup.tsx"),
      route("labs", "routes/studies/study/labs.tsx"),
      route("shipments", "routes/studies/study/shipments.tsx"),
      route("shipments/:shipmentId/packing-list", "routes/studies/study/packing-list.tsx"),
      route("results", "routes/studies/study/results.tsx"),
      route("materials/:materialId", "routes/studies/study/material.tsx"),
      route("analysis", "routes/studies/study/analysis.tsx"),
      route("queries", "routes/studies/study/queries.tsx"),
      route("statement", "routes/studies/study/statement.tsx"),
      route("report", "routes/studies/study/report.tsx"),
    ]),
  ]),

  // Proficiency rounds (coordinator; admins read)
  ...prefix("rounds", [
    index("routes/rounds/index.tsx"),
    route("new", "routes/rounds/new.tsx"),
    route(":roundId", "routes/rounds/round/layout.tsx", [
      index("routes/rounds/round/overview.tsx"),
      route("assigned-values", "routes/rounds/round/assigned-values.tsx"),
      route("material-checks", "routes/rounds/round/material-checks.tsx"),
      route("scores", "routes/rounds/round/scores.tsx"),
      route("report", "routes/rounds/round/report.tsx"),
    ]),
  ]),

  // Lab analysts
  ...prefix("lab", [
    index("routes/lab/index.tsx"),
    route("queries", "routes/lab/queries.tsx"),
    route("rounds", "routes/lab/rounds/index.tsx"),
    route("rounds/:roundId", "routes/lab/rounds/round/layout.tsx", [
      index("routes/lab/rounds/round/uncertainty.tsx"),
      route("letter", "routes/lab/rounds/round/letter.tsx"),
    ]),
    route("studies/:studyId", "routes/lab/study/layout.tsx", [
      index("routes/lab/study/tasks.tsx"),
      route("protocol", "routes/lab/study/protocol.tsx"),
      route("receipt", "routes/lab/study/receipt.tsx"),
      route("batch/:materialId", "routes/lab/study/batch-sheet.tsx"),
      route("results/:materialId", "routes/lab/study/result-entry.tsx"),
      route("results/:materialId/photo", "routes/lab/study/result-photo.ts"),
      route("import", "routes/lab/study/import.tsx"),
      route("import/template.csv", "routes/lab/study/results-template.ts", { id: "lab-results-template-csv" }),
      route("import/template.xlsx", "routes/lab/study/results-template.ts", { id: "lab-results-template-xlsx" }),
    ]),
  ]),

  // Committee reviewers
  ...prefix("review", [
    index("routes/review/index.tsx"),
    route(":studyId", "routes/review/study/layout.tsx", [index("routes/review/study/ballot.tsx")]),
  ]),

  // Administration
  ...prefix("admin", [route("users", "routes/admin/users.tsx"), route("labs", "routes/admin/labs.tsx")]),

  // Local stand-in for the e-mail provider
  ...prefix("dev/mailbox", [index("routes/dev/mailbox.tsx"), route(":messageId", "routes/dev/mailbox-message.tsx")]),

  // Method toolkit: ruggedness screening before a study, mixture comparison after it, the bundle behind a published statement
  ...prefix("ruggedness", [
    index("routes/ruggedness/index.tsx"),
    route("new", "routes/ruggedness/new.tsx"),
    route(":ruggednessStudyId", "routes/ruggedness/study/layout.tsx", [
      index("routes/ruggedness/study/factors.tsx"),
      route("design", "routes/ruggedness/study/design.tsx"),
      route("results", "routes/ruggedness/study/results.tsx"),
      route("effects", "routes/ruggedness/study/effects.tsx"),
      route("conclusions", "routes/ruggedness/study/conclusions.tsx"),
    ]),
  ]),
  ...prefix("compare", [
    index("routes/compare/index.tsx"),
    route("new", "routes/compare/new.tsx"),
    route(":comparisonId", "routes/compare/sheet.tsx"),
  ]),
  route("api/v1/studies/:studyId/bundle", "routes/api/v1/study-bundle-summary.ts"),
  route("api/v1/studies/:studyId/bundle.zip", "routes/api/v1/study-bundle.ts"),

  // Resource routes: files, health, and the JSON API
  route("files/:fileId", "routes/files.ts"),
  route("healthz", "routes/healthz.ts"),
  ...prefix("api/v1", [
    route("healthz", "routes/api/v1/healthz.ts"),
    route("openapi.json", "routes/api/v1/openapi.ts"),
    route("studies", "routes/api/v1/studies.ts"),
    route("studies/:studyId", "routes/api/v1/study.ts"),
    route("studies/:studyId/results", "routes/api/v1/study-results.ts"),
    route("studies/:studyId/results.csv", "routes/api/v1/study-results-csv.ts"),
    route("studies/:studyId/results.xlsx", "routes/api/v1/study-results-xlsx.ts"),
    route("studies/:studyId/analysis.csv", "routes/api/v1/study-analysis-csv.ts"),
    route("studies/:studyId/analysis.xlsx", "routes/api/v1/study-analysis-xlsx.ts"),
    route("studies/:studyId/precision", "routes/api/v1/study-precision.ts"),
    route("studies/:studyId/progress", "routes/api/v1/study-progress.ts"),
    route("studies/:studyId/what-if", "routes/api/v1/study-what-if.ts"),
    route("enrollments/:enrollmentId/results", "routes/api/v1/enrollment-results.ts"),
    route("rounds", "routes/api/v1/rounds.ts"),
    route("rounds/:roundId", "routes/api/v1/round.ts"),
    route("rounds/:roundId/scores", "routes/api/v1/round-scores.ts"),
  ]),
] satisfies RouteConfig;
