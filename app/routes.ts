/**
 * Every page and API route of Fernwater, in one table. Route modules live in app/routes/<area>/;
 * api/ holds resource routes (no default export). See DEVELOPERS.md, "Add a page".
 */
import { type RouteConfig, index, prefix, route } from "@react-router/dev/routes";

export default [
  index("routes/home.tsx"),

  // Accounts
  route("sign-up", "routes/auth/sign-up.tsx"),
  route("sign-up/confirm", "routes/auth/confirm-sign-up.tsx"),
  route("sign-in", "routes/auth/sign-in.tsx"),
  route("sign-out", "routes/auth/sign-out.tsx"),
  route("forgot-password", "routes/auth/forgot-password.tsx"),
  route("reset-password", "routes/auth/reset-password.tsx"),
  route("account", "routes/auth/account.tsx"),

  // Tanks, scenarios, readings, calibration, sweeps and the target finder
  ...prefix("tanks", [
    index("routes/tanks/list.tsx"),
    route(":tankId", "routes/tanks/detail.tsx"),
    route(":tankId/compare", "routes/tanks/compare.tsx"),
    route(":tankId/import", "routes/scenarios/import.tsx"),
    route(":tankId/scenarios/new", "routes/scenarios/new.tsx"),
    route(":tankId/scenarios/:scenarioId", "routes/scenarios/results.tsx"),
    route(":tankId/scenarios/:scenarioId/edit", "routes/scenarios/edit.tsx"),
    route(":tankId/scenarios/:scenarioId/export", "routes/scenarios/export.ts"),
    route(":tankId/readings", "routes/readings/list.tsx"),
    route(":tankId/readings/upload", "routes/readings/upload.tsx"),
    route(":tankId/readings/export", "routes/readings/export.ts"),
    route(":tankId/readings/template", "routes/readings/template.ts"),
    route(":tankId/journal", "routes/journal/journal.tsx"),
    route(":tankId/plan", "routes/tanks/plan.tsx"),
    route(":tankId/journal/export", "routes/journal/export.ts"),
    route(":tankId/journal/replay.csv", "routes/journal/replay-csv.ts"),
    route(":tankId/scenarios/:scenarioId/calibrate", "routes/calibrate/calibrate.tsx"),
    route(":tankId/scenarios/:scenarioId/sweep", "routes/sweeps/sweep.tsx"),
    route(":tankId/scenarios/:scenarioId/target", "routes/sweeps/target.tsx"),
    // Share links: the owner's controls (the public page is /s/:token below).
    route(":tankId/scenarios/:scenarioId/share", "routes/share/manage.tsx"),
  ]),

  // The public page of a share link (anyone with the token).
  route("s/:token", "routes/share/public.tsx"),
  route("s/:token/preview.png", "routes/share/preview-image.tsx"),
  // A tank's maintenance calendar at its secret address (anyone with the token).
  route("calendar/:token", "routes/calendar/feed.ts"),
  // Stop a tank's reminder e-mails from the link in one (a signed token, no sign-in).
  route("reminders/unsubscribe/:token", "routes/reminders/unsubscribe.tsx"),

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

  // Admin: users and roles, public links (review, take down, restore), classes of demoted educators.
  ...prefix("admin", [
    index("routes/admin/users.tsx"),
    route("links", "routes/admin/links.tsx"),
    route("links/:linkId", "routes/admin/link.tsx"),
    route("classes", "routes/admin/classes.tsx"),
  ]),

  // Local-mode tools (answer only on this machine).
  route("dev/mail", "routes/dev/mail.tsx"),
  route("dev/chart-preview", "routes/dev/chart-preview.tsx"),

  // The JSON API (docs/api.md).
  ...prefix("api", [
    route("health", "routes/api/health.ts"),
    route("tanks", "routes/api/tanks.ts"),
    route("tanks/:tankId/scenarios", "routes/api/tank-scenarios.ts"),
    route("tanks/:tankId/readings", "routes/api/tank-readings.ts"),
    route("tanks/:tankId/journal", "routes/api/tank-journal.ts"),
    route("tanks/:tankId/journal/:entryId", "routes/api/tank-journal-entry.ts"),
    route("tanks/:tankId/plan", "routes/api/tank-plan.ts"),
    route("scenarios/:scenarioId", "routes/api/scenario.ts"),
    route("scenarios/:scenarioId/run", "routes/api/scenario-run.ts"),
    route("scenarios/:scenarioId/sweeps", "routes/api/scenario-sweeps.ts"),
    route("scenarios/:scenarioId/calibrations", "routes/api/scenario-calibrations.ts"),
    route("scenarios/:scenarioId/targets", "routes/api/scenario-targets.ts"),
    route("runs/:runId", "routes/api/run.ts"),
    route("preview", "routes/api/preview.ts"),
    route("jobs/:jobId", "routes/api/job.ts"),
    // Anything else under /api answers the API's JSON 404, not the HTML page.
    route("*", "routes/api/not-found.ts"),
  ]),

  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
