/**
 * The tank's maintenance calendar as an RFC 5545 feed (ical-generator) at a secret address
 * `/calendar/:token.ics`: one event per planned task (water change, filter cleaning, timed
 * trim) in the next 90 days, from the scenario's timetable resumed at the last logged change.
 * The token is random, stored hashed and revocable, like share links.
 */
import { and, eq, isNull } from "drizzle-orm";
import ical from "ical-generator";
import type { Scenario } from "~models";
import { doneByEndOf, plannedAfterJournal, type PlanStart } from "~/features/journal/plan-resume.server";
import { getDb } from "~/db/client.server";
import { scenarios, tanks } from "~/db/schema";
import { calendarFeeds } from "~/db/schema-care";
import type { JournalEntry } from "~/features/journal/journal.server";
import { firstEntryAt, lastTaskEntries } from "~/features/journal/journal.server";
import { readStoredSettings } from "~/features/runs/simulation.server";
import { plannedSettings, planStart } from "~/features/tanks/maintenance-plan.server";
import { hashToken, randomToken } from "~/utils/crypto.server";
import { dayText } from "~/features/journal/forecast-text.server";
import { DAY_MS, startOfDay } from "~/utils/dates";
import { wallClock } from "~/utils/time-zones";
import { zoneOfUser } from "~/features/accounts/time-zone.server";

const CALENDAR_DAYS = 90;

/** A new feed address for the tank (any earlier one is revoked). Returns the raw token. */
export function makeCalendarFeed(tankId: number, scenarioId: number): string {
  const token = randomToken(24);
  getDb().transaction((tx) => {
    tx.update(calendarFeeds)
      .set({ revokedAt: new Date() })
      .where(and(eq(calendarFeeds.tankId, tankId), isNull(calendarFeeds.revokedAt)))
      .run();
    tx.insert(calendarFeeds)
      .values({ tankId, scenarioId, tokenHash: hashToken(token) })
      .run();
  });
  return token;
}

export function revokeCalendarFeed(tankId: number): boolean {
  return (
    getDb()
      .update(calendarFeeds)
      .set({ revokedAt: new Date() })
      .where(and(eq(calendarFeeds.tankId, tankId), isNull(calendarFeeds.revokedAt)))
      .run().changes > 0
  );
}

export function hasCalendarFeed(tankId: number): boolean {
  return !!getDb()
    .select({ id: calendarFeeds.id })
    .from(calendarFeeds)
    .where(and(eq(calendarFeeds.tankId, tankId), isNull(calendarFeeds.revokedAt)))
    .get();
}

/** What a kind never logged counts from, in words ("counted from the journal's first entry"). */
const START_WORDS: Record<PlanStart["from"], string> = {
  journal: "the journal's first entry",
  plan: "when the plan was first saved",
  scenario: "the scenario's start",
};

const TASK_TITLES: Record<string, string> = {
  waterChange: "Water change",
  filterCleaning: "Clean the filter",
  trim: "Trim plants",
  dose: "Dose ammonia",
};

/**
 * The planned tasks from today for `days` days: the scenario's timetable, each kind resumed at
 * its last logged entry (water change, filter cleaning, a group's trim), so marking a task done
 * moves its next occurrence on from that date. An overdue task is due today, once, and says
 * since when ("Water change (30 %) — overdue since 1 December"); `dueMs` is the day it fell due.
 * A kind never logged counts from `start` (plan-resume.server.ts), and its first one says so
 * ("Clean the filter — first one, counted from the journal's first entry (4 November)").
 */
export function upcomingTasks(
  s: Scenario,
  entries: readonly JournalEntry[],
  start: PlanStart,
  now: number,
  days = CALENDAR_DAYS,
) {
  const today = startOfDay(now);
  // Planned doses (fishless cycling) are not calendar tasks.
  const planned = plannedAfterJournal(s, entries, today, now, days, start).filter((e) => e.kind !== "dose");
  const counted = `counted from ${START_WORDS[start.from]} (${dayText(start.ms)})`;
  const tasks = planned.map((e) => {
    const group = e.kind === "trim" ? s.plants.find((g) => g.id === e.groupId) : undefined;
    const atMs = today + Math.round(e.day) * DAY_MS;
    const overdueSinceMs = e.overdueSince === undefined ? null : today + Math.floor(e.overdueSince) * DAY_MS;
    return {
      kind: e.kind,
      groupId: group?.id,
      title:
        TASK_TITLES[e.kind] +
        (e.kind === "waterChange" ? ` (${Math.round(e.fraction * 100)} %)` : "") +
        (group ? ` (${group.name})` : "") +
        (overdueSinceMs === null ? "" : ` — overdue since ${dayText(overdueSinceMs)}`) +
        (e.firstOne ? `${overdueSinceMs === null ? " — first one" : ""}, ${counted}` : ""),
      atMs,
      /** The day it fell due: `atMs`, or an earlier day when overdue. */
      dueMs: overdueSinceMs ?? atMs,
      overdue: overdueSinceMs !== null,
    };
  });
  return tasks.sort((a, b) => a.atMs - b.atMs);
}

/** The feed for a token, or null (unknown or revoked: the route answers 404). */
export function calendarFor(token: string, now = Date.now()): string | null {
  const feed = getDb()
    .select()
    .from(calendarFeeds)
    .where(and(eq(calendarFeeds.tokenHash, hashToken(token)), isNull(calendarFeeds.revokedAt)))
    .get();
  if (!feed) return null;
  const tank = getDb().select().from(tanks).where(eq(tanks.id, feed.tankId)).get();
  const row = getDb().select().from(scenarios).where(eq(scenarios.id, feed.scenarioId)).get();
  const settings = row ? readStoredSettings(row.settings) : null;
  if (!tank || !row || !settings) return null;
  const s = plannedSettings(tank.id, settings);
  const start = planStart(tank.id, row, firstEntryAt(tank.id));
  // The owner's days: "today" on their wall clock, in their time zone.
  const today = wallClock(now, zoneOfUser(tank.ownerId));
  const cal = ical({ name: `${tank.name} · Fernwater`, prodId: { company: "Fernwater", product: "tank-calendar" } });
  for (const t of upcomingTasks(s, lastTaskEntries(tank.id, doneByEndOf(today)), start, today)) {
    cal.createEvent({
      // Keyed by the day it fell due, so an overdue task stays one event that moves along with today
      // (a kind never logged falls due on a fixed day too: counted from the plan's start).
      id: `${feed.id}-${t.kind}${t.groupId ? `-${t.groupId}` : ""}-${t.dueMs}@fernwater`,
      start: new Date(t.atMs),
      allDay: true,
      summary: `${t.title} · ${tank.name}`,
      description:
        (t.overdue ? `Due since ${dayText(t.dueMs)} and not logged in the journal: shown today until it is. ` : "") +
        "Planned in Fernwater. Test your water before and after; the model is not a water test.",
    });
  }
  return cal.toString();
}
