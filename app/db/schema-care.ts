/**
 * The tables of a real tank's care (issue 14): the journal of what was done, the maintenance
 * plan, the calendar feed and the e-mail reminders. Conventions as in app/db/schema.ts, whose
 * tanks, scenarios and users these rows belong to.
 */
import { sql } from "drizzle-orm";
import { index, integer, text, sqliteTable } from "drizzle-orm/sqlite-core";
import { createdAt, scenarios, tanks, users } from "~/db/schema";

/**
 * What a keeper actually did to a tank and when (the journal): water changes, cleanings, plants,
 * feeding, fish, doses, notes. `details` holds the kind's fields in canonical units (see
 * app/features/journal/journal-entries.ts); the model replays these "as it happened".
 */
export const journalEntries = sqliteTable(
  "journal_entries",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    tankId: integer("tank_id")
      .notNull()
      .references(() => tanks.id, { onDelete: "cascade" }),
    doneAt: integer("done_at", { mode: "timestamp_ms" }).notNull(),
    kind: text("kind").notNull(),
    details: text("details", { mode: "json" }).notNull(),
    note: text("note").notNull().default(""),
    createdAt: createdAt(),
  },
  (t) => [index("journal_entries_tank_time_idx").on(t.tankId, t.doneAt)],
);

/** A tank's calendar feed address (/calendar/:token.ics), stored hashed like share links; revocable. */
export const calendarFeeds = sqliteTable(
  "calendar_feeds",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    tankId: integer("tank_id")
      .notNull()
      .references(() => tanks.id, { onDelete: "cascade" }),
    scenarioId: integer("scenario_id")
      .notNull()
      .references(() => scenarios.id, { onDelete: "cascade" }),
    tokenHash: text("token_hash").notNull().unique(),
    createdAt: createdAt(),
    revokedAt: integer("revoked_at", { mode: "timestamp_ms" }),
  },
  (t) => [index("calendar_feeds_tank_idx").on(t.tankId)],
);

/**
 * A keeper's e-mail reminders for one tank (opt-in; no row = off). The row is also the durable
 * schedule: `next_due_at` is when the next mail is due; a sender CLAIMS a due row with one
 * conditional update (claimed_by, claimed_until = a lease) before it sends, so two processes or
 * a restart never send the same reminder while a claim is live. A lease that runs out (the
 * process died between claim and send) is taken again: at-least-once (README, "Reminders").
 */
export const reminderSubscriptions = sqliteTable(
  "reminder_subscriptions",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    tankId: integer("tank_id")
      .notNull()
      .unique()
      .references(() => tanks.id, { onDelete: "cascade" }),
    userId: integer("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    /** "due": a mail on a day a planned task is due; "weekly": a digest every 7 days. */
    mode: text("mode").notNull(),
    /** Hour of day the mail is sent, on the keeper's clock (their time zone). */
    hour: integer("hour").notNull(),
    nextDueAt: integer("next_due_at").notNull(),
    claimedBy: text("claimed_by"),
    claimedUntil: integer("claimed_until"),
    lastSentAt: integer("last_sent_at"),
    createdAt: createdAt(),
  },
  (t) => [index("reminder_subscriptions_due_idx").on(t.nextDueAt)],
);

/**
 * A tank's maintenance plan: the scenario it starts from and the keeper's edits of that
 * scenario's timetable (water change share and interval, gravel share, filter cleaning
 * interval, trim intervals). No row = the first scenario's timetable as it stands.
 */
export const maintenancePlans = sqliteTable("maintenance_plans", {
  tankId: integer("tank_id")
    .primaryKey()
    .references(() => tanks.id, { onDelete: "cascade" }),
  scenarioId: integer("scenario_id")
    .notNull()
    .references(() => scenarios.id, { onDelete: "cascade" }),
  plan: text("plan", { mode: "json" }).notNull(),
  /** When the tank's plan was first saved (kept by later saves): a task kind never logged counts from it. */
  createdAt: integer("created_at", { mode: "timestamp_ms" })
    .notNull()
    .default(sql`0`),
  updatedAt: integer("updated_at", { mode: "timestamp_ms" }).notNull(),
});

/**
 * What the latest replay of a tank's journal found (one row a tank), so the tank list can flag a
 * logged dose or feeding change that harms fish without replaying every journal on every view.
 * It stands for the journal as of `journalVersion` (tanks.journal_version) on the plan's settings.
 */
export const journalFindings = sqliteTable("journal_findings", {
  tankId: integer("tank_id")
    .primaryKey()
    .references(() => tanks.id, { onDelete: "cascade" }),
  journalVersion: integer("journal_version").notNull(),
  settingsHash: text("settings_hash").notNull(),
  computedAt: integer("computed_at", { mode: "timestamp_ms" }).notNull(),
  freeNh3AboveCaution: integer("free_nh3_above_caution", { mode: "boolean" }).notNull().default(false),
  nitriteAboveCaution: integer("nitrite_above_caution", { mode: "boolean" }).notNull().default(false),
  /** The codes of the replay's warnings (run-warnings.ts), e.g. "ammoniaAboveAcuteCriterion". */
  warningCodes: text("warning_codes", { mode: "json" }).$type<string[]>().notNull().default([]),
});
