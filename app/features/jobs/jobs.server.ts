/**
 * Long engine work off the request thread: a registry of jobs (sweeps, calibrations, target
 * searches) whose progress the browser polls, each running its engine tasks on the worker pool
 * (app/features/jobs/engine-pool.server.ts, re-exported here).
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
 */
import type { Role } from "~/db/schema";
import { getEnginePool } from "~/features/jobs/engine-pool.server";
import { releaseJobs } from "~/features/jobs/job-claims.server";
import {
  beat,
  deleteAllJobRows,
  dropPendingWrites,
  fromRow,
  type Job,
  HEARTBEAT_MS,
  insertJobExclusive,
  type JobRow,
  pruneJobRows,
  readJobRow,
  requestCancel,
  waitingAhead,
} from "~/features/jobs/job-rows.server";
export type { Job } from "~/features/jobs/job-rows.server";
import { beginner, type JobContext } from "~/features/jobs/job-work.server";
export type { JobContext } from "~/features/jobs/job-work.server";
import { randomToken } from "~/utils/crypto.server";
import { JOB_KIND_NAMES, type JobJson, type JobKind } from "~/features/jobs/job-json";
export type { JobJson, JobKind } from "~/features/jobs/job-json";

export {
  createEnginePool,
  getEnginePool,
  setEnginePool,
  sourceWorkerUrl,
} from "~/features/jobs/engine-pool.server";

// ---------------------------------------------------------------------------------------------
// Jobs

/** Limits for a run inside a job: like a request's, a bad point fails fast. */
export const JOB_RUN_LIMITS = { maxWallMs: 3000, maxSteps: 300_000 };


/** Limits that keep one person from tying up the server. */
export const JOB_LIMITS = {
  /** Jobs one person may have running at once. */
  runningPerUser: 1,
  /** Sweep points by role. */
  sweepPoints: { keeper: 50, educator: 100, admin: 100 } satisfies Record<Role, number>,
  /** Jobs running at once across everyone, per pool worker (more wait in line). */
  runningPerWorker: 4,
  /** Jobs waiting in line across everyone; past that a start answers 503. */
  maxWaiting: 200,
  /** How long a finished job's result stays readable. */
  keepFinishedMs: 15 * 60_000,
  /** Finished jobs kept per person (the oldest go first). */
  keptPerUser: 5,
} as const;


/** A job refused before it started: 429 (your own limit) or 503 (the line is full). */
export class JobRefused extends Error {
  constructor(
    message: string,
    readonly status: 429 | 503,
  ) {
    super(message);
  }
}

/** This process's jobs that are running or waiting (finished ones live in the table only). */
const jobs = new Map<string, Job>();
/** Jobs waiting to run here, in the order they were asked for, with what starts them. */
const line: { job: Job; begin: () => void }[] = [];

/** Puts a job in line by when it was asked for (a restarted job keeps its original place). */
function enqueue(entry: { job: Job; begin: () => void }): void {
  const i = line.findIndex((w) => w.job.startedAt > entry.job.startedAt);
  if (i < 0) line.push(entry);
  else line.splice(i, 0, entry);
}

const isActive = (job: Job) => job.status === "running" || job.status === "waiting";

let lastPrune = 0;
function prune(now = Date.now()) {
  if (now - lastPrune < 10_000) return;
  lastPrune = now;
  pruneJobRows(JOB_LIMITS.keepFinishedMs, JOB_LIMITS.keptPerUser, now);
}

let heartbeat: NodeJS.Timeout | null = null;
/** Keeps this process's jobs alive in the table while it has any (see job-rows.server.ts). */
function keepBeating(): void {
  if (jobs.size && !heartbeat) {
    heartbeat = setInterval(() => {
      if (!jobs.size) {
        clearInterval(heartbeat!);
        heartbeat = null;
        return;
      }
      beat([...jobs.keys()]);
    }, HEARTBEAT_MS);
    heartbeat.unref();
  }
}

function capacity(): number {
  return JOB_LIMITS.runningPerWorker * getEnginePool().size;
}

function runningHere(): number {
  let n = 0;
  for (const j of jobs.values()) if (j.status === "running") n++;
  return n;
}

/** Starts waiting jobs while there is room, oldest first (skipping any cancelled through another process). */
function admitWaiting(): void {
  let running = runningHere();
  while (running < capacity() && line.length) {
    const next = line.shift()!;
    if (next.job.status !== "waiting") continue;
    const row = readJobRow(next.job.id);
    if (!row || row.status !== "waiting") {
      next.job.status = row?.status ?? "cancelled";
      next.job.finishedAt = row?.finishedAt ?? Date.now();
      jobs.delete(next.job.id);
      continue;
    }
    running++;
    next.begin();
  }
}

/** How many jobs are ahead of this one in line (0 when it is next, or running). */
function jobsAhead(job: Job): number {
  if (job.status !== "waiting") return 0;
  if (jobs.get(job.id) === job) return Math.max(0, line.findIndex((w) => w.job === job));
  const row = readJobRow(job.id);
  return row ? waitingAhead(row) : 0;
}

/** What a job is started with: its row's fields (params: what rebuilds it after a restart). */
export type JobStart = { user: { id: number }; kind: JobKind; label: string; total: number; params?: unknown };
/** A job ready to start: what it is, and its work. */
export type JobSpec<R = unknown, P = unknown> = { start: JobStart; work: (ctx: JobContext<P>) => Promise<R> };

/**
 * Starts `work` as a job of `user` and returns at once (the job runs on). Throws JobRefused when
 * the person already has a job running or the server is full.
 */
export function startJob<R, P = unknown>(start: JobStart, work: (ctx: JobContext<P>) => Promise<R>): Job<R, P> {
  const { user, kind, label, total } = start;
  prune();
  const mustWait = runningHere() >= capacity() || line.length > 0;
  const id = randomToken(12);
  const startedAt = Date.now();
  const inserted = insertJobExclusive(
    { id, userId: user.id, kind, label, params: start.params ?? null, status: mustWait ? "waiting" : "running", total, startedAt },
    JOB_LIMITS.maxWaiting,
  );
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
  const job: Job<R, P> = {
    id,
    userId: user.id,
    kind,
    label,
    params: start.params ?? null,
    status: mustWait ? "waiting" : "running",
    done: 0,
    total,
    partial: null,
    result: null,
    error: null,
    startedAt,
    ranAt: mustWait ? null : startedAt,
    finishedAt: null,
    controller: new AbortController(),
    attempts: 1,
    resumedAt: null,
  };
  const begin = launch(job, work);
  if (mustWait) enqueue({ job: job as Job, begin });
  else begin();
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
    done: 0,
    total: spec.start.total,
    partial: null,
    result: null,
    error: null,
    startedAt: row.startedAt,
    ranAt: null,
    finishedAt: null,
    controller: new AbortController(),
    attempts: row.attempts,
    resumedAt: row.resumedAt,
  };
  enqueue({ job: job as Job, begin: launch(job, spec.work) });
  admitWaiting();
  return job;
}

/** Registers a job of this process and returns what begins its work (now, or when its turn comes). */
function launch<R, P>(job: Job<R, P>, work: (ctx: JobContext<P>) => Promise<R>): () => void {
  jobs.set(job.id, job as Job);
  keepBeating();
  return beginner(
    job,
    work,
    // Writes only while the job is still this process's (not released by a stop, nor cleared).
    () => jobs.get(job.id) === (job as Job),
    () => {
      jobs.delete(job.id);
      admitWaiting();
    },
  );
}

/** A job of this person, or null (someone else's job is not found either). */
export function findJob(userId: number, id: string): Job | null {
  prune();
  const local = jobs.get(id);
  if (local) return local.userId === userId ? local : null;
  const row = id ? readJobRow(id) : null;
  return row && row.userId === userId ? fromRow(row) : null;
}

/** Cancels this person's job between engine runs; returns it, or null if there is no such job. */
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
    jobs.delete(job.id);
    const i = line.findIndex((w) => w.job === job);
    if (i >= 0) line.splice(i, 1);
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

/**
 * An error whose message is meant for the keeper (e.g. "no readings fall within the run"): the
 * job fails with it, and it is not logged as a server fault.
 */
export class KeeperError extends Error {
  override name = "KeeperError";
}

/** Forgets every job (tests). */
export function clearJobs(): void {
  for (const job of jobs.values()) job.controller?.abort();
  dropPendingWrites();
  jobs.clear();
  line.splice(0);
  deleteAllJobRows();
}

/**
 * This process is stopping normally: it stops its jobs' work and leaves them, in the table, for
 * another process (or the next to start) to run again at once, instead of failing them.
 */
export function releaseLocalJobs(): void {
  const mine = [...jobs.values()];
  jobs.clear(); // first, so the aborted work writes nothing more
  line.splice(0);
  dropPendingWrites();
  for (const job of mine) job.controller?.abort();
  releaseJobs(mine.map((j) => j.id));
}
