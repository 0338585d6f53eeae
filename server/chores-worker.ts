/**
 * A worker thread of the chores pool (app/features/jobs/chores-pool.server.ts, on piscina):
 * reads uploaded CSV files and draws share pictures off the request thread. Built as a third SSR
 * entry (vite.config.ts) into build/server/chores-worker.js, next to the server bundle.
 */
import { isMainThread } from "node:worker_threads";
import { runChore, type ChoreResult, type ChoreTask } from "~/features/jobs/chore-tasks.server";

if (isMainThread) throw new Error("chores-worker runs as a worker thread only");

export default function runTask(task: ChoreTask): ChoreResult {
  return runChore(task);
}
