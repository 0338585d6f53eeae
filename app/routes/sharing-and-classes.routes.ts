import { type RouteConfigEntry, index, prefix, route } from "@react-router/dev/routes";

/** Routes of share links, classes and lessons, and admin moderation (spread into app/routes.ts). */
export const sharingAndClassesRoutes: RouteConfigEntry[] = [
  // Share links: the public page (anyone with the token) and the owner's controls.
  route("s/:token", "routes/share/public.tsx"),
  route("tanks/:tankId/scenarios/:scenarioId/share", "routes/share/manage.tsx"),

  // Classes, invitations, lessons, students' copies and the classroom presentation.
  ...prefix("classes", [
    index("routes/classes/list.tsx"),
    route("invite/:token", "routes/classes/invite.tsx"),
    route(":classId", "routes/classes/detail.tsx"),
    route(":classId/lessons/new", "routes/classes/lesson-new.tsx"),
    route(":classId/lessons/:lessonId", "routes/classes/lesson.tsx"),
    route(":classId/lessons/:lessonId/work", "routes/classes/lesson-work.tsx"),
    route(":classId/lessons/:lessonId/present", "routes/classes/present.tsx"),
    route(":classId/lessons/:lessonId/copies/:copyId", "routes/classes/copy.tsx"),
  ]),

  // Admin moderation of public links (users and roles: app/routes/admin/users.tsx).
  route("admin/links", "routes/admin/links.tsx"),
  // Classes whose educator was demoted are handed to another educator here.
  route("admin/classes", "routes/admin/classes.tsx"),
  route("admin/links/:linkId", "routes/admin/link.tsx"),
];
