/**
 * The jobs table: every job's state and progress, so any app process can answer a poll or a
 * cancel (the process that runs a job writes to its row; app/features/jobs/jobs.server.ts).
 *
 * A running process refreshes its jobs' heartbeat. A row whose heartbeat has stopped (the process
 * died, or was stopped) is restarted by another process (job-claims.server.ts) until it has been
 * tried MAX_ATTEMPTS times; past that, or when nobody took it up for a while, it is failed when
 * read, so no job shows "running" forever.
 */
import { and, eq, inArray, lt, sql } from "drizzle-orm";
import { getDb } from "~/db/client.server";
import { jobs } from "~/db/schema";
import type { JobKind, JobStatus } from "~/features/jobs/job-json";
import { INSTANCE } from "~/instance.server";

export type JobRow = typeof jobs.$inferSelect;

/** A job as the process running it holds it (with its controller), or as read from its row. */
export type Job<R = unknown, P = unknown> = {
  id: string;
  userId: number;
  kind: JobKind;
  label: string;
  /** What the job was started with (the page redraws its form from it). */
  params: unknown;
  status: JobStatus;
  done: number;
  total: number;
  /** Results so far (e.g. the sweep points already run), for drawing while it runs. */
  partial: P | null;
  result: R | null;
  error: string | null;
  /** When it was asked for (it may wait before it runs). */
  startedAt: number;
  /** When it left the line and began to run (null while waiting). */
  ranAt: number | null;
  finishedAt: number | null;
  /** Only on the process running the job (a job read from the table has none). */
  controller?: AbortController;
  /** The table row's process, for a job read from the table. */
  instance?: string | null;
  /** Processes that took it so far (1 unless restarted). */
  attempts: number;
  /** When another process restarted it after the one running it stopped (null: never). */
  resumedAt: number | null;
  /** Read from the table while its process has stopped and before another restarts it. */
  orphaned?: boolean;
};

/** How often a process refreshes the heartbeat of its jobs, and when a silent job counts as lost. */
export const HEARTBEAT_MS = 2_000;
export const LOST_AFTER_MS = 15_000;
/** Processes that may take a job in turn: the one that started it and one restart. */
export const MAX_ATTEMPTS = 2;
/**
 * A lost job that no process restarted in this long fails when read: every app process claims
 * orphans every HEARTBEAT_MS, so this only happens when none runs the resumer at all.
 */
const UNCLAIMED_AFTER_MS = 120_000;

const LOST_MESSAGE =
  "The server process running this job stopped before it finished, and no other took it up. Nothing was saved; start it again.";
export const TRIED_TWICE_MESSAGE =
  "This job was tried twice, and both times the server process running it stopped before it finished. Nothing was saved; start it again.";

export const ACTIVE: JobStatus[] = ["waiting", "running"];

type NewJob = {
  id: string;
  userId: number;
  kind: JobKind;
  label: string;
  params: unknown;
  status: "waiting" | "running";
  total: number;
  startedAt: number;
};

/**
 * Inserts a job unless its owner has one running or waiting anywhere, or the line is full.
 * One immediate transaction, so two processes cannot both start a job for one person.
 */
export function insertJobExclusive(
  job: NewJob,
  maxWaiting: number,
): { ok: true } | { ok: false; reason: "mine"; mine: JobRow } | { ok: false; reason: "full" } {
  const db = getDb();
  return db.transaction(
    (tx) => {
      const now = Date.now();
      for (const row of tx
        .select()
        .from(jobs)
        .where(and(eq(jobs.userId, job.userId), inArray(jobs.status, ACTIVE)))
        .all()) {
        // A lost job that will be restarted still counts as the person's one job.
        if (givenUp(row, now)) failLost(row);
        else return { ok: false as const, reason: "mine" as const, mine: row };
      }
      if (job.status === "waiting") {
        const waiting =
          tx
            .select({ n: sql<number>`count(*)` })
            .from(jobs)
            .where(eq(jobs.status, "waiting"))
            .get()?.n ?? 0;
        if (waiting >= maxWaiting) return { ok: false as const, reason: "full" as const };
      }
      tx.insert(jobs)
        .values({
          ...job,
          params: job.params ?? null,
          instance: INSTANCE,
          attempts: 1,
          ranAt: job.status === "running" ? job.startedAt : null,
          heartbeatAt: now,
        })
        .run();
      return { ok: true as const };
    },
    { behavior: "immediate" },
  );
}

export function readJobRow(id: string): JobRow | null {
  const row = getDb().select().from(jobs).where(eq(jobs.id, id)).get() ?? null;
  if (row && givenUp(row, Date.now())) return failLost(row);
  return row;
}

/**
 * Writes this process's job row. Only while the row is still this process's: a process that
 * stalled past LOST_AFTER_MS may find its job taken over, and must not write over the taker's.
 */
function writeJobRow(id: string, fields: Partial<Omit<JobRow, "id" | "userId" | "kind">>): void {
  getDb()
    .update(jobs)
    .set(fields)
    .where(and(eq(jobs.id, id), eq(jobs.instance, INSTANCE)))
    .run();
}

/**
 * Whether this process should stop the job between engine runs: someone asked (through any
 * process) to cancel it, or another process took it over after this one fell silent.
 */
export function cancelRequested(id: string): boolean {
  const row = getDb()
    .select({ c: jobs.cancelRequested, instance: jobs.instance })
    .from(jobs)
    .where(eq(jobs.id, id))
    .get();
  return !!row && (row.c || row.instance !== INSTANCE);
}

/**
 * Asks for a cancel: a waiting job is cancelled at once (its process skips it when its turn
 * comes); a running one is flagged and stops between engine runs in the process running it.
 */
export function requestCancel(id: string): void {
  const db = getDb();
  db.update(jobs)
    .set({ status: "cancelled", cancelRequested: true, finishedAt: Date.now() })
    .where(and(eq(jobs.id, id), eq(jobs.status, "waiting")))
    .run();
  db.update(jobs)
    .set({ cancelRequested: true })
    .where(and(eq(jobs.id, id), eq(jobs.status, "running")))
    .run();
}

/** Jobs waiting before this one in its process's line (the line keeps the order they were asked for). */
export function waitingAhead(row: JobRow): number {
  return (
    getDb()
      .$client.prepare(
        "SELECT count(*) AS n FROM jobs WHERE status = 'waiting' AND instance IS ? AND (started_at, rowid) < (SELECT started_at, rowid FROM jobs WHERE id = ?)",
      )
      .get(row.instance, row.id) as { n: number }
  ).n;
}

/** Refreshes the heartbeat of this process's active jobs. */
export function beat(ids: string[]): void {
  if (ids.length)
    getDb()
      .update(jobs)
      .set({ heartbeatAt: Date.now() })
      .where(and(inArray(jobs.id, ids), eq(jobs.instance, INSTANCE)))
      .run();
}

/** Fails an active job with a message (e.g. it could not be rebuilt to restart it). */
export function failJobRow(id: string, message: string): void {
  getDb()
    .update(jobs)
    .set({ status: "failed", error: message, finishedAt: Date.now() })
    .where(and(eq(jobs.id, id), inArray(jobs.status, ACTIVE)))
    .run();
}

/** Drops finished jobs past their keeping time, and all but the newest few of each person. */
export function pruneJobRows(keepMs: number, keptPerUser: number, now = Date.now()): void {
  const db = getDb();
  db.delete(jobs)
    .where(and(inArray(jobs.status, ["done", "failed", "cancelled"]), lt(jobs.finishedAt, now - keepMs)))
    .run();
  db.$client
    .prepare(
      `DELETE FROM jobs WHERE id IN (SELECT id FROM (SELECT id, row_number() OVER (PARTITION BY user_id ORDER BY finished_at DESC) AS n
         FROM jobs WHERE status IN ('done','failed','cancelled')) WHERE n > ?)`,
    )
    .run(keptPerUser);
}

export function deleteAllJobRows(): void {
  getDb().delete(jobs).run();
}

/** Active, yet its process has not beaten for LOST_AFTER_MS: it stopped. */
function isLost(row: JobRow, now: number): boolean {
  return (
    ACTIVE.includes(row.status) && row.instance !== INSTANCE && now - (row.heartbeatAt ?? row.startedAt) > LOST_AFTER_MS
  );
}

/** Lost, and no process will restart it: tried enough, or nobody took it up for a long while. */
function givenUp(row: JobRow, now: number): boolean {
  return (
    isLost(row, now) && (row.attempts >= MAX_ATTEMPTS || now - (row.heartbeatAt ?? row.startedAt) > UNCLAIMED_AFTER_MS)
  );
}

function failLost(row: JobRow): JobRow {
  const finishedAt = Date.now();
  const error = row.attempts >= MAX_ATTEMPTS ? TRIED_TWICE_MESSAGE : LOST_MESSAGE;
  getDb()
    .update(jobs)
    .set({ status: "failed", error, finishedAt })
    .where(and(eq(jobs.id, row.id), inArray(jobs.status, ACTIVE)))
    .run();
  return { ...row, status: "failed", error, finishedAt };
}

/** Writes a job's state to its row: at once, or at most every 100 ms for progress. */
const pendingWrites = new Map<string, NodeJS.Timeout>();
export function persist(job: Job, soon = false): void {
  const write = () => {
    pendingWrites.delete(job.id);
    writeJobRow(job.id, {
      status: job.status,
      done: job.done,
      total: job.total,
      partial: job.partial,
      result: job.result,
      error: job.error,
      ranAt: job.ranAt,
      finishedAt: job.finishedAt,
    });
  };
  if (soon) {
    if (!pendingWrites.has(job.id)) pendingWrites.set(job.id, setTimeout(write, 100));
    return;
  }
  clearTimeout(pendingWrites.get(job.id));
  write();
}

export function fromRow(row: JobRow): Job {
  return {
    id: row.id,
    userId: row.userId,
    kind: row.kind,
    label: row.label,
    params: row.params,
    status: row.status,
    done: row.done,
    total: row.total,
    partial: row.partial,
    result: row.result,
    error: row.error,
    startedAt: row.startedAt,
    ranAt: row.ranAt,
    finishedAt: row.finishedAt,
    instance: row.instance,
    attempts: row.attempts,
    resumedAt: row.resumedAt,
    orphaned: isLost(row, Date.now()),
  };
}

/** Forgets progress writes not yet made (tests). */
export function dropPendingWrites(): void {
  for (const t of pendingWrites.values()) clearTimeout(t);
  pendingWrites.clear();
}
