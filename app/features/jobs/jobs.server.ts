/**
 * Long engine work off the request thread: a registry of jobs (sweeps, calibrations, target
 * searches) whose progress the browser polls, each running its engine tasks on the worker pool
 * (app/features/jobs/engine-pool.server.ts).
 *
 * Fairness and limits: one job per person at a time (running or waiting; a second answers 429),
 * a cap on sweep points by role, and a cap on jobs running at once. Past that cap a job waits in
 * line, first come first served, and its progress says how many are ahead ("waiting, 2 ahead")
 * instead of refusing; only when the line itself is full (maxWaiting) does a start answer 503.
 * A running job keeps at most as many tasks in flight as the pool has workers, and the pool's
 * job lane lets owners take turns, so jobs interleave instead of one person's fifty runs going
 * first. A job is cancelled between engine runs (a run already started finishes; its result is
 * dropped); a waiting job is cancelled at once.
 *
 * Several app processes: every job and its progress is also a row of the jobs table
 * (app/features/jobs/job-rows.server.ts), so any process answers a poll or a cancel, and the
 * one-job-per-person check holds across processes. The process that started a job runs it on its
 * own pool and line; a cancel asked through another process reaches it between engine runs.
 * When that process stops, another rebuilds the job from its row and runs it again from the start
 * (job-claims.server.ts, job-resume.server.ts; decision 0009).
 *
 * This process's registry and line are in job-line.server.ts, the limits in job-limits.server.ts.
 */
import { releaseJobs } from "~/features/jobs/job-claims.server";
import { JOB_KIND_NAMES, type JobJson, type JobKind } from "~/features/jobs/job-json";
import { JOB_LIMITS, JobRefused } from "~/features/jobs/job-limits.server";
import { admit, dropLocalJobs, jobsAhead, leaveLine, localJob, mustWait } from "~/features/jobs/job-line.server";
import {
  deleteAllJobRows,
  dropPendingWrites,
  fromRow,
  type Job,
  insertJobExclusive,
  type JobRow,
  pruneJobRows,
  readJobRow,
  requestCancel,
} from "~/features/jobs/job-rows.server";
import type { JobContext } from "~/features/jobs/job-work.server";
import { randomToken } from "~/utils/crypto.server";
export type { Job } from "~/features/jobs/job-rows.server";
export type { JobContext } from "~/features/jobs/job-work.server";
export type { JobJson, JobKind } from "~/features/jobs/job-json";

const isActive = (job: Job) => job.status === "running" || job.status === "waiting";

let lastPrune = 0;
function prune(now = Date.now()) {
  if (now - lastPrune < 10_000) return;
  lastPrune = now;
  pruneJobRows(JOB_LIMITS.keepFinishedMs, JOB_LIMITS.keptPerUser, now);
}

/** What a job is started with: its row's fields (params: what rebuilds it after a restart). */
type JobStart = { user: { id: number }; kind: JobKind; label: string; total: number; params?: unknown };
/** A job ready to start: what it is, and its work. */
export type JobSpec<R = unknown, P = unknown> = { start: JobStart; work: (ctx: JobContext<P>) => Promise<R> };

/**
 * Starts a job (a sweep's, a calibration's, a target search's: see their `…Job` builders) and
 * returns at once (the job runs on). Throws JobRefused when the person already has a job
 * running or the server is full.
 */
export function startJob<R, P = unknown>({ start, work }: JobSpec<R, P>): Job<R, P> {
  const { user, kind, label, total } = start;
  prune();
  const wait = mustWait();
  const id = randomToken(12);
  const startedAt = Date.now();
  const fields = {
    id,
    userId: user.id,
    kind,
    label,
    params: start.params ?? null,
    status: wait ? ("waiting" as const) : ("running" as const),
    total,
    startedAt,
  };
  const inserted = insertJobExclusive(fields, JOB_LIMITS.maxWaiting);
  if (!inserted.ok && inserted.reason === "mine") {
    const mine = inserted.mine;
    throw new JobRefused(
      `You already have a ${JOB_KIND_NAMES[mine.kind]} running (${mine.label}). Wait for it to finish or cancel it first.`,
      429,
    );
  }
  if (!inserted.ok) {
    throw new JobRefused("The server's line for sweeps and calibrations is full. Try again in a few minutes.", 503);
  }
  const job: Job<R, P> = { ...fields, ...notYetRun(), ranAt: wait ? null : startedAt, attempts: 1, resumedAt: null };
  admit(job, work, wait);
  return job;
}

/**
 * Runs again, from the start, a job this process claimed from one that stopped (its row is
 * already this process's, "waiting"). It takes its place in line by when it was first asked for.
 */
export function resumeJob<R, P = unknown>(row: JobRow, spec: JobSpec<R, P>): Job<R, P> {
  const job: Job<R, P> = {
    id: row.id,
    userId: row.userId,
    kind: row.kind,
    label: row.label,
    params: row.params,
    status: "waiting",
    total: spec.start.total,
    startedAt: row.startedAt,
    ...notYetRun(),
    ranAt: null,
    attempts: row.attempts,
    resumedAt: row.resumedAt,
  };
  admit(job, spec.work, true);
  return job;
}

/** What a job holds before its work has run (new, or run again from the start). */
function notYetRun() {
  return { done: 0, partial: null, result: null, error: null, finishedAt: null, controller: new AbortController() };
}

/** A job of this person, or null (someone else's job is not found either). */
export function findJob(userId: number, id: string): Job | null {
  prune();
  const local = localJob(id);
  if (local) return local.userId === userId ? local : null;
  const row = id ? readJobRow(id) : null;
  return row && row.userId === userId ? fromRow(row) : null;
}

/**
 * The job a scenario page names in its `?job=` parameter, if it is this person's job of this
 * kind for this scenario (anything else, even someone else's id, is simply no job).
 */
export function findScenarioJob(userId: number, request: Request, kind: JobKind, scenarioId: number): Job | null {
  const jobId = new URL(request.url).searchParams.get("job");
  const found = jobId ? findJob(userId, jobId) : null;
  return found && found.kind === kind && (found.params as { scenarioId?: number } | null)?.scenarioId === scenarioId
    ? found
    : null;
}

/** Cancels this person's job between engine runs; returns it, or null if there is no such job. */
export function cancelJob(userId: number, id: string): Job | null {
  const job = findJob(userId, id);
  if (!job || !isActive(job)) return job;
  requestCancel(job.id);
  if (!job.controller) return findJob(userId, id); // another process runs it: the row says what happened
  job.controller.abort();
  if (job.status === "waiting") {
    // Still in line: it leaves the line now, and never runs.
    job.status = "cancelled";
    job.finishedAt = Date.now();
    leaveLine(job);
  }
  return job;
}

/** What a poll answers. */
export function jobJson(job: Job): JobJson {
  return {
    id: job.id,
    kind: job.kind,
    label: job.label,
    params: job.params,
    status: job.status,
    /** Jobs ahead of this one in line while it waits (0 otherwise). */
    ahead: jobsAhead(job),
    done: job.done,
    total: job.total,
    partial: job.partial,
    result: job.result,
    error: job.error,
    startedAt: new Date(job.startedAt).toISOString(),
    finishedAt: job.finishedAt ? new Date(job.finishedAt).toISOString() : null,
    elapsedMs: (job.finishedAt ?? Date.now()) - job.startedAt,
    note: restartNote(job),
  };
}

/** Says when a job is being, or was, run again because the server process running it stopped. */
function restartNote(job: Job): string | null {
  if (job.orphaned) return "The server running this job stopped; another will restart it from the start in a moment.";
  if (job.resumedAt !== null) return "Restarted from the start after a server stopped.";
  return null;
}

/** Forgets every job (tests). */
export function clearJobs(): void {
  for (const job of dropLocalJobs()) job.controller?.abort();
  dropPendingWrites();
  deleteAllJobRows();
}

/**
 * This process is stopping normally: it stops its jobs' work and leaves them, in the table, for
 * another process (or the next to start) to run again at once, instead of failing them.
 */
export function releaseLocalJobs(): void {
  const mine = dropLocalJobs(); // first, so the aborted work writes nothing more
  dropPendingWrites();
  for (const job of mine) job.controller?.abort();
  releaseJobs(mine.map((j) => j.id));
}
