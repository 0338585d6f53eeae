/**
 * `npm run worker`: engine worker processes for the job queue (BullMQ on the Redis at
 * REDIS_URL), on this machine or any other that reaches the Redis. Each process runs one engine
 * task at a time; WORKER_PROCESSES of them start (default: one per core). They need the code and
 * Redis only — no database, no mail.
 */
import cluster from "node:cluster";
import os from "node:os";
import { startQueueWorker } from "~/features/jobs/queue-pool.server";

const redisUrl = process.env.REDIS_URL;
if (!redisUrl) {
  console.error("[fernwater] REDIS_URL is not set: the worker takes its tasks from Redis (see README, Scale on paper)");
  process.exit(1);
}
const count = Number(process.env.WORKER_PROCESSES ?? os.availableParallelism());
if (!Number.isInteger(count) || count < 1) {
  console.error(
    `[fernwater] WORKER_PROCESSES must be a whole number of at least 1 (got "${process.env.WORKER_PROCESSES}")`,
  );
  process.exit(1);
}

if (count > 1 && cluster.isPrimary) {
  console.log(`[fernwater] starting ${count} engine worker processes on ${redisHost(redisUrl)}`);
  let stopping = false;
  for (let i = 0; i < count; i++) cluster.fork();
  cluster.on("exit", (worker, code, signal) => {
    if (stopping) return;
    console.error(`[fernwater] engine worker ${worker.process.pid} stopped (${signal ?? code}); starting another`);
    cluster.fork();
  });
  const stop = (signal: NodeJS.Signals) => {
    stopping = true;
    for (const worker of Object.values(cluster.workers ?? {})) worker?.process.kill(signal);
    setTimeout(() => process.exit(0), 8000).unref();
    cluster.on("exit", () => Object.keys(cluster.workers ?? {}).length === 0 && process.exit(0));
  };
  process.on("SIGTERM", () => stop("SIGTERM"));
  process.on("SIGINT", () => stop("SIGINT"));
} else {
  const worker = startQueueWorker(redisUrl);
  worker.on("ready", () => console.log(`[fernwater] engine worker ${process.pid} ready`));
  worker.on("error", (error) => console.error(`[fernwater] engine worker ${process.pid}: ${error.message}`));
  const stop = async () => {
    // Finish the task in hand, then leave; the queue keeps the rest.
    await worker.close();
    process.exit(0);
  };
  process.on("SIGTERM", stop);
  process.on("SIGINT", stop);
}

/** The Redis host, without any password. */
function redisHost(url: string): string {
  const u = new URL(url);
  return `${u.hostname}:${u.port || 6379}`;
}
