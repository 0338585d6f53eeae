/**
 * Long engine work off the request thread: a small pool of worker threads that each run one
 * engine task at a time (app/engine-tasks.server.ts), and a registry of jobs (sweeps,
 * calibrations, target searches) whose progress the browser polls.
 *
 * The pool runs the built worker (build/server/engine-worker.js, a second SSR entry in
 * vite.config.ts) when there is one beside the server bundle. From the TypeScript sources
 * (vitest, `npm run dev`) there is none, so tasks run in-process, one per macrotask, which keeps
 * the same order, progress and cancellation; `createEnginePool` can also start the worker from
 * its TypeScript source through tsx's loader (a test does). A single run such as the setup form's could move onto
 * `getEnginePool().run()` later without any other change.
 *
 * Fairness and limits: one running job per person, a cap on sweep points by role, a cap on jobs
 * running at once; a job keeps at most as many tasks in flight as the pool has workers, so the
 * queue interleaves jobs instead of serving one person's fifty runs first. A job is cancelled
 * between engine runs (a run already started finishes; its result is dropped).
 */
import fs from "node:fs";
import os from "node:os";
import { Worker } from "node:worker_threads";
import type { Role } from "~/db/schema";
import { runEngineTask, type EngineTask, type EngineTaskResult } from "~/engine-tasks.server";
import { randomToken } from "~/utils/crypto.server";

// ---------------------------------------------------------------------------------------------
// The pool

export type EnginePool = {
  readonly mode: "threads" | "inline";
  readonly size: number;
  run(task: EngineTask): Promise<EngineTaskResult>;
  close(): Promise<void>;
};

/** Workers: one fewer than the cores (the request thread keeps one), at least 1, at most 4. */
export function defaultPoolSize(): number {
  const cores = typeof os.availableParallelism === "function" ? os.availableParallelism() : os.cpus().length;
  return Math.max(1, Math.min(4, cores - 1));
}

/** The worker from its TypeScript source, through tsx (server/engine-worker-source.mjs); for tests. */
export function sourceWorkerUrl(): URL {
  const relative = "../server/engine-worker-source.mjs"; // a variable, so the bundler leaves it alone
  return new URL(relative, import.meta.url);
}

/** The built worker beside the server bundle (server code sits in build/server/assets/), or null from sources. */
export function builtWorkerUrl(): URL | null {
  for (const relative of ["../engine-worker.js", "./engine-worker.js"]) {
    const url = new URL(relative, import.meta.url);
    if (url.protocol === "file:" && fs.existsSync(url)) return url;
  }
  return null;
}

type Pending = { task: EngineTask; resolve: (r: EngineTaskResult) => void; reject: (e: Error) => void };

function inlinePool(): EnginePool {
  return {
    mode: "inline",
    size: 1,
    // One task per macrotask, so requests (polls, cancels) are served between runs.
    run: (task) =>
      new Promise((resolve, reject) =>
        setImmediate(() => {
          try {
            resolve(runEngineTask(task));
          } catch (error) {
            reject(error instanceof Error ? error : new Error(String(error)));
          }
        }),
      ),
    close: async () => {},
  };
}

function threadPool(workerUrl: URL, size: number): EnginePool {
  type Slot = { worker: Worker; current: (Pending & { id: number }) | null };
  const slots: Slot[] = [];
  const queue: Pending[] = [];
  let nextId = 1;
  let closed = false;

  const spawn = (): Slot => {
    const worker = new Worker(workerUrl);
    const slot: Slot = { worker, current: null };
    worker.unref(); // an idle pool never keeps the process alive
    worker.on("message", (msg: { id: number; result?: EngineTaskResult; error?: string }) => {
      const job = slot.current;
      if (!job || job.id !== msg.id) return;
      slot.current = null;
      worker.unref();
      if (msg.error !== undefined) job.reject(new Error(msg.error));
      else job.resolve(msg.result!);
      pump();
    });
    const fail = (error: Error) => {
      const job = slot.current;
      slot.current = null;
      const i = slots.indexOf(slot);
      if (i >= 0) slots.splice(i, 1);
      job?.reject(new Error(`An engine worker stopped: ${error.message}`));
      if (!closed) {
        slots.push(spawn());
        pump();
      }
    };
    worker.on("error", fail);
    worker.on("exit", (code) => {
      if (!closed && slots.includes(slot)) fail(new Error(`exit code ${code}`));
    });
    return slot;
  };

  const pump = () => {
    for (const slot of slots) {
      if (slot.current || queue.length === 0) continue;
      const next = queue.shift()!;
      const id = nextId++;
      slot.current = { ...next, id };
      slot.worker.ref(); // busy: keep the process alive until the answer comes
      slot.worker.postMessage({ id, task: next.task });
    }
  };

  for (let i = 0; i < size; i++) slots.push(spawn());
  return {
    mode: "threads",
    size,
    run: (task) =>
      new Promise((resolve, reject) => {
        if (closed) return reject(new Error("The engine pool is closed."));
        queue.push({ task, resolve, reject });
        pump();
      }),
    close: async () => {
      closed = true;
      for (const p of queue.splice(0)) p.reject(new Error("The engine pool is closed."));
      await Promise.all(slots.splice(0).map((s) => s.worker.terminate()));
    },
  };
}

/**
 * A pool of `size` workers running `workerUrl` (the built worker, or sourceWorkerUrl()), or the
 * in-process stand-in when `workerUrl` is null.
 */
export function createEnginePool(options: { workerUrl: URL | null; size?: number }): EnginePool {
  if (!options.workerUrl) return inlinePool();
  return threadPool(options.workerUrl, options.size ?? defaultPoolSize());
}

let pool: EnginePool | undefined;

/** The process's pool, started on first use. */
export function getEnginePool(): EnginePool {
  pool ??= createEnginePool({ workerUrl: builtWorkerUrl() });
  return pool;
}

/** Replaces the process's pool (tests). Returns the previous one. */
export function setEnginePool(next: EnginePool): EnginePool | undefined {
  const previous = pool;
  pool = next;
  return previous;
}

// ---------------------------------------------------------------------------------------------
// Jobs

export type JobKind = "sweep" | "calibration" | "target";
export type JobStatus = "running" | "done" | "failed" | "cancelled";

/** Limits that keep one person from tying up the server. */
export const JOB_LIMITS = {
  /** Jobs one person may have running at once. */
  runningPerUser: 1,
  /** Sweep points by role. */
  sweepPoints: { keeper: 50, educator: 100, admin: 100 } satisfies Record<Role, number>,
  /** Jobs running at once across everyone, per pool worker. */
  runningPerWorker: 4,
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
  startedAt: number;
  finishedAt: number | null;
  controller: AbortController;
};

/** A job refused before it started: 429 (your own limit) or 503 (the server is busy). */
export class JobRefused extends Error {
  constructor(
    message: string,
    readonly status: 429 | 503,
  ) {
    super(message);
  }
}

/** Thrown inside a job's work when it was cancelled. */
export class JobCancelled extends Error {
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

function prune(now = Date.now()) {
  const finishedByUser = new Map<number, Job[]>();
  for (const job of jobs.values()) {
    if (job.status === "running") continue;
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

export function runningJobOf(userId: number): Job | null {
  for (const job of jobs.values()) if (job.userId === userId && job.status === "running") return job;
  return null;
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
  if (running >= JOB_LIMITS.runningPerWorker * pool.size) {
    throw new JobRefused("The server is busy with other people's runs. Try again in a minute.", 503);
  }
  const controller = new AbortController();
  const job: Job<R, P> = {
    id: randomToken(12),
    userId: user.id,
    kind,
    label,
    params: start.params ?? null,
    status: "running",
    done: 0,
    total,
    partial: null,
    result: null,
    error: null,
    startedAt: Date.now(),
    finishedAt: null,
    controller,
  };
  jobs.set(job.id, job as Job);

  const ctx: JobContext<P> = {
    signal: controller.signal,
    run: async (task) => {
      if (controller.signal.aborted) throw new JobCancelled();
      const result = await pool.run(task);
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

  work(ctx).then(
    (result) => {
      job.result = result;
      job.status = controller.signal.aborted ? "cancelled" : "done";
      job.finishedAt = Date.now();
    },
    (error: unknown) => {
      job.finishedAt = Date.now();
      if (error instanceof JobCancelled || controller.signal.aborted) {
        job.status = "cancelled";
        return;
      }
      job.status = "failed";
      job.error = error instanceof Error ? error.message : String(error);
      if (!(error instanceof Error && error.name === "KeeperError")) console.error("[fernwater] job failed", error);
    },
  );
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
  return job;
}

/** What a poll answers. */
export function jobJson(job: Job) {
  return {
    id: job.id,
    kind: job.kind,
    label: job.label,
    params: job.params,
    status: job.status,
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

export type JobJson = ReturnType<typeof jobJson>;

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
}
