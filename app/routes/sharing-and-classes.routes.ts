import type { RouteConfigEntry } from "@react-router/dev/routes";

/** Routes of share links, classes and lessons, and admin moderation (spread into app/routes.ts). */
export const sharingAndClassesRoutes: RouteConfigEntry[] = [];
