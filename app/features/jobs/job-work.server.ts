/**
 * A job's work as it runs in this process: the context its work function gets (engine runs on
 * the pool's job lane, a cancel checked between runs, progress written to its row) and what
 * records how it ended (app/features/jobs/job-line.server.ts keeps the registry and the line).
 */
import { getEnginePool } from "~/features/jobs/engine-pool.server";
import type { EngineTask, EngineTaskResult } from "~/features/jobs/engine-tasks.server";
import { cancelRequested, persist, type Job } from "~/features/jobs/job-rows.server";

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

/**
 * What begins `job`'s work: sets it running and records its end. `mine()` says whether the job
 * is still this process's (a stop or a clear drops it: then nothing more is written); `ended()`
 * runs once, after the row says how it ended.
 */
export function beginner<R, P>(
  job: Job<R, P>,
  work: (ctx: JobContext<P>) => Promise<R>,
  mine: () => boolean,
  ended: () => void,
): () => void {
  const { id } = job;
  const controller = job.controller!;
  const pool = getEnginePool();
  const owner = `user:${job.userId}`;
  // A cancel asked through another process shows up in the row; it is read between engine runs.
  const checkCancel = () => {
    if (!controller.signal.aborted && cancelRequested(id)) controller.abort();
    if (controller.signal.aborted) throw new JobCancelled();
  };

  const ctx: JobContext<P> = {
    signal: controller.signal,
    run: async (task) => {
      checkCancel();
      const result = await pool.run(task, { lane: "job", owner });
      checkCancel();
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
      if (mine()) persist(job as Job, true);
    },
  };

  const finished = () => {
    if (!mine()) return;
    job.finishedAt = Date.now();
    persist(job as Job);
    ended();
  };
  const begin = () => {
    job.status = "running";
    job.ranAt = Date.now();
    persist(job as Job);
    work(ctx).then(
      (result) => {
        job.result = result;
        job.status = controller.signal.aborted ? "cancelled" : "done";
        finished();
      },
      (error: unknown) => {
        if (error instanceof JobCancelled || controller.signal.aborted) {
          job.status = "cancelled";
          finished();
          return;
        }
        job.status = "failed";
        job.error = error instanceof Error ? error.message : String(error);
        finished();
        if (!(error instanceof Error && error.name === "KeeperError")) console.error("[fernwater] job failed", error);
      },
    );
  };
  return begin;
}
