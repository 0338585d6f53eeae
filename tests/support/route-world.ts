/**
 * The permission matrix: ONE table of every page, action and API route of Fernwater and what
 * each kind of visitor gets. The tests build a small world — an owner (a keeper who is also a
 * student in a class), another keeper, the educator of the owner's class, an admin — and walks
 * every row for every visitor with real Request objects and session cookies.
 *
 * Answers: 200, a redirect elsewhere (302), "sign-in" (302 to /sign-in?redirectTo=…), 400
 * (allowed, but the harmless body the row sends is refused by validation — actions are walked
 * with bodies that change nothing the other rows need), 401 (API without a session), 403 (the
 * role is not enough), 404 (someone else's private thing, so its existence does not leak),
 * 405, 409.
 *
 * Adding a row: one line below, naming the route file as in app/routes.ts, the handler, a path
 * whose :params are filled from the world, and the five answers. The last test fails for any
 * route file whose loader or action has no row, so a new route cannot be forgotten; a row whose
 * file is not (yet) in app/routes.ts is skipped, so rows can be written before their route lands.
 */
import { eq } from "drizzle-orm";
import { expect } from "vitest";
import routeConfig from "~/routes";
import { createClass, insertLesson } from "~/features/classes/classes.server";
import { getDb } from "~/db/client.server";
import { classInvites, classMembers, lessonCopies, runs, scenarios, shareLinks, users } from "~/db/schema";
import { makeLink } from "~/features/sharing/share.server";
import { addEntries } from "~/features/journal/journal.server";
import { readStoredSettings } from "~/features/runs/simulation.server";
import { hashToken } from "~/utils/crypto.server";
import { call, get, ORIGIN } from "./routes";
import { createScenario, createTank } from "./tanks";
import { createUser, signIn } from "./users";

export type Answer = 200 | 302 | 400 | 401 | 403 | 404 | 405 | 409 | "sign-in";
/**
 * In this order: anonymous, the owner, another keeper, an educator of the owner's class, an admin,
 * and a demoted educator (ran a class the owner belongs to, then became a keeper again).
 */
export type Answers = [
  anonymous: Answer,
  owner: Answer,
  otherKeeper: Answer,
  educator: Answer,
  admin: Answer,
  demotedEducator: Answer,
];
export const VISITORS = [
  "anonymous",
  "owner",
  "other keeper",
  "educator of the owner's class",
  "admin",
  "demoted educator",
] as const;

export type Row = {
  /** Route module, as named in app/routes.ts. */
  file: string;
  handler: "loader" | "action";
  /** Path with :params filled from the world (e.g. :tankId is the owner's tank). */
  path: string;
  method?: "POST" | "PUT" | "PATCH" | "DELETE";
  form?: Record<string, string>;
  json?: unknown;
  /** Sign in afresh for this row (an action that ends the session it is called with). */
  freshSession?: boolean;
  /** The client's address (default: another machine, 198.51.100.9). */
  ip?: string;
  /** The Host header the browser sent (default: none, the test origin's). */
  host?: string;
  expect: Answers;
};

const PAGE_PRIVATE: Answers = ["sign-in", 200, 404, 404, 404, 404];
const ACTION_PRIVATE: Answers = ["sign-in", 400, 404, 404, 404, 404];
const API_PRIVATE: Answers = [401, 200, 404, 404, 404, 404];
const API_PRIVATE_ACTION: Answers = [401, 400, 404, 404, 404, 404];
const EVERYONE: Answers = [200, 200, 200, 200, 200, 200];
const SIGNED_IN: Answers = ["sign-in", 200, 200, 200, 200, 200];
const ADMIN_PAGE: Answers = ["sign-in", 403, 403, 403, 200, 403];
const ADMIN_ACTION: Answers = ["sign-in", 403, 403, 403, 400, 403];
const WRONG_METHOD: Answers = [405, 405, 405, 405, 405, 405];
const SIGNED_OUT_ONLY: Answers = [200, 302, 302, 302, 302, 302];

const NOTHING = { intent: "nothing-at-all" };
const TANK = "/tanks/:tankId";
const SCENARIO = "/tanks/:tankId/scenarios/:scenarioId";
const LESSON = "/classes/:classId/lessons/:lessonId";
const FORMER = "/classes/:formerClassId";
const FORMER_LESSON = "/classes/:formerClassId/lessons/:formerLessonId";

export const PERMISSION_MATRIX: Row[] = [
  // Public pages and accounts
  { file: "routes/home.tsx", handler: "loader", path: "/", expect: EVERYONE },
  { file: "routes/auth/sign-up.tsx", handler: "loader", path: "/sign-up", expect: SIGNED_OUT_ONLY },
  {
    file: "routes/auth/sign-up.tsx",
    handler: "action",
    path: "/sign-up",
    form: {},
    expect: [400, 400, 400, 400, 400, 400],
  },
  {
    file: "routes/auth/confirm-sign-up.tsx",
    handler: "loader",
    path: "/sign-up/confirm?token=nope-not-a-live-token",
    expect: EVERYONE,
  },
  {
    file: "routes/auth/confirm-sign-up.tsx",
    handler: "action",
    path: "/sign-up/confirm",
    form: { token: "nope-not-a-live-token" },
    expect: [400, 400, 400, 400, 400, 400],
  },
  { file: "routes/auth/sign-in.tsx", handler: "loader", path: "/sign-in", expect: SIGNED_OUT_ONLY },
  {
    file: "routes/auth/sign-in.tsx",
    handler: "action",
    path: "/sign-in",
    form: { email: "", password: "" },
    expect: [400, 400, 400, 400, 400, 400],
  },
  { file: "routes/auth/sign-out.tsx", handler: "loader", path: "/sign-out", expect: [302, 302, 302, 302, 302, 302] },
  {
    file: "routes/auth/sign-out.tsx",
    handler: "action",
    path: "/sign-out",
    form: {},
    freshSession: true,
    expect: [302, 302, 302, 302, 302, 302],
  },
  {
    file: "routes/auth/forgot-password.tsx",
    handler: "action",
    path: "/forgot-password",
    form: { email: "" },
    expect: [400, 400, 400, 400, 400, 400],
  },
  { file: "routes/auth/reset-password.tsx", handler: "loader", path: "/reset-password?token=nope", expect: EVERYONE },
  {
    file: "routes/auth/reset-password.tsx",
    handler: "action",
    path: "/reset-password",
    form: {},
    expect: [400, 400, 400, 400, 400, 400],
  },
  { file: "routes/auth/account.tsx", handler: "loader", path: "/account", expect: SIGNED_IN },
  {
    file: "routes/auth/account.tsx",
    handler: "action",
    path: "/account",
    form: NOTHING,
    expect: ["sign-in", 400, 400, 400, 400, 400],
  },
  {
    // Reminders on the owner's tank: only the owner may set them; anyone else is told "no such tank".
    file: "routes/auth/account.tsx",
    handler: "action",
    path: "/account",
    form: { intent: "reminders", tankId: ":tankId", mode: "weekly", hour: "8" },
    expect: ["sign-in", 302, 400, 400, 400, 400],
  },
  {
    file: "routes/reminders/unsubscribe.tsx",
    handler: "loader",
    path: "/reminders/unsubscribe/1.not-a-signed-token",
    expect: [404, 404, 404, 404, 404, 404],
  },
  {
    file: "routes/reminders/unsubscribe.tsx",
    handler: "action",
    path: "/reminders/unsubscribe/1.not-a-signed-token",
    form: {},
    expect: [404, 404, 404, 404, 404, 404],
  },

  // Tanks and scenarios: private to their owner
  { file: "routes/tanks/list.tsx", handler: "loader", path: "/tanks", expect: SIGNED_IN },
  {
    file: "routes/tanks/list.tsx",
    handler: "action",
    path: "/tanks",
    form: { name: "" },
    expect: ["sign-in", 400, 400, 400, 400, 400],
  },
  { file: "routes/tanks/detail.tsx", handler: "loader", path: TANK, expect: PAGE_PRIVATE },
  { file: "routes/tanks/detail.tsx", handler: "action", path: TANK, form: NOTHING, expect: ACTION_PRIVATE },
  { file: "routes/tanks/compare.tsx", handler: "loader", path: `${TANK}/compare`, expect: PAGE_PRIVATE },
  { file: "routes/scenarios/import.tsx", handler: "loader", path: `${TANK}/import`, expect: PAGE_PRIVATE },
  { file: "routes/scenarios/import.tsx", handler: "action", path: `${TANK}/import`, form: {}, expect: ACTION_PRIVATE },
  { file: "routes/scenarios/new.tsx", handler: "loader", path: `${TANK}/scenarios/new`, expect: PAGE_PRIVATE },
  {
    file: "routes/scenarios/new.tsx",
    handler: "action",
    path: `${TANK}/scenarios/new`,
    form: NOTHING,
    expect: ACTION_PRIVATE,
  },
  { file: "routes/scenarios/results.tsx", handler: "loader", path: SCENARIO, expect: PAGE_PRIVATE },
  { file: "routes/scenarios/results.tsx", handler: "action", path: SCENARIO, form: NOTHING, expect: ACTION_PRIVATE },
  { file: "routes/scenarios/edit.tsx", handler: "loader", path: `${SCENARIO}/edit`, expect: PAGE_PRIVATE },
  {
    file: "routes/scenarios/edit.tsx",
    handler: "action",
    path: `${SCENARIO}/edit`,
    form: NOTHING,
    expect: ACTION_PRIVATE,
  },
  { file: "routes/scenarios/export.ts", handler: "loader", path: `${SCENARIO}/export`, expect: PAGE_PRIVATE },
  // The owner's lesson copy is their own scenario: their educator reads it through the class, not here.
  {
    file: "routes/scenarios/results.tsx",
    handler: "loader",
    path: "/tanks/:copyTankId/scenarios/:copyScenarioId",
    expect: PAGE_PRIVATE,
  },
  {
    file: "routes/scenarios/edit.tsx",
    handler: "loader",
    path: "/tanks/:copyTankId/scenarios/:copyScenarioId/edit",
    expect: ["sign-in", 302, 404, 404, 404, 404],
  },

  // Readings, calibration, sweeps and the target finder: private to the tank's owner
  { file: "routes/readings/list.tsx", handler: "loader", path: `${TANK}/readings`, expect: PAGE_PRIVATE },
  {
    file: "routes/readings/list.tsx",
    handler: "action",
    path: `${TANK}/readings`,
    form: NOTHING,
    expect: ACTION_PRIVATE,
  },
  { file: "routes/readings/upload.tsx", handler: "loader", path: `${TANK}/readings/upload`, expect: PAGE_PRIVATE },
  {
    file: "routes/readings/upload.tsx",
    handler: "action",
    path: `${TANK}/readings/upload`,
    form: {},
    expect: ACTION_PRIVATE,
  },
  { file: "routes/readings/export.ts", handler: "loader", path: `${TANK}/readings/export`, expect: PAGE_PRIVATE },
  { file: "routes/readings/template.ts", handler: "loader", path: `${TANK}/readings/template`, expect: PAGE_PRIVATE },
  { file: "routes/journal/journal.tsx", handler: "loader", path: `${TANK}/journal`, expect: PAGE_PRIVATE },
  {
    file: "routes/journal/journal.tsx",
    handler: "action",
    path: `${TANK}/journal`,
    form: NOTHING,
    expect: ACTION_PRIVATE,
  },
  {
    file: "routes/journal/journal.tsx",
    handler: "action",
    path: `${TANK}/journal`,
    form: { intent: "add", kind: "water_change" },
    expect: ACTION_PRIVATE,
  },
  {
    file: "routes/journal/journal.tsx",
    handler: "action",
    path: `${TANK}/journal`,
    form: { intent: "calendar-on", scenarioId: "0" },
    expect: ACTION_PRIVATE,
  },
  {
    file: "routes/calendar/feed.ts",
    handler: "loader",
    path: "/calendar/not-a-live-calendar-token.ics",
    expect: [404, 404, 404, 404, 404, 404],
  },
  { file: "routes/journal/export.ts", handler: "loader", path: `${TANK}/journal/export`, expect: PAGE_PRIVATE },
  { file: "routes/journal/replay-csv.ts", handler: "loader", path: `${TANK}/journal/replay.csv`, expect: PAGE_PRIVATE },
  { file: "routes/tanks/plan.tsx", handler: "loader", path: `${TANK}/plan`, expect: PAGE_PRIVATE },
  { file: "routes/tanks/plan.tsx", handler: "action", path: `${TANK}/plan`, form: NOTHING, expect: ACTION_PRIVATE },
  {
    file: "routes/tanks/plan.tsx",
    handler: "action",
    path: `${TANK}/plan`,
    form: { intent: "save", water_change_percent: "120" },
    expect: ACTION_PRIVATE,
  },
  {
    file: "routes/tanks/plan.tsx",
    handler: "action",
    path: `${TANK}/plan`,
    form: { intent: "done", kind: "water_change", date: "not a date" },
    expect: ACTION_PRIVATE,
  },
  { file: "routes/calibrate/calibrate.tsx", handler: "loader", path: `${SCENARIO}/calibrate`, expect: PAGE_PRIVATE },
  {
    file: "routes/calibrate/calibrate.tsx",
    handler: "action",
    path: `${SCENARIO}/calibrate`,
    form: NOTHING,
    expect: ACTION_PRIVATE,
  },
  { file: "routes/sweeps/sweep.tsx", handler: "loader", path: `${SCENARIO}/sweep`, expect: PAGE_PRIVATE },
  {
    file: "routes/sweeps/sweep.tsx",
    handler: "action",
    path: `${SCENARIO}/sweep`,
    form: NOTHING,
    expect: ACTION_PRIVATE,
  },
  { file: "routes/sweeps/target.tsx", handler: "loader", path: `${SCENARIO}/target`, expect: PAGE_PRIVATE },
  {
    file: "routes/sweeps/target.tsx",
    handler: "action",
    path: `${SCENARIO}/target`,
    form: NOTHING,
    expect: ACTION_PRIVATE,
  },

  // Share links
  { file: "routes/share/manage.tsx", handler: "loader", path: `${SCENARIO}/share`, expect: PAGE_PRIVATE },
  {
    file: "routes/share/manage.tsx",
    handler: "action",
    path: `${SCENARIO}/share`,
    form: NOTHING,
    expect: ACTION_PRIVATE,
  },
  { file: "routes/share/public.tsx", handler: "loader", path: "/s/:token", expect: EVERYONE },
  {
    file: "routes/share/public.tsx",
    handler: "loader",
    path: "/s/:revokedToken",
    expect: [404, 404, 404, 404, 404, 404],
  },
  // The link-preview picture follows its page: anyone while the link is live, nobody after.
  { file: "routes/share/preview-image.tsx", handler: "loader", path: "/s/:token/preview.png", expect: EVERYONE },
  {
    file: "routes/share/preview-image.tsx",
    handler: "loader",
    path: "/s/:revokedToken/preview.png",
    expect: [404, 404, 404, 404, 404, 404],
  },
  {
    file: "routes/share/public.tsx",
    handler: "action",
    path: "/s/:token",
    form: { intent: "copy", tankId: "none" },
    expect: ["sign-in", 400, 400, 400, 400, 400],
  },

  // Classes and lessons: the class's educator and its members
  { file: "routes/classes/list.tsx", handler: "loader", path: "/classes", expect: SIGNED_IN },
  {
    file: "routes/classes/list.tsx",
    handler: "action",
    path: "/classes",
    form: { intent: "create", name: "" },
    expect: ["sign-in", 403, 403, 400, 400, 403],
  },
  {
    file: "routes/classes/list.tsx",
    handler: "action",
    path: "/classes",
    form: { intent: "join", code: "" },
    expect: ["sign-in", 400, 400, 400, 400, 400],
  },
  { file: "routes/classes/invite.tsx", handler: "loader", path: "/classes/invite/:inviteToken", expect: EVERYONE },
  {
    file: "routes/classes/invite.tsx",
    handler: "action",
    path: "/classes/invite/:inviteToken",
    form: {},
    expect: ["sign-in", 400, 400, 400, 400, 400],
  },
  {
    file: "routes/classes/detail.tsx",
    handler: "loader",
    path: "/classes/:classId",
    expect: ["sign-in", 200, 404, 200, 404, 404],
  },
  {
    file: "routes/classes/detail.tsx",
    handler: "action",
    path: "/classes/:classId",
    form: NOTHING,
    expect: ["sign-in", 404, 404, 400, 404, 404],
  },
  {
    file: "routes/classes/lesson-new.tsx",
    handler: "loader",
    path: "/classes/:classId/lessons/new",
    expect: ["sign-in", 403, 403, 200, 404, 403],
  },
  {
    file: "routes/classes/lesson-new.tsx",
    handler: "action",
    path: "/classes/:classId/lessons/new",
    form: {},
    expect: ["sign-in", 403, 403, 400, 404, 403],
  },
  { file: "routes/classes/lesson.tsx", handler: "loader", path: LESSON, expect: ["sign-in", 200, 404, 200, 404, 404] },
  {
    file: "routes/classes/lesson.tsx",
    handler: "action",
    path: LESSON,
    form: NOTHING,
    expect: ["sign-in", 400, 404, 400, 404, 404],
  },
  {
    file: "routes/classes/lesson-work.tsx",
    handler: "loader",
    path: `${LESSON}/work`,
    expect: ["sign-in", 200, 404, 404, 404, 404],
  },
  {
    file: "routes/classes/lesson-work.tsx",
    handler: "action",
    path: `${LESSON}/work`,
    form: { intent: "hand-in", answer: "" },
    expect: ["sign-in", 400, 404, 404, 404, 404],
  },
  {
    file: "routes/classes/present.tsx",
    handler: "loader",
    path: `${LESSON}/present`,
    expect: ["sign-in", 404, 404, 200, 404, 404],
  },
  {
    file: "routes/classes/copy.tsx",
    handler: "loader",
    path: `${LESSON}/copies/:copyId`,
    expect: ["sign-in", 404, 404, 200, 404, 404],
  },

  // A class whose educator was demoted to keeper (the owner is one of its students): read-only for
  // its former educator (403 for anything an educator does), unchanged for its students.
  { file: "routes/classes/detail.tsx", handler: "loader", path: FORMER, expect: ["sign-in", 200, 404, 404, 404, 200] },
  {
    file: "routes/classes/detail.tsx",
    handler: "action",
    path: FORMER,
    form: { intent: "invite", email: "someone@example.org" },
    expect: ["sign-in", 404, 404, 404, 404, 403],
  },
  {
    file: "routes/classes/detail.tsx",
    handler: "action",
    path: FORMER,
    form: { intent: "remove", studentId: ":ownerId", confirm: "yes" },
    expect: ["sign-in", 404, 404, 404, 404, 403],
  },
  {
    file: "routes/classes/lesson-new.tsx",
    handler: "loader",
    path: `${FORMER}/lessons/new`,
    expect: ["sign-in", 403, 403, 404, 404, 403],
  },
  {
    file: "routes/classes/lesson-new.tsx",
    handler: "action",
    path: `${FORMER}/lessons/new`,
    form: {},
    expect: ["sign-in", 403, 403, 404, 404, 403],
  },
  {
    file: "routes/classes/lesson.tsx",
    handler: "loader",
    path: FORMER_LESSON,
    expect: ["sign-in", 200, 404, 404, 404, 200],
  },
  {
    file: "routes/classes/lesson.tsx",
    handler: "action",
    path: FORMER_LESSON,
    form: NOTHING,
    expect: ["sign-in", 400, 404, 404, 404, 403],
  },
  {
    file: "routes/classes/lesson-work.tsx",
    handler: "loader",
    path: `${FORMER_LESSON}/work`,
    expect: ["sign-in", 302, 404, 404, 404, 404],
  },
  {
    file: "routes/classes/present.tsx",
    handler: "loader",
    path: `${FORMER_LESSON}/present`,
    expect: ["sign-in", 404, 404, 404, 404, 403],
  },
  {
    file: "routes/classes/copy.tsx",
    handler: "loader",
    path: `${FORMER_LESSON}/copies/:copyId`,
    expect: ["sign-in", 404, 404, 404, 404, 403],
  },

  // Admin
  { file: "routes/admin/users.tsx", handler: "loader", path: "/admin", expect: ADMIN_PAGE },
  { file: "routes/admin/users.tsx", handler: "action", path: "/admin", form: NOTHING, expect: ADMIN_ACTION },
  { file: "routes/admin/links.tsx", handler: "loader", path: "/admin/links", expect: ADMIN_PAGE },
  { file: "routes/admin/links.tsx", handler: "action", path: "/admin/links", form: NOTHING, expect: ADMIN_ACTION },
  { file: "routes/admin/link.tsx", handler: "loader", path: "/admin/links/:linkId", expect: ADMIN_PAGE },
  { file: "routes/admin/classes.tsx", handler: "loader", path: "/admin/classes", expect: ADMIN_PAGE },
  { file: "routes/admin/classes.tsx", handler: "action", path: "/admin/classes", form: NOTHING, expect: ADMIN_ACTION },

  // Local-mode tools: this machine only (tests run in local mode; in production both answer 404 to everyone)
  // (asked for by a loopback name: another site's name rebound to 127.0.0.1 gets 404).
  {
    file: "routes/dev/mail.tsx",
    handler: "loader",
    path: "/dev/mail",
    ip: "127.0.0.1",
    host: "localhost:5173",
    expect: EVERYONE,
  },
  { file: "routes/dev/mail.tsx", handler: "loader", path: "/dev/mail", expect: [404, 404, 404, 404, 404, 404] },
  {
    file: "routes/dev/mail.tsx",
    handler: "loader",
    path: "/dev/mail",
    ip: "127.0.0.1",
    host: "rebind.example:5173",
    expect: [404, 404, 404, 404, 404, 404],
  },
  {
    file: "routes/dev/chart-preview.tsx",
    handler: "loader",
    path: "/dev/chart-preview",
    ip: "127.0.0.1",
    host: "127.0.0.1:5173",
    expect: EVERYONE,
  },
  {
    file: "routes/dev/chart-preview.tsx",
    handler: "loader",
    path: "/dev/chart-preview",
    expect: [404, 404, 404, 404, 404, 404],
  },

  // JSON API: the session cookie, 401 without one, 404 for someone else's things
  { file: "routes/api/health.ts", handler: "loader", path: "/api/health", expect: EVERYONE },
  { file: "routes/api/tanks.ts", handler: "loader", path: "/api/tanks", expect: [401, 200, 200, 200, 200, 200] },
  {
    file: "routes/api/tank-scenarios.ts",
    handler: "loader",
    path: "/api/tanks/:tankId/scenarios",
    expect: API_PRIVATE,
  },
  {
    file: "routes/api/tank-scenarios.ts",
    handler: "action",
    path: "/api/tanks/:tankId/scenarios",
    json: {},
    expect: API_PRIVATE_ACTION,
  },
  { file: "routes/api/scenario.ts", handler: "loader", path: "/api/scenarios/:scenarioId", expect: API_PRIVATE },
  {
    file: "routes/api/scenario.ts",
    handler: "action",
    path: "/api/scenarios/:scenarioId",
    method: "PATCH",
    json: { nope: 1 },
    expect: API_PRIVATE_ACTION,
  },
  {
    file: "routes/api/scenario-run.ts",
    handler: "loader",
    path: "/api/scenarios/:scenarioId/run",
    expect: API_PRIVATE,
  },
  {
    file: "routes/api/scenario-run.ts",
    handler: "action",
    path: "/api/scenarios/:scenarioId/run",
    json: {},
    expect: [401, 200, 404, 404, 404, 404],
  },
  // The method is checked before the session: a wrong method tells nobody anything.
  {
    file: "routes/api/scenario-run.ts",
    handler: "action",
    path: "/api/scenarios/:scenarioId/run",
    method: "PUT",
    json: {},
    expect: [405, 405, 405, 405, 405, 405],
  },
  { file: "routes/api/run.ts", handler: "loader", path: "/api/runs/:runId", expect: API_PRIVATE },
  {
    file: "routes/api/preview.ts",
    handler: "action",
    path: "/api/preview",
    json: { nope: 1 },
    expect: [401, 400, 400, 400, 400, 400],
  },
  {
    file: "routes/api/preview.ts",
    handler: "action",
    path: "/api/preview",
    json: { scenarioId: 0, whatIf: {} },
    expect: [401, 400, 400, 400, 400, 400],
  },

  { file: "routes/api/tank-readings.ts", handler: "loader", path: "/api/tanks/:tankId/readings", expect: API_PRIVATE },
  { file: "routes/api/tank-journal.ts", handler: "loader", path: "/api/tanks/:tankId/journal", expect: API_PRIVATE },
  {
    file: "routes/api/tank-journal.ts",
    handler: "action",
    path: "/api/tanks/:tankId/journal",
    json: {},
    expect: API_PRIVATE_ACTION,
  },
  {
    file: "routes/api/tank-journal-entry.ts",
    handler: "action",
    path: "/api/tanks/:tankId/journal/:entryId",
    method: "PATCH",
    json: { kind: "not-a-kind" },
    expect: API_PRIVATE_ACTION,
  },
  {
    file: "routes/api/tank-journal-entry.ts",
    handler: "loader",
    path: "/api/tanks/:tankId/journal/:entryId",
    expect: WRONG_METHOD,
  },
  { file: "routes/api/tank-plan.ts", handler: "loader", path: "/api/tanks/:tankId/plan", expect: API_PRIVATE },
  {
    file: "routes/api/tank-plan.ts",
    handler: "action",
    path: "/api/tanks/:tankId/plan",
    method: "PUT",
    json: { water_change_percent: 120 },
    expect: API_PRIVATE_ACTION,
  },
  // The world's tank has no edited plan, so going back to the scenario's timetable changes nothing.
  {
    file: "routes/api/tank-plan.ts",
    handler: "action",
    path: "/api/tanks/:tankId/plan",
    method: "DELETE",
    json: {},
    expect: API_PRIVATE,
  },
  {
    file: "routes/api/tank-plan.ts",
    handler: "action",
    path: "/api/tanks/:tankId/plan",
    json: {},
    expect: WRONG_METHOD,
  },
  {
    file: "routes/api/scenario-sweeps.ts",
    handler: "loader",
    path: "/api/scenarios/:scenarioId/sweeps",
    expect: API_PRIVATE,
  },
  {
    file: "routes/api/scenario-sweeps.ts",
    handler: "action",
    path: "/api/scenarios/:scenarioId/sweeps",
    json: {},
    expect: API_PRIVATE_ACTION,
  },
  {
    file: "routes/api/scenario-calibrations.ts",
    handler: "action",
    path: "/api/scenarios/:scenarioId/calibrations",
    json: {},
    expect: API_PRIVATE_ACTION,
  },
  {
    file: "routes/api/scenario-targets.ts",
    handler: "action",
    path: "/api/scenarios/:scenarioId/targets",
    json: {},
    expect: API_PRIVATE_ACTION,
  },
  // A job id nobody holds: each person sees only their own jobs (tests/integration/jobs.test.ts walks a real one).
  {
    file: "routes/api/job.ts",
    handler: "loader",
    path: "/api/jobs/no-such-job",
    expect: [401, 404, 404, 404, 404, 404],
  },
  {
    file: "routes/api/job.ts",
    handler: "action",
    path: "/api/jobs/no-such-job",
    method: "DELETE",
    json: {},
    expect: [401, 404, 404, 404, 404, 404],
  },
  {
    file: "routes/api/job.ts",
    handler: "action",
    path: "/api/jobs/no-such-job",
    json: {},
    expect: [405, 405, 405, 405, 405, 405],
  },

  // A method a route does not take: the API's JSON 405, before anything else is looked at.
  { file: "routes/api/health.ts", handler: "action", path: "/api/health", json: {}, expect: WRONG_METHOD },
  { file: "routes/api/tanks.ts", handler: "action", path: "/api/tanks", json: {}, expect: WRONG_METHOD },
  {
    file: "routes/api/run.ts",
    handler: "action",
    path: "/api/runs/:runId",
    method: "PUT",
    json: {},
    expect: WRONG_METHOD,
  },
  { file: "routes/api/preview.ts", handler: "loader", path: "/api/preview", expect: WRONG_METHOD },
  {
    file: "routes/api/tank-readings.ts",
    handler: "action",
    path: "/api/tanks/:tankId/readings",
    json: {},
    expect: WRONG_METHOD,
  },
  {
    file: "routes/api/scenario-calibrations.ts",
    handler: "loader",
    path: "/api/scenarios/:scenarioId/calibrations",
    expect: WRONG_METHOD,
  },
  {
    file: "routes/api/scenario-targets.ts",
    handler: "loader",
    path: "/api/scenarios/:scenarioId/targets",
    expect: WRONG_METHOD,
  },
  {
    file: "routes/api/not-found.ts",
    handler: "loader",
    path: "/api/no/such/route",
    expect: [404, 404, 404, 404, 404, 404],
  },
  {
    file: "routes/api/not-found.ts",
    handler: "action",
    path: "/api/no/such/route",
    method: "DELETE",
    json: {},
    expect: [404, 404, 404, 404, 404, 404],
  },

  // Anything else
  { file: "routes/not-found.tsx", handler: "loader", path: "/no/such/page", expect: [404, 404, 404, 404, 404, 404] },
  {
    file: "routes/not-found.tsx",
    handler: "action",
    path: "/no/such/page",
    form: {},
    expect: [404, 404, 404, 404, 404, 404],
  },
];

// ---------------------------------------------------------------------------------------------

type Entry = { file: string; children?: Entry[] };
/** Every route module named in app/routes.ts (with the route lists it spreads). */
export const ROUTE_FILES = new Set<string>();
const walk = (entries: Entry[]) => entries.forEach((e) => (ROUTE_FILES.add(e.file), e.children && walk(e.children)));
walk(routeConfig as unknown as Entry[]);

export type Person = { id: number; email: string; cookie: string };
export const people: Partial<Record<(typeof VISITORS)[number], Person>> = {};
export const world: Record<string, string> = {};

/** Builds the small world every row is walked in (call once, in a beforeAll). */
export async function buildWorld(): Promise<void> {
  for (const [who, role] of [
    ["owner", "keeper"],
    ["other keeper", "keeper"],
    ["educator of the owner's class", "educator"],
    ["admin", "admin"],
    ["demoted educator", "educator"],
  ] as const) {
    const user = await createUser(role, who);
    people[who] = { ...user, cookie: await signIn(user.email, undefined, "198.51.100.1") };
  }
  const owner = people.owner!;
  const educator = people["educator of the owner's class"]!;

  const tankId = createTank(owner.id, "Owner's tank");
  const scenarioId = await createScenario(owner.id, tankId, { run: { lengthDays: 20 } }, "Owner's scenario");
  world.tankId = String(tankId);
  world.entryId = String(
    addEntries(tankId, [{ doneAt: Date.now() - 86_400_000, kind: "note", details: {}, note: "matrix" }])[0],
  );
  world.scenarioId = String(scenarioId);
  world.runId = String(getDb().select({ id: runs.id }).from(runs).where(eq(runs.scenarioId, scenarioId)).get()!.id);
  world.revokedToken = makeLink(scenarioId)!;
  world.token = makeLink(scenarioId)!; // the first one is now dead
  world.linkId = String(
    getDb()
      .select()
      .from(shareLinks)
      .where(eq(shareLinks.tokenHash, hashToken(world.token)))
      .get()!.id,
  );

  const classId = createClass(educator.id, "Matrix class");
  getDb().insert(classMembers).values({ classId, userId: owner.id }).run();
  const lessonTank = createTank(educator.id, "Lesson tank");
  const lessonScenario = await createScenario(educator.id, lessonTank, { run: { lengthDays: 20 } }, "Lesson scenario");
  const settings = readStoredSettings(
    getDb().select().from(scenarios).where(eq(scenarios.id, lessonScenario)).get()!.settings,
  )!;
  const lessonId = insertLesson({
    classId,
    scenarioId: lessonScenario,
    title: "Lesson",
    question: "Why?",
    unlockedFields: [],
    settings,
  });
  world.classId = String(classId);
  world.lessonId = String(lessonId);
  // The owner starts the lesson through the real action.
  const { action: startLesson } = await import("~/routes/classes/lesson");
  const started = await call(
    startLesson,
    new Request(`${ORIGIN}/classes/${classId}/lessons/${lessonId}`, {
      method: "POST",
      body: new URLSearchParams({ intent: "start" }),
      headers: { "Content-Type": "application/x-www-form-urlencoded", Cookie: owner.cookie },
    }),
    { classId: world.classId, lessonId: world.lessonId },
  );
  expect(started.status).toBe(302);
  const copy = getDb().select().from(lessonCopies).where(eq(lessonCopies.lessonId, lessonId)).get()!;
  const copyScenario = getDb().select().from(scenarios).where(eq(scenarios.id, copy.scenarioId)).get()!;
  world.copyId = String(copy.id);
  world.copyScenarioId = String(copyScenario.id);
  world.copyTankId = String(copyScenario.tankId);

  // The demoted educator's class, with the owner in it and a lesson; then the demotion.
  const demoted = people["demoted educator"]!;
  const formerClassId = createClass(demoted.id, "Former class");
  getDb().insert(classMembers).values({ classId: formerClassId, userId: owner.id }).run();
  const formerTank = createTank(demoted.id, "Former lesson tank");
  const formerScenario = await createScenario(
    demoted.id,
    formerTank,
    { run: { lengthDays: 20 } },
    "Former lesson scenario",
  );
  const formerSettings = readStoredSettings(
    getDb().select().from(scenarios).where(eq(scenarios.id, formerScenario)).get()!.settings,
  )!;
  world.formerClassId = String(formerClassId);
  world.formerLessonId = String(
    insertLesson({
      classId: formerClassId,
      scenarioId: formerScenario,
      title: "Former lesson",
      question: "Why?",
      unlockedFields: [],
      settings: formerSettings,
    }),
  );
  world.ownerId = String(owner.id);
  getDb().update(users).set({ role: "keeper" }).where(eq(users.id, demoted.id)).run();

  // An open invitation to an address nobody here holds: every signed-in visitor is refused, none uses it up.
  world.inviteToken = "matrix-invite-token-for-nobody";
  getDb()
    .insert(classInvites)
    .values({
      classId,
      email: "nobody@example.org",
      tokenHash: hashToken(world.inviteToken),
      expiresAt: new Date(Date.now() + 86_400_000),
    })
    .run();
}

export function fill(path: string): { url: string; params: Record<string, string> } {
  const params: Record<string, string> = {};
  const url = path.replace(/:([A-Za-z]+)/g, (_m, name: string) => {
    const value = world[name];
    if (value === undefined) throw new Error(`The world has no ${name} for ${path}`);
    // A route's own param names: :copyTankId stands for :tankId and so on.
    const param =
      {
        copyTankId: "tankId",
        copyScenarioId: "scenarioId",
        revokedToken: "token",
        inviteToken: "token",
        formerClassId: "classId",
        formerLessonId: "lessonId",
      }[name] ?? name;
    params[param] = value;
    return value;
  });
  return { url, params };
}

export function request(row: Row, cookie: string | undefined): Request {
  const { url } = fill(row.path);
  const headers: Record<string, string> = { Origin: ORIGIN };
  if (cookie) headers.Cookie = cookie;
  if (row.handler === "loader") return get(url, cookie, row.host ? { Host: row.host } : {});
  if (row.json !== undefined) {
    headers["Content-Type"] = "application/json";
    return new Request(ORIGIN + url, { method: row.method ?? "POST", headers, body: JSON.stringify(row.json) });
  }
  headers["Content-Type"] = "application/x-www-form-urlencoded";
  // A value ":name" is filled from the world, like a path parameter.
  const form = Object.fromEntries(
    Object.entries(row.form ?? {}).map(([k, v]) => [k, /^:[A-Za-z]+$/.test(v) ? (world[v.slice(1)] ?? v) : v]),
  );
  return new Request(ORIGIN + url, { method: row.method ?? "POST", headers, body: new URLSearchParams(form) });
}

export function answerOf(status: number, location: string | null): Answer {
  if (status === 302 && location?.startsWith("/sign-in?redirectTo=")) return "sign-in";
  return status as Answer;
}

const modules = new Map<string, Record<string, unknown>>();
export async function handlerOf(row: Row) {
  if (!modules.has(row.file)) modules.set(row.file, await import(/* @vite-ignore */ `../../app/${row.file}`));
  const fn = modules.get(row.file)![row.handler];
  if (typeof fn !== "function") throw new Error(`${row.file} has no ${row.handler}`);
  return fn as (args: unknown) => unknown;
}
