/**
 * The job lane on a real queue (BullMQ on Redis) when REDIS_URL is set: each engine task of a
 * sweep, calibration or target search becomes a BullMQ job that any `npm run worker` process,
 * on this machine or another, runs (server/queue-worker.ts). The app process keeps what it
 * kept before — the job's row, progress, cancel between runs, per-person limits and the line —
 * and waits for each task's answer. Engine tasks are pure (a scenario in, numbers out), so a
 * worker needs no database, only Redis.
 *
 * Interactive tasks (saves, previews: someone waits for the page) stay on this process's own
 * pool; a round trip through Redis would only add to their wait.
 *
 * A worker that dies mid-task stops renewing its lock; BullMQ then hands the task to another
 * worker (once), else it fails, and the job fails with a message instead of running forever.
 */
import { Queue, QueueEvents, Worker } from "bullmq";
import type { EnginePool } from "~/features/jobs/engine-pool.server";
import { runEngineTask, type EngineTask, type EngineTaskResult } from "~/features/jobs/engine-tasks.server";

/** The queue's name in Redis (FERNWATER_QUEUE lets two deployments, or a test, share one Redis). */
const engineQueue = () => process.env.FERNWATER_QUEUE || "fernwater-engine";

/** Lock and stall check of a worker's task: a killed worker's task is handed on after about this long. */
const LOCK_MS = 5_000;
/**
 * How long the app waits for one task's answer. A run is bounded at 3 s of engine time, so
 * this only runs out when no worker takes the task at all (none running): the job then fails.
 */
const TASK_WAIT_MS = 120_000;

function connectionOf(redisUrl: string) {
  const url = new URL(redisUrl);
  return {
    host: url.hostname,
    port: Number(url.port || 6379),
    username: url.username || undefined,
    password: url.password ? decodeURIComponent(url.password) : undefined,
    db: url.pathname.length > 1 ? Number(url.pathname.slice(1)) : 0,
    ...(url.protocol === "rediss:" ? { tls: {} } : {}),
    // BullMQ's workers block on Redis; it asks for this so a command is never cut off.
    maxRetriesPerRequest: null,
  };
}

/**
 * The pool for an app process: job-lane tasks go through the queue, the rest to `local`.
 * `size` is how many tasks one job keeps in flight (jobs interleave, first come first served).
 */
export function queuePool(
  redisUrl: string,
  local: EnginePool,
  options: { size?: number; taskWaitMs?: number } = {},
): EnginePool {
  const { size = 2, taskWaitMs = TASK_WAIT_MS } = options;
  const connection = connectionOf(redisUrl);
  const queue = new Queue<EngineTask, EngineTaskResult>(engineQueue(), { connection });
  const events = new QueueEvents(engineQueue(), { connection });
  // Each task waiting for its answer listens on both; past ten in flight (five jobs of two tasks,
  // or jobs taken up from a stopped process) Node would warn of a leak that is not one.
  queue.setMaxListeners(0);
  events.setMaxListeners(0);
  const ready = events.waitUntilReady();
  let closed = false;
  let inFlight = 0;
  return {
    mode: local.mode,
    size,
    run: async (task, options) => {
      if (options?.lane !== "job") return local.run(task, options);
      if (closed) throw new Error("The engine pool is closed.");
      await ready;
      inFlight++;
      try {
        const job = await queue.add(task.kind, task, {
          attempts: 2, // a second worker takes over once if the first dies
          removeOnComplete: { age: 600 },
          removeOnFail: { age: 3600 },
        });
        try {
          return (await job.waitUntilFinished(events, taskWaitMs)) as EngineTaskResult;
        } catch (error) {
          // No answer in time: take the task back if no worker holds it, so it is not run for nobody.
          await job.remove().catch(() => {});
          throw error;
        }
      } catch (error) {
        const reason = error instanceof Error ? error.message : String(error);
        throw new Error(`An engine worker could not finish a run (${reason}).`, { cause: error });
      } finally {
        inFlight--;
      }
    },
    waiting: () => ({ interactive: local.waiting().interactive, job: inFlight }),
    close: async () => {
      closed = true;
      await Promise.all([queue.close(), events.close(), local.close()]);
    },
  };
}

/** A worker: runs engine tasks from the queue, `concurrency` at a time (one per process is usual). */
export function startQueueWorker(redisUrl: string, concurrency = 1): Worker<EngineTask, EngineTaskResult> {
  return new Worker<EngineTask, EngineTaskResult>(engineQueue(), async (job) => runEngineTask(job.data), {
    connection: connectionOf(redisUrl),
    concurrency,
    lockDuration: LOCK_MS,
    stalledInterval: LOCK_MS,
    maxStalledCount: 1,
  });
}
