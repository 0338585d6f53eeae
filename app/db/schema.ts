/**
 * Fernwater's tables: accounts, tanks, scenarios, runs, readings, sharing, classes and the
 * shared limits and jobs here; what is kept of a real tank's care (journal, plan, calendar,
 * reminders) in app/db/schema-care.ts. Change them, then `npm run db:generate` and commit the
 * new migration under drizzle/ (never edit a migration by hand).
 *
 * Conventions: integer primary keys; times are integer milliseconds since the epoch
 * (`timestamp_ms`); dissolved species are stored in the engine's canonical units
 * (mg N/L, dKH, °C) and converted only for display; secrets (session ids, reset and share
 * tokens) are stored as SHA-256 hashes, never in the clear.
 */
import { sql } from "drizzle-orm";
import { blob, index, integer, primaryKey, real, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
import { PREFERENCE_CHOICES } from "~/utils/display-units";

export const ROLES = ["keeper", "educator", "admin"] as const;
export type Role = (typeof ROLES)[number];

// The account's unit preferences: the choices are the units vocabulary's (app/utils/display-units.ts).
const {
  volumeUnit: VOLUME_UNITS,
  temperatureUnit: TEMPERATURE_UNITS,
  nitrateUnit: NITRATE_UNITS,
  khUnit: KH_UNITS,
} = PREFERENCE_CHOICES;

/** A row's creation time (milliseconds), set by SQLite. */
export const createdAt = () =>
  integer("created_at", { mode: "timestamp_ms" })
    .notNull()
    .default(sql`(unixepoch('subsec') * 1000)`);

export const users = sqliteTable("users", {
  id: integer("id").primaryKey({ autoIncrement: true }),
  email: text("email").notNull().unique(),
  name: text("name").notNull(),
  passwordHash: text("password_hash").notNull(),
  role: text("role", { enum: ROLES }).notNull().default("keeper"),
  volumeUnit: text("volume_unit", { enum: VOLUME_UNITS }).notNull().default("L"),
  temperatureUnit: text("temperature_unit", { enum: TEMPERATURE_UNITS }).notNull().default("C"),
  nitrateUnit: text("nitrate_unit", { enum: NITRATE_UNITS }).notNull().default("NO3"),
  khUnit: text("kh_unit", { enum: KH_UNITS }).notNull().default("dKH"),
  /** The IANA time zone the person chose for calendar days; null: the browser's (app/utils/time-zones.ts). */
  timeZone: text("time_zone"),
  /** The browser's zone at the last sign-in, for mail sent while no page is open. */
  browserTimeZone: text("browser_time_zone"),
  createdAt: createdAt(),
  emailVerifiedAt: integer("email_verified_at", { mode: "timestamp_ms" }),
});

export const sessions = sqliteTable(
  "sessions",
  {
    idHash: text("id_hash").primaryKey(),
    userId: integer("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    createdAt: createdAt(),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
  },
  (t) => [index("sessions_user_idx").on(t.userId)],
);

export const passwordResetTokens = sqliteTable(
  "password_reset_tokens",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    userId: integer("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    tokenHash: text("token_hash").notNull().unique(),
    createdAt: createdAt(),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
    usedAt: integer("used_at", { mode: "timestamp_ms" }),
  },
  (t) => [index("password_reset_tokens_user_idx").on(t.userId)],
);

/**
 * A sign-up waiting for its confirmation mail to be opened: the account is made only then, so
 * the sign-up form answers the same whether or not the address has an account, and nobody can
 * hold an address they cannot read mail at.
 */
export const signUpRequests = sqliteTable(
  "sign_up_requests",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    email: text("email").notNull(),
    name: text("name").notNull(),
    passwordHash: text("password_hash").notNull(),
    tokenHash: text("token_hash").notNull().unique(),
    /** Where to go once the account exists (a same-site path). */
    redirectTo: text("redirect_to").notNull().default("/tanks"),
    createdAt: createdAt(),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
    usedAt: integer("used_at", { mode: "timestamp_ms" }),
  },
  (t) => [index("sign_up_requests_email_idx").on(t.email)],
);

export const tanks = sqliteTable(
  "tanks",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    ownerId: integer("owner_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    notes: text("notes").notNull().default(""),
    /** Nitrate target band for charts and key figures, mg N/L; the defaults are DEFAULT_NITRATE_TARGETS (5–20 mg/L NO3, exact). */
    nitrateTargetLow: real("nitrate_target_low").notNull().default(1.1295239016837624),
    nitrateTargetHigh: real("nitrate_target_high").notNull().default(4.5180956067350495),
    /**
     * Bumped by SQLite triggers on every insert, update and delete of the tank's journal entries
     * (migration 0014), whoever writes them: the journal page keeps its replay by this number
     * instead of reading 20,000 entries on every view.
     */
    journalVersion: integer("journal_version").notNull().default(0),
    createdAt: createdAt(),
    updatedAt: integer("updated_at", { mode: "timestamp_ms" })
      .notNull()
      .default(sql`(unixepoch('subsec') * 1000)`),
  },
  (t) => [index("tanks_owner_idx").on(t.ownerId)],
);

export const scenarios = sqliteTable(
  "scenarios",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    tankId: integer("tank_id")
      .notNull()
      .references(() => tanks.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    /** The engine's scenario as JSON, canonical units. */
    settings: text("settings", { mode: "json" }).notNull(),
    schemaVersion: integer("schema_version").notNull(),
    /**
     * Calendar date of simulated day 0, so test-kit readings (dated) line up with model days.
     * Null: the day the scenario was created.
     */
    startDate: integer("start_date", { mode: "timestamp_ms" }),
    /** Scenario this one was copied from (share link, lesson, "save as new"). */
    copiedFromId: integer("copied_from_id").references((): any => scenarios.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    updatedAt: integer("updated_at", { mode: "timestamp_ms" })
      .notNull()
      .default(sql`(unixepoch('subsec') * 1000)`),
  },
  (t) => [index("scenarios_tank_idx").on(t.tankId)],
);

export const runs = sqliteTable(
  "runs",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    scenarioId: integer("scenario_id")
      .notNull()
      .references(() => scenarios.id, { onDelete: "cascade" }),
    /** SHA-256 of the canonical settings JSON: an unchanged scenario reuses its run. */
    settingsHash: text("settings_hash").notNull(),
    engineVersion: text("engine_version").notNull(),
    keyFigures: text("key_figures", { mode: "json" }).notNull(),
    budget: text("budget", { mode: "json" }).notNull(),
    events: text("events", { mode: "json" }).notNull(),
    /**
     * Columnar series, JSON — or, for runs stored compactly, the marker `{ "packed": "deflate-raw" }`
     * with the JSON deflated in series_packed (a two-year hourly run is ~3.2 MB as JSON, ~0.9 MB packed).
     */
    series: text("series", { mode: "json" }).notNull(),
    seriesPacked: blob("series_packed", { mode: "buffer" }),
    stats: text("stats", { mode: "json" }).notNull(),
    /**
     * What the engine found beyond the series: `{ warnings, lowOxygenZones, ammoniaCriteria }`
     * (RunFindings). Null on runs stored before it was kept: those are run again on view.
     */
    findings: text("findings", { mode: "json" }),
    createdAt: createdAt(),
  },
  (t) => [index("runs_scenario_idx").on(t.scenarioId, t.settingsHash, t.engineVersion)],
);

export const readings = sqliteTable(
  "readings",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    tankId: integer("tank_id")
      .notNull()
      .references(() => tanks.id, { onDelete: "cascade" }),
    takenAt: integer("taken_at", { mode: "timestamp_ms" }).notNull(),
    /** mg N/L */
    tan: real("tan"),
    /** mg N/L */
    nitrite: real("nitrite"),
    /** mg N/L */
    nitrate: real("nitrate"),
    ph: real("ph"),
    /** dKH */
    kh: real("kh"),
    temperatureC: real("temperature_c"),
    note: text("note").notNull().default(""),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("readings_tank_time_uq").on(t.tankId, t.takenAt)],
);

/**
 * The link-preview picture of a stored run (a 1200×630 PNG, issue 12 item 8): drawn once per
 * run and name, gone with the run.
 */
export const sharePreviews = sqliteTable("share_previews", {
  runId: integer("run_id")
    .primaryKey()
    .references(() => runs.id, { onDelete: "cascade" }),
  png: blob("png", { mode: "buffer" }).notNull(),
  /** The scenario's name drawn in the picture: a rename keeps the run but draws anew. */
  name: text("name").notNull().default(""),
  createdAt: integer("created_at", { mode: "timestamp_ms" })
    .notNull()
    .default(sql`(unixepoch('subsec') * 1000)`),
});

export const shareLinks = sqliteTable(
  "share_links",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    scenarioId: integer("scenario_id")
      .notNull()
      .references(() => scenarios.id, { onDelete: "cascade" }),
    tokenHash: text("token_hash").notNull().unique(),
    createdAt: createdAt(),
    revokedAt: integer("revoked_at", { mode: "timestamp_ms" }),
    takenDownAt: integer("taken_down_at", { mode: "timestamp_ms" }),
    takenDownById: integer("taken_down_by_id").references(() => users.id, { onDelete: "set null" }),
    takedownReason: text("takedown_reason"),
  },
  (t) => [index("share_links_scenario_idx").on(t.scenarioId)],
);

export const classes = sqliteTable(
  "classes",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    educatorId: integer("educator_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    joinCode: text("join_code").notNull().unique(),
    createdAt: createdAt(),
  },
  (t) => [index("classes_educator_idx").on(t.educatorId)],
);

export const classMembers = sqliteTable(
  "class_members",
  {
    classId: integer("class_id")
      .notNull()
      .references(() => classes.id, { onDelete: "cascade" }),
    userId: integer("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    joinedAt: integer("joined_at", { mode: "timestamp_ms" })
      .notNull()
      .default(sql`(unixepoch('subsec') * 1000)`),
  },
  (t) => [primaryKey({ columns: [t.classId, t.userId] }), index("class_members_user_idx").on(t.userId)],
);

export const classInvites = sqliteTable(
  "class_invites",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    classId: integer("class_id")
      .notNull()
      .references(() => classes.id, { onDelete: "cascade" }),
    email: text("email").notNull(),
    tokenHash: text("token_hash").notNull().unique(),
    createdAt: createdAt(),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
    acceptedAt: integer("accepted_at", { mode: "timestamp_ms" }),
  },
  (t) => [index("class_invites_class_idx").on(t.classId)],
);

export const lessons = sqliteTable(
  "lessons",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    classId: integer("class_id")
      .notNull()
      .references(() => classes.id, { onDelete: "cascade" }),
    /** The educator's scenario handed out; students get copies. */
    scenarioId: integer("scenario_id").references(() => scenarios.id, { onDelete: "set null" }),
    title: text("title").notNull(),
    question: text("question").notNull(),
    /** Setting paths (e.g. "plants.0.startMassG") students may change; the rest are locked. */
    unlockedFields: text("unlocked_fields", { mode: "json" }).$type<string[]>().notNull(),
    /** Frozen copy of the handed-out settings, so later edits by the educator do not move the lesson. */
    settings: text("settings", { mode: "json" }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("lessons_class_idx").on(t.classId)],
);

export const lessonCopies = sqliteTable(
  "lesson_copies",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    lessonId: integer("lesson_id")
      .notNull()
      .references(() => lessons.id, { onDelete: "cascade" }),
    studentId: integer("student_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    scenarioId: integer("scenario_id")
      .notNull()
      .references(() => scenarios.id, { onDelete: "cascade" }),
    answer: text("answer"),
    handedInAt: integer("handed_in_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("lesson_copies_lesson_student_uq").on(t.lessonId, t.studentId)],
);

/**
 * Rate-limit counters, shared by every app process (app/rate-limits.server.ts). The columns are
 * the ones rate-limiter-flexible's SQLite store reads and writes: points taken, and when the
 * window ends (ms since the epoch).
 */
export const rateLimits = sqliteTable("rate_limits", {
  key: text("key").primaryKey(),
  points: integer("points").notNull().default(0),
  expire: integer("expire"),
});

/**
 * Long engine jobs (sweeps, calibrations, target searches) and their progress, so any app
 * process can answer a poll or a cancel (app/features/jobs/jobs.server.ts). `instance` is the
 * process running it; it refreshes `heartbeatAt`, and a job whose heartbeat stops is failed.
 */
export const jobs = sqliteTable(
  "jobs",
  {
    id: text("id").primaryKey(),
    userId: integer("user_id").notNull(),
    kind: text("kind", { enum: ["sweep", "calibration", "target"] }).notNull(),
    label: text("label").notNull(),
    params: text("params", { mode: "json" }),
    status: text("status", { enum: ["waiting", "running", "done", "failed", "cancelled"] }).notNull(),
    done: integer("done").notNull().default(0),
    total: integer("total").notNull().default(0),
    partial: text("partial", { mode: "json" }),
    result: text("result", { mode: "json" }),
    error: text("error"),
    cancelRequested: integer("cancel_requested", { mode: "boolean" }).notNull().default(false),
    instance: text("instance"),
    /** Processes that took the job: 1 when started, one more each time another process restarts it. */
    attempts: integer("attempts").notNull().default(0),
    /** When a process last restarted the job after the one running it stopped (null: never). */
    resumedAt: integer("resumed_at"),
    startedAt: integer("started_at").notNull(),
    ranAt: integer("ran_at"),
    finishedAt: integer("finished_at"),
    heartbeatAt: integer("heartbeat_at"),
  },
  (t) => [index("jobs_user_status_idx").on(t.userId, t.status), index("jobs_status_idx").on(t.status, t.startedAt)],
);
