/**
 * A worker thread of the engine pool (app/jobs.server.ts): receives `{ id, task }`, runs one
 * engine task, answers `{ id, result }` or `{ id, error }`. Built as a second SSR entry
 * (vite.config.ts) into build/server/engine-worker.js, next to the server bundle.
 */
import { parentPort } from "node:worker_threads";
import { runEngineTask, type EngineTask } from "~/engine-tasks.server";

if (!parentPort) throw new Error("engine-worker runs as a worker thread only");
const port = parentPort;

port.on("message", (message: { id: number; task: EngineTask }) => {
  try {
    port.postMessage({ id: message.id, result: runEngineTask(message.task) });
  } catch (error) {
    port.postMessage({ id: message.id, error: error instanceof Error ? error.message : String(error) });
  }
});
