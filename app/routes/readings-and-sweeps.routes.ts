import { prefix, route, type RouteConfigEntry } from "@react-router/dev/routes";

/** Routes of readings, CSV upload, calibration, sweeps and the target finder (spread into app/routes.ts). */
export const readingsAndSweepsRoutes: RouteConfigEntry[] = [
  ...prefix("tanks/:tankId", [
    route("readings", "routes/readings/list.tsx"),
    route("readings/upload", "routes/readings/upload.tsx"),
    route("readings/export", "routes/readings/export.ts"),
    route("readings/template", "routes/readings/template.ts"),
    route("scenarios/:scenarioId/calibrate", "routes/calibrate/calibrate.tsx"),
    route("scenarios/:scenarioId/sweep", "routes/sweeps/sweep.tsx"),
    route("scenarios/:scenarioId/target", "routes/sweeps/target.tsx"),
  ]),
  ...prefix("api", [
    route("jobs/:jobId", "routes/api/job.ts"),
    route("tanks/:tankId/readings", "routes/api/tank-readings.ts"),
    route("scenarios/:scenarioId/sweeps", "routes/api/scenario-sweeps.ts"),
    route("scenarios/:scenarioId/calibrations", "routes/api/scenario-calibrations.ts"),
    route("scenarios/:scenarioId/targets", "routes/api/scenario-targets.ts"),
  ]),
];
