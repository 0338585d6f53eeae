import { type RouteConfig, index, prefix, route } from "@react-router/dev/routes";
import { readingsAndSweepsRoutes } from "./routes/readings-and-sweeps.routes";
import { sharingAndClassesRoutes } from "./routes/sharing-and-classes.routes";

export default [
  index("routes/home.tsx"),

  route("sign-up", "routes/auth/sign-up.tsx"),
  route("sign-up/confirm", "routes/auth/confirm-sign-up.tsx"),
  route("sign-in", "routes/auth/sign-in.tsx"),
  route("sign-out", "routes/auth/sign-out.tsx"),
  route("forgot-password", "routes/auth/forgot-password.tsx"),
  route("reset-password", "routes/auth/reset-password.tsx"),
  route("account", "routes/auth/account.tsx"),

  ...prefix("tanks", [
    index("routes/tanks/list.tsx"),
    route(":tankId", "routes/tanks/detail.tsx"),
    route(":tankId/compare", "routes/tanks/compare.tsx"),
    route(":tankId/import", "routes/scenarios/import.tsx"),
    route(":tankId/scenarios/new", "routes/scenarios/new.tsx"),
    route(":tankId/scenarios/:scenarioId", "routes/scenarios/results.tsx"),
    route(":tankId/scenarios/:scenarioId/edit", "routes/scenarios/edit.tsx"),
    route(":tankId/scenarios/:scenarioId/export", "routes/scenarios/export.ts"),
  ]),

  ...prefix("admin", [index("routes/admin/users.tsx")]),

  route("dev/mail", "routes/dev/mail.tsx"),
  route("dev/chart-preview", "routes/dev/chart-preview.tsx"),

  ...prefix("api", [
    route("health", "routes/api/health.ts"),
    route("tanks", "routes/api/tanks.ts"),
    route("tanks/:tankId/scenarios", "routes/api/tank-scenarios.ts"),
    route("scenarios/:scenarioId", "routes/api/scenario.ts"),
    route("scenarios/:scenarioId/run", "routes/api/scenario-run.ts"),
    route("runs/:runId", "routes/api/run.ts"),
    route("preview", "routes/api/preview.ts"),
  ]),

  ...sharingAndClassesRoutes,
  ...readingsAndSweepsRoutes,

  // Anything else under /api answers the API's JSON 404, not the HTML page.
  route("api/*", "routes/api/not-found.ts"),

  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
