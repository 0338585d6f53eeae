import { type RouteConfigEntry, route } from "@react-router/dev/routes";

/** Routes of share links, classes and lessons, and admin moderation (spread into app/routes.ts). */
export const sharingAndClassesRoutes: RouteConfigEntry[] = [
  // Share links: the public page (anyone with the token) and the owner's controls.
  route("s/:token", "routes/share/public.tsx"),
  route("tanks/:tankId/scenarios/:scenarioId/share", "routes/share/manage.tsx"),

  // Admin moderation of public links (users and roles: app/routes/admin/users.tsx).
  route("admin/links", "routes/admin/links.tsx"),
  route("admin/links/:linkId", "routes/admin/link.tsx"),
];
