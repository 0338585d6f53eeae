/**
 * The engine's worker threads: a piscina pool whose workers each run one engine task at a time
 * (app/features/jobs/engine-tasks.server.ts), fed from our fair queue (piscina's taskQueue).
 *
 * The pool runs the built worker (build/server/engine-worker.js, a second SSR entry in
 * vite.config.ts) when there is one beside the server bundle. From the TypeScript sources
 * (vitest, `npm run dev`) there is none, so tasks run in-process, one per macrotask, which keeps
 * the same order, progress and cancellation; `createEnginePool` can also start the worker from
 * its TypeScript source through tsx's loader (tests do).
 *
 * The queue has two lanes: "interactive" (someone waits for a page: saves, previews) before
 * "job" (sweeps, calibrations, target searches, which show progress), though a waiting job task
 * still gets one turn in five, so a stream of page runs cannot hold jobs back for ever. Within a lane, owners take
 * turns (round robin), so one person's many tasks never hold up another's one. Workers run at a
 * lower scheduling priority than the request thread (where the OS allows), so pages stay quick
 * while the model runs.
 */
import os from "node:os";
import { builtWorkerUrl } from "~/features/jobs/built-worker.server";
import Piscina, { queueOptionsSymbol, type TaskQueue } from "piscina";
import { runEngineTask, type EngineTask, type EngineTaskResult } from "~/features/jobs/engine-tasks.server";
import { queuePool } from "~/features/jobs/queue-pool.server";
import { getEnv } from "~/env.server";

export type Lane = "interactive" | "job";
type RunOptions = { lane?: Lane; owner?: string };

export type EnginePool = {
  readonly mode: "threads" | "inline";
  readonly size: number;
  run(task: EngineTask, options?: RunOptions): Promise<EngineTaskResult>;
  /** Tasks waiting for a worker, per lane. */
  waiting(): Record<Lane, number>;
  close(): Promise<void>;
};

/** Workers: one fewer than the cores (the request thread keeps one), at least 1, at most 4. */
function defaultPoolSize(): number {
  const cores = typeof os.availableParallelism === "function" ? os.availableParallelism() : os.cpus().length;
  return Math.max(1, Math.min(4, cores - 1));
}

/** The worker from its TypeScript source, through tsx (server/engine-worker-source.mjs); for tests. */
export function sourceWorkerUrl(): URL {
  const relative = "../../../server/engine-worker-source.mjs"; // a variable, so the bundler leaves it alone
  return new URL(relative, import.meta.url);
}

type Pending = { task: EngineTask; resolve: (r: EngineTaskResult) => void; reject: (e: Error) => void };

/** Interactive tasks taken in a row while a job task waits, before the job lane gets one turn. */
const INTERACTIVE_BEFORE_A_JOB = 4;

/**
 * Tasks by lane, then by owner; `next()` takes the interactive lane first (but a waiting job
 * task every INTERACTIVE_BEFORE_A_JOB + 1 turns) and, within a lane, the owner whose turn it is
 * (each owner's own tasks in order).
 */
class FairQueue<T> {
  private lanes: Record<Lane, Map<string, T[]>> = { interactive: new Map(), job: new Map() };
  /** Interactive tasks taken in a row while a job task waited. */
  private interactiveInARow = 0;

  push(item: T, lane: Lane, owner: string): void {
    const owners = this.lanes[lane];
    const list = owners.get(owner);
    if (list) list.push(item);
    else owners.set(owner, [item]);
  }

  next(): T | undefined {
    const jobsWait = this.lanes.job.size > 0;
    // Pages first, but not for ever: one person reloading pages that run the model could keep
    // the interactive lane full and hold everyone's sweeps and calibrations (issue 10).
    const order: Lane[] =
      jobsWait && this.interactiveInARow >= INTERACTIVE_BEFORE_A_JOB ? ["job", "interactive"] : ["interactive", "job"];
    for (const lane of order) {
      const owners = this.lanes[lane];
      const first = owners.entries().next();
      if (first.done) continue;
      const [owner, list] = first.value;
      const item = list.shift()!;
      // The owner goes to the back of the line (a Map keeps insertion order).
      owners.delete(owner);
      if (list.length) owners.set(owner, list);
      this.interactiveInARow = lane === "interactive" && jobsWait ? this.interactiveInARow + 1 : 0;
      return item;
    }
    return undefined;
  }

  /** Takes an item out wherever it waits (an aborted task). */
  remove(item: T): void {
    for (const owners of Object.values(this.lanes)) {
      for (const [owner, list] of owners) {
        const i = list.indexOf(item);
        if (i < 0) continue;
        list.splice(i, 1);
        if (!list.length) owners.delete(owner);
        return;
      }
    }
  }

  size(lane: Lane): number {
    let n = 0;
    for (const list of this.lanes[lane].values()) n += list.length;
    return n;
  }

  drain(): T[] {
    const all = [...this.lanes.interactive.values(), ...this.lanes.job.values()].flat();
    this.lanes = { interactive: new Map(), job: new Map() };
    return all;
  }
}

/** Where a task waits: carried on the task under piscina's queue-options symbol (not sent to the worker). */
type QueuePlace = { lane: Lane; owner: string };
type PlacedTask = EngineTask & { [queueOptionsSymbol]: QueuePlace };

/** The fair queue as piscina's task queue: each task's lane and owner come with it. */
export class FairTaskQueue implements TaskQueue {
  private readonly queue = new FairQueue<Parameters<TaskQueue["push"]>[0]>();

  get size(): number {
    return this.queue.size("interactive") + this.queue.size("job");
  }

  push(task: Parameters<TaskQueue["push"]>[0]): void {
    const place = task[queueOptionsSymbol] as QueuePlace | null;
    this.queue.push(task, place?.lane ?? "job", place?.owner ?? "anyone");
  }

  shift(): Parameters<TaskQueue["push"]>[0] | null {
    return this.queue.next() ?? null;
  }

  remove(task: Parameters<TaskQueue["push"]>[0]): void {
    this.queue.remove(task);
  }

  waiting(lane: Lane): number {
    return this.queue.size(lane);
  }
}

const ownerOf = (options?: RunOptions) => options?.owner ?? "anyone";

function inlinePool(): EnginePool {
  const queue = new FairQueue<Pending>();
  let busy = false;
  // One task per macrotask, so requests (polls, cancels) are served between runs.
  const pump = () => {
    if (busy) return;
    const next = queue.next();
    if (!next) return;
    busy = true;
    setImmediate(() => {
      try {
        next.resolve(runEngineTask(next.task));
      } catch (error) {
        next.reject(error instanceof Error ? error : new Error(String(error)));
      } finally {
        busy = false;
        pump();
      }
    });
  };
  return {
    mode: "inline",
    size: 1,
    run: (task, options) =>
      new Promise((resolve, reject) => {
        queue.push({ task, resolve, reject }, options?.lane ?? "job", ownerOf(options));
        pump();
      }),
    waiting: () => ({ interactive: queue.size("interactive"), job: queue.size("job") }),
    close: async () => {},
  };
}

function threadPool(workerUrl: URL, size: number): EnginePool {
  const queue = new FairTaskQueue();
  const piscina = new Piscina<PlacedTask, EngineTaskResult>({
    filename: workerUrl.href,
    minThreads: size,
    maxThreads: size,
    concurrentTasksPerWorker: 1,
    // Workers stay up: starting one costs the engine's module load again.
    idleTimeout: Number.MAX_SAFE_INTEGER,
    taskQueue: queue,
  });
  let closed = false;
  return {
    mode: "threads",
    size,
    run: async (task, options) => {
      if (closed) throw new Error("The engine pool is closed.");
      const placed = { ...task, [queueOptionsSymbol]: { lane: options?.lane ?? "job", owner: ownerOf(options) } };
      try {
        return await piscina.run(placed as PlacedTask);
      } catch (error) {
        if (closed) throw new Error("The engine pool is closed.", { cause: error });
        throw error instanceof Error ? error : new Error(String(error));
      }
    },
    waiting: () => ({ interactive: queue.waiting("interactive"), job: queue.waiting("job") }),
    close: async () => {
      closed = true;
      await piscina.destroy();
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

/** The process's pool, started on first use; with REDIS_URL its job lane runs on the queue. */
export function getEnginePool(): EnginePool {
  if (!pool) {
    const local = createEnginePool({ workerUrl: builtWorkerUrl("engine-worker.js") });
    const redisUrl = getEnv().REDIS_URL;
    pool = redisUrl ? queuePool(redisUrl, local) : local;
  }
  return pool;
}

/** Replaces the process's pool (tests). Returns the previous one. */
export function setEnginePool(next: EnginePool): EnginePool | undefined {
  const previous = pool;
  pool = next;
  return previous;
}
