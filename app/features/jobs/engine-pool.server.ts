/**
 * The engine's worker threads: a small pool that each run one engine task at a time
 * (app/features/jobs/engine-tasks.server.ts), fed from a fair queue.
 *
 * The pool runs the built worker (build/server/engine-worker.js, a second SSR entry in
 * vite.config.ts) when there is one beside the server bundle. From the TypeScript sources
 * (vitest, `npm run dev`) there is none, so tasks run in-process, one per macrotask, which keeps
 * the same order, progress and cancellation; `createEnginePool` can also start the worker from
 * its TypeScript source through tsx's loader (tests do).
 *
 * The queue has two lanes: "interactive" (someone waits for a page: saves, previews) before
 * "job" (sweeps, calibrations, target searches, which show progress). Within a lane, owners take
 * turns (round robin), so one person's many tasks never hold up another's one. Workers run at a
 * lower scheduling priority than the request thread (where the OS allows), so pages stay quick
 * while the model runs.
 */
import fs from "node:fs";
import os from "node:os";
import { Worker } from "node:worker_threads";
import { runEngineTask, type EngineTask, type EngineTaskResult } from "~/features/jobs/engine-tasks.server";

export type Lane = "interactive" | "job";
export type RunOptions = { lane?: Lane; owner?: string };

export type EnginePool = {
  readonly mode: "threads" | "inline";
  readonly size: number;
  run(task: EngineTask, options?: RunOptions): Promise<EngineTaskResult>;
  /** Tasks waiting for a worker, per lane. */
  waiting(): Record<Lane, number>;
  close(): Promise<void>;
};

/** Workers: one fewer than the cores (the request thread keeps one), at least 1, at most 4. */
export function defaultPoolSize(): number {
  const cores = typeof os.availableParallelism === "function" ? os.availableParallelism() : os.cpus().length;
  return Math.max(1, Math.min(4, cores - 1));
}

/** The worker from its TypeScript source, through tsx (server/engine-worker-source.mjs); for tests. */
export function sourceWorkerUrl(): URL {
  const relative = "../../../server/engine-worker-source.mjs"; // a variable, so the bundler leaves it alone
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

/**
 * Tasks by lane, then by owner; `next()` takes the interactive lane first and, within a lane,
 * the owner whose turn it is (each owner's own tasks in order).
 */
export class FairQueue<T> {
  private lanes: Record<Lane, Map<string, T[]>> = { interactive: new Map(), job: new Map() };

  push(item: T, lane: Lane, owner: string): void {
    const owners = this.lanes[lane];
    const list = owners.get(owner);
    if (list) list.push(item);
    else owners.set(owner, [item]);
  }

  next(): T | undefined {
    for (const lane of ["interactive", "job"] as const) {
      const owners = this.lanes[lane];
      const first = owners.entries().next();
      if (first.done) continue;
      const [owner, list] = first.value;
      const item = list.shift()!;
      // The owner goes to the back of the line (a Map keeps insertion order).
      owners.delete(owner);
      if (list.length) owners.set(owner, list);
      return item;
    }
    return undefined;
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
  type Slot = { worker: Worker; current: (Pending & { id: number }) | null };
  const slots: Slot[] = [];
  const queue = new FairQueue<Pending>();
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
      if (slot.current) continue;
      const next = queue.next();
      if (!next) return;
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
    run: (task, options) =>
      new Promise((resolve, reject) => {
        if (closed) return reject(new Error("The engine pool is closed."));
        queue.push({ task, resolve, reject }, options?.lane ?? "job", ownerOf(options));
        pump();
      }),
    waiting: () => ({ interactive: queue.size("interactive"), job: queue.size("job") }),
    close: async () => {
      closed = true;
      for (const p of queue.drain()) p.reject(new Error("The engine pool is closed."));
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
