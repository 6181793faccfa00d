import { type RouteConfig, index, route } from "@react-router/dev/routes";

export default [
  index("routes/home.tsx"),
  route("login", "routes/login.tsx"),
  route("logout", "routes/logout.tsx"),
  route("account", "routes/account.tsx"),
  route("studies", "routes/studies.tsx"),
  route("studies/new", "routes/studies.new.tsx"),
  route("studies/:studyId", "routes/studies.$studyId.tsx"),
  route("studies/:studyId/setup", "routes/studies.$studyId.setup.tsx"),
  route("lab", "routes/lab.tsx"),
  route("review", "routes/review.tsx"),
  route("admin/users", "routes/admin.users.tsx"),
  route("admin/labs", "routes/admin.labs.tsx"),
  route("files/:fileId", "routes/files.$fileId.ts"),
  route("healthz", "routes/healthz.ts"),
  route("api/v1/healthz", "routes/api.v1.healthz.ts"),
  route("api/v1/studies", "routes/api.v1.studies.ts"),
  route("api/v1/studies/:studyId", "routes/api.v1.studies.$studyId.ts"),
  route("api/v1/studies/:studyId/results", "routes/api.v1.studies.$studyId.results.ts"),
  route("api/v1/studies/:studyId/results.csv", "routes/api.v1.studies.$studyId.results-csv.ts"),
  route("api/v1/studies/:studyId/precision", "routes/api.v1.studies.$studyId.precision.ts"),
] satisfies RouteConfig;
