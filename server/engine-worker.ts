/**
 * A worker thread of the engine pool (app/features/jobs/engine-pool.server.ts, on piscina):
 * piscina calls the default export with one engine task and sends back what it returns. Built
 * as a second SSR entry (vite.config.ts) into build/server/engine-worker.js, next to the server
 * bundle.
 */
import fs from "node:fs";
import os from "node:os";
import { isMainThread } from "node:worker_threads";
import { runEngineTask, type EngineTask, type EngineTaskResult } from "~/features/jobs/engine-tasks.server";

if (isMainThread) throw new Error("engine-worker runs as a worker thread only");

/**
 * Run this thread at a lower scheduling priority than the request thread: on a busy machine the
 * kernel then gives the page-serving thread the core first, and the model takes what is left.
 * Linux keeps a priority per thread; /proc/thread-self names this thread's id. Elsewhere (or
 * where it is not allowed) the worker simply runs at normal priority.
 */
const WORKER_NICE = 10;
try {
  const tid = Number(fs.readlinkSync("/proc/thread-self").split("/").pop());
  if (Number.isInteger(tid) && tid > 0) os.setPriority(tid, WORKER_NICE);
} catch {
  // not Linux, or not permitted: normal priority
}

/** One engine task; a throw here is a bug (settings the engine refuses come back as data). */
export default function runTask(task: EngineTask): EngineTaskResult {
  return runEngineTask(task);
}
