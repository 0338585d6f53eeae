// With REDIS_URL set (the second run of the job tests in .ci/run), the job lane goes through
// BullMQ: this starts an engine worker in the test process so the queue's tasks are run, and
// stops it (and the app's queue connections) after the file. Without REDIS_URL it does nothing.
import { afterAll } from "vitest";

if (process.env.REDIS_URL) {
  const { startQueueWorker } = await import("~/features/jobs/queue-pool.server");
  const { getEnginePool } = await import("~/features/jobs/engine-pool.server");
  const worker = startQueueWorker(process.env.REDIS_URL);
  await worker.waitUntilReady();
  afterAll(async () => {
    await worker.close();
    await getEnginePool().close();
  });
}
