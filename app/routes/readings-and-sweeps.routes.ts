import type { RouteConfigEntry } from "@react-router/dev/routes";

/** Routes of readings, CSV upload, calibration, sweeps and the target finder (spread into app/routes.ts). */
export const readingsAndSweepsRoutes: RouteConfigEntry[] = [];
