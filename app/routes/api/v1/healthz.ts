// GET /api/v1/healthz — the same check as /healthz, for scripts that only know the API's base URL.
export { loader } from "~/routes/healthz";
