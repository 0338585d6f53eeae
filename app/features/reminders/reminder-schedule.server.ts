/**
 * The durable reminder schedule (table reminder_subscriptions). A due row is CLAIMED with one
 * conditional UPDATE before its mail is sent, so two app processes, two checks or a restart never
 * send it twice while the claim (a lease) is live. A lease that runs out (the sender died between
 * claim and send) is claimed again, so a reminder is sent at least once: the mail may already have
 * left when a process dies, and at-most-once would risk never telling the keeper at all.
 */
import { and, eq, isNull, lt, lte, or, sql } from "drizzle-orm";
import { getDb } from "~/db/client.server";
import { reminderSubscriptions } from "~/db/schema-care";
import { DAY_MS, startOfDay } from "~/utils/dates";
import { instantAt, wallClock } from "~/utils/time-zones";
import { zoneOfUser } from "~/features/accounts/time-zone.server";
import type { ReminderMode } from "~/features/reminders/reminder-preferences";

const HOUR_MS = 3_600_000;
/** How long a claim holds: far longer than composing and sending one mail. */
const CLAIM_LEASE_MS = 2 * 60_000;

export type ReminderRow = typeof reminderSubscriptions.$inferSelect;

/**
 * The first due time: today at `hour` on the keeper's clock (`zone`) if that hour has not yet
 * passed, else tomorrow. Days step on the wall clock, so the hour holds across daylight saving.
 */
function firstDueAt(hour: number, now: number, zone: string): number {
  const today = startOfDay(wallClock(now, zone)) + hour * HOUR_MS;
  const at = instantAt(today, zone);
  return at + HOUR_MS > now ? at : instantAt(today + DAY_MS, zone);
}

/** After a send: the next day at the hour ("due") or a week on ("weekly"), always in the future. */
function nextDueAfter(row: Pick<ReminderRow, "mode" | "hour" | "nextDueAt">, now: number, zone: string): number {
  const step = row.mode === "weekly" ? 7 * DAY_MS : DAY_MS;
  let next = startOfDay(wallClock(row.nextDueAt, zone)) + row.hour * HOUR_MS + step;
  while (instantAt(next, zone) <= now) next += step;
  return instantAt(next, zone);
}

/** Sets (or clears, mode "off") a tank's reminders; a changed hour or mode starts a fresh schedule. */
export function setReminder(
  userId: number,
  tankId: number,
  mode: ReminderMode | "off",
  hour: number,
  now = Date.now(),
) {
  const db = getDb();
  if (mode === "off") {
    db.delete(reminderSubscriptions).where(eq(reminderSubscriptions.tankId, tankId)).run();
    return;
  }
  const nextDueAt = firstDueAt(hour, now, zoneOfUser(userId));
  db.insert(reminderSubscriptions)
    .values({ tankId, userId, mode, hour, nextDueAt })
    .onConflictDoUpdate({
      target: reminderSubscriptions.tankId,
      set: { mode, hour, nextDueAt, claimedBy: null, claimedUntil: null },
    })
    .run();
}

export function unsubscribe(subscriptionId: number): boolean {
  return getDb().delete(reminderSubscriptions).where(eq(reminderSubscriptions.id, subscriptionId)).run().changes > 0;
}

export function subscriptionById(id: number): ReminderRow | undefined {
  return getDb().select().from(reminderSubscriptions).where(eq(reminderSubscriptions.id, id)).get();
}

/** Ids of rows due now and not under a live claim (candidates; only `claim` decides). */
export function dueReminderIds(now: number, limit = 50): number[] {
  return getDb()
    .select({ id: reminderSubscriptions.id })
    .from(reminderSubscriptions)
    .where(
      and(
        lte(reminderSubscriptions.nextDueAt, now),
        or(isNull(reminderSubscriptions.claimedUntil), lt(reminderSubscriptions.claimedUntil, now)),
      ),
    )
    .limit(limit)
    .all()
    .map((r) => r.id);
}

/** One conditional row update: true only for the one claimer that won the row. */
export function claim(id: number, claimer: string, now: number, leaseMs = CLAIM_LEASE_MS): boolean {
  return (
    getDb()
      .update(reminderSubscriptions)
      .set({ claimedBy: claimer, claimedUntil: now + leaseMs })
      .where(
        and(
          eq(reminderSubscriptions.id, id),
          lte(reminderSubscriptions.nextDueAt, now),
          or(isNull(reminderSubscriptions.claimedUntil), lt(reminderSubscriptions.claimedUntil, now)),
        ),
      )
      .run().changes === 1
  );
}

/** Records the send and moves the row to its next due time; only the claim's holder may. */
export function markSent(row: ReminderRow, claimer: string, now: number, sent: boolean): void {
  getDb()
    .update(reminderSubscriptions)
    .set({
      nextDueAt: nextDueAfter(row, now, zoneOfUser(row.userId)),
      claimedBy: null,
      claimedUntil: null,
      lastSentAt: sent ? now : sql`${reminderSubscriptions.lastSentAt}`,
    })
    .where(and(eq(reminderSubscriptions.id, row.id), eq(reminderSubscriptions.claimedBy, claimer)))
    .run();
}
