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
 */
import type { Role } from "~/db/schema";
import { getEnginePool } from "~/features/jobs/engine-pool.server";
import type { EngineTask, EngineTaskResult } from "~/features/jobs/engine-tasks.server";
import { randomToken } from "~/utils/crypto.server";
import type { JobJson, JobKind, JobStatus } from "~/features/jobs/job-json";
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
  controller: AbortController;
};

/** A job refused before it started: 429 (your own limit) or 503 (the line is full). */
export class JobRefused extends Error {
  constructor(
    message: string,
    readonly status: 429 | 503,
  ) {
    super(message);
  }
}

/** Thrown inside a job's work when it was cancelled. */
class JobCancelled extends Error {
  constructor() {
    super("Cancelled.");
  }
}

/** What a job's work function gets. */
export type JobContext<P> = {
  signal: AbortSignal;
  /** One engine task on the pool; throws JobCancelled if the job was cancelled first. */
  run(task: EngineTask): Promise<EngineTaskResult>;
  /**
   * Runs `fn` over `items` with as many in flight as the pool has workers; results keep the
   * items' order. Stops starting new ones once cancelled.
   */
  map<T, U>(items: readonly T[], fn: (item: T, index: number) => Promise<U>): Promise<U[]>;
  /** Report progress: `done` of `total` (total may change, e.g. when a search narrows). */
  progress(done: number, total?: number, partial?: P): void;
};

const jobs = new Map<string, Job>();
/** Jobs waiting to run, in the order they were asked for, with what starts them. */
const line: { job: Job; begin: () => void }[] = [];

const isActive = (job: Job) => job.status === "running" || job.status === "waiting";

function prune(now = Date.now()) {
  const finishedByUser = new Map<number, Job[]>();
  for (const job of jobs.values()) {
    if (isActive(job)) continue;
    if (now - (job.finishedAt ?? now) > JOB_LIMITS.keepFinishedMs) {
      jobs.delete(job.id);
      continue;
    }
    const list = finishedByUser.get(job.userId) ?? [];
    list.push(job);
    finishedByUser.set(job.userId, list);
  }
  for (const list of finishedByUser.values()) {
    list.sort((a, b) => b.finishedAt! - a.finishedAt!);
    for (const old of list.slice(JOB_LIMITS.keptPerUser)) jobs.delete(old.id);
  }
}

/** This person's job that is running or waiting, if any. */
function runningJobOf(userId: number): Job | null {
  for (const job of jobs.values()) if (job.userId === userId && isActive(job)) return job;
  return null;
}

function capacity(): number {
  return JOB_LIMITS.runningPerWorker * getEnginePool().size;
}

/** Starts waiting jobs while there is room, oldest first. */
function admitWaiting(): void {
  let running = [...jobs.values()].filter((j) => j.status === "running").length;
  while (running < capacity() && line.length) {
    const next = line.shift()!;
    if (next.job.status !== "waiting") continue;
    running++;
    next.begin();
  }
}

/** How many jobs are ahead of this one in line (0 when it is next, or running). */
function jobsAhead(job: Job): number {
  const i = line.findIndex((w) => w.job === job);
  return i < 0 ? 0 : i;
}

const KIND_WORDS: Record<JobKind, string> = {
  sweep: "a sweep",
  calibration: "a calibration",
  target: "a target search",
};

/**
 * Starts `work` as a job of `user` and returns at once (the job runs on). Throws JobRefused when
 * the person already has a job running or the server is full.
 */
export function startJob<R, P = unknown>(
  start: { user: { id: number }; kind: JobKind; label: string; total: number; params?: unknown },
  work: (ctx: JobContext<P>) => Promise<R>,
): Job<R, P> {
  const { user, kind, label, total } = start;
  prune();
  const mine = runningJobOf(user.id);
  if (mine) {
    throw new JobRefused(
      `You already have ${KIND_WORDS[mine.kind]} running (${mine.label}). Wait for it to finish or cancel it first.`,
      429,
    );
  }
  const pool = getEnginePool();
  const running = [...jobs.values()].filter((j) => j.status === "running").length;
  const mustWait = running >= capacity() || line.length > 0;
  if (mustWait && line.length >= JOB_LIMITS.maxWaiting) {
    throw new JobRefused("The server's line for sweeps and calibrations is full. Try again in a few minutes.", 503);
  }
  const controller = new AbortController();
  const job: Job<R, P> = {
    id: randomToken(12),
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
    startedAt: Date.now(),
    ranAt: mustWait ? null : Date.now(),
    finishedAt: null,
    controller,
  };
  jobs.set(job.id, job as Job);

  const ctx: JobContext<P> = {
    signal: controller.signal,
    run: async (task) => {
      if (controller.signal.aborted) throw new JobCancelled();
      const result = await pool.run(task, { lane: "job", owner: `user:${user.id}` });
      if (controller.signal.aborted) throw new JobCancelled();
      return result;
    },
    map: async (items, fn) => {
      const out = new Array(items.length);
      let next = 0;
      const lane = async () => {
        while (next < items.length) {
          if (controller.signal.aborted) throw new JobCancelled();
          const i = next++;
          out[i] = await fn(items[i], i);
        }
      };
      await Promise.all(Array.from({ length: Math.min(pool.size, items.length) }, lane));
      return out;
    },
    progress: (done, newTotal, partial) => {
      job.done = done;
      if (newTotal !== undefined) job.total = newTotal;
      if (partial !== undefined) job.partial = partial;
    },
  };

  const begin = () => {
    job.status = "running";
    job.ranAt = Date.now();
    work(ctx).then(
      (result) => {
        job.result = result;
        job.status = controller.signal.aborted ? "cancelled" : "done";
        job.finishedAt = Date.now();
        admitWaiting();
      },
      (error: unknown) => {
        job.finishedAt = Date.now();
        admitWaiting();
        if (error instanceof JobCancelled || controller.signal.aborted) {
          job.status = "cancelled";
          return;
        }
        job.status = "failed";
        job.error = error instanceof Error ? error.message : String(error);
        if (!(error instanceof Error && error.name === "KeeperError")) console.error("[fernwater] job failed", error);
      },
    );
  };
  if (mustWait) line.push({ job: job as Job, begin });
  else begin();
  return job;
}

/** A job of this person, or null (someone else's job is not found either). */
export function findJob(userId: number, id: string): Job | null {
  prune();
  const job = jobs.get(id);
  return job && job.userId === userId ? job : null;
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
  if (job && job.status === "running") job.controller.abort();
  if (job && job.status === "waiting") {
    // Still in line: it leaves the line now, and never runs.
    job.controller.abort();
    job.status = "cancelled";
    job.finishedAt = Date.now();
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
    ahead: job.status === "waiting" ? jobsAhead(job) : 0,
    done: job.done,
    total: job.total,
    partial: job.partial,
    result: job.result,
    error: job.error,
    startedAt: new Date(job.startedAt).toISOString(),
    finishedAt: job.finishedAt ? new Date(job.finishedAt).toISOString() : null,
    elapsedMs: (job.finishedAt ?? Date.now()) - job.startedAt,
  };
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
  for (const job of jobs.values()) job.controller.abort();
  jobs.clear();
  line.splice(0);
}
