/**
 * A worker thread of the engine pool (app/features/jobs/jobs.server.ts): receives `{ id, task }`, runs one
 * engine task, answers `{ id, result }` or `{ id, error }`. Built as a second SSR entry
 * (vite.config.ts) into build/server/engine-worker.js, next to the server bundle.
 */
import fs from "node:fs";
import os from "node:os";
import { parentPort } from "node:worker_threads";
import { runEngineTask, type EngineTask } from "~/features/jobs/engine-tasks.server";

if (!parentPort) throw new Error("engine-worker runs as a worker thread only");
const port = parentPort;

/**
 * Run this thread at a lower scheduling priority than the request thread: on a busy machine the
 * kernel then gives the page-serving thread the core first, and the model takes what is left.
 * Linux keeps a priority per thread; /proc/thread-self names this thread's id. Elsewhere (or
 * where it is not allowed) the worker simply runs at normal priority.
 */
export const WORKER_NICE = 10;
try {
  const tid = Number(fs.readlinkSync("/proc/thread-self").split("/").pop());
  if (Number.isInteger(tid) && tid > 0) os.setPriority(tid, WORKER_NICE);
} catch {
  // not Linux, or not permitted: normal priority
}

port.on("message", (message: { id: number; task: EngineTask }) => {
  try {
    port.postMessage({ id: message.id, result: runEngineTask(message.task) });
  } catch (error) {
    port.postMessage({ id: message.id, error: error instanceof Error ? error.message : String(error) });
  }
});
