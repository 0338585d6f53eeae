/**
 * Taking over the jobs of a process that stopped. A job row whose heartbeat is older than
 * LOST_AFTER_MS belongs to nobody; any app process claims such rows with one conditional UPDATE
 * (so two processes never both take one), counting an attempt, and runs them again from the
 * start (app/features/jobs/job-resume.server.ts). Past MAX_ATTEMPTS a lost job fails instead.
 */
import { and, eq, gte, inArray, isNull, lt, ne, or, sql } from "drizzle-orm";
import { getDb } from "~/db/client.server";
import { jobs } from "~/db/schema";
import { ACTIVE, LOST_AFTER_MS, MAX_ATTEMPTS, TRIED_TWICE_MESSAGE, type JobRow } from "~/features/jobs/job-rows.server";
import { INSTANCE } from "~/instance.server";

/** Active rows of another process (or of none) whose heartbeat stopped before `now - LOST_AFTER_MS`. */
const orphaned = (now: number) =>
  and(
    inArray(jobs.status, ACTIVE),
    or(isNull(jobs.instance), ne(jobs.instance, INSTANCE)),
    lt(sql`coalesce(${jobs.heartbeatAt}, ${jobs.startedAt})`, now - LOST_AFTER_MS),
  );

/**
 * Claims every orphaned job for this process, oldest request first: status back to "waiting",
 * progress cleared, one more attempt. Orphans cancelled meanwhile are cancelled; orphans already
 * tried MAX_ATTEMPTS times fail with a message that says so.
 */
export function claimOrphans(now = Date.now()): JobRow[] {
  const db = getDb();
  // Every process asks every 2 s: a plain read first, so the usual "none" takes no write lock.
  if (!db.select({ id: jobs.id }).from(jobs).where(orphaned(now)).limit(1).get()) return [];
  db.update(jobs)
    .set({ status: "cancelled", finishedAt: now })
    .where(and(orphaned(now), eq(jobs.cancelRequested, true)))
    .run();
  db.update(jobs)
    .set({ status: "failed", error: TRIED_TWICE_MESSAGE, finishedAt: now })
    .where(and(orphaned(now), gte(jobs.attempts, MAX_ATTEMPTS)))
    .run();
  // The one statement that takes them: its WHERE is checked under SQLite's write lock.
  return db
    .update(jobs)
    .set({
      instance: INSTANCE,
      attempts: sql`${jobs.attempts} + 1`,
      heartbeatAt: now,
      resumedAt: now,
      status: "waiting",
      done: 0,
      partial: null,
      ranAt: null,
    })
    .where(and(orphaned(now), lt(jobs.attempts, MAX_ATTEMPTS), eq(jobs.cancelRequested, false)))
    .returning()
    .all()
    .sort((a, b) => a.startedAt - b.startedAt);
}

/**
 * This process stops normally: it leaves its active jobs for another process (or the next one to
 * start) to run again, at once rather than after LOST_AFTER_MS. A clean stop is not the job's
 * fault, so the attempt it was on is given back.
 */
export function releaseJobs(ids: string[], now = Date.now()): void {
  if (!ids.length) return;
  getDb()
    .update(jobs)
    .set({ heartbeatAt: now - LOST_AFTER_MS - 1, attempts: sql`max(${jobs.attempts} - 1, 0)` })
    .where(and(inArray(jobs.id, ids), inArray(jobs.status, ACTIVE)))
    .run();
}
