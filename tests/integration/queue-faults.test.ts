/**
 * The job queue (BullMQ on Redis) when worker processes die. Runs only with REDIS_URL (the
 * second run of the job tests in .ci/run); each test uses a queue of its own, served by real
 * `npm run worker` processes started here (not the in-process worker of the test setup).
 */
import { spawn, type ChildProcess } from "node:child_process";
import { randomUUID } from "node:crypto";
import { afterEach, describe, expect, it, vi } from "vitest";
import { createEnginePool, setEnginePool } from "~/features/jobs/engine-pool.server";
import { clearJobs, findJob, type Job, startJob } from "~/features/jobs/jobs.server";
import { queuePool } from "~/features/jobs/queue-pool.server";
import { sweepJob } from "~/features/sweeps/sweeps.server";
import { DEFAULT_PREFERENCES, displayUnitsFor } from "~/utils/display-units";
import { ScenarioSchema } from "../../models/index";

const redisUrl = process.env.REDIS_URL;
const workers: ChildProcess[] = [];
const cleanups: (() => Promise<void>)[] = [];

afterEach(async () => {
  for (const w of workers.splice(0)) if (w.exitCode === null) w.kill("SIGKILL");
  clearJobs();
  for (const c of cleanups.splice(0)) await c();
});

function startWorker(queue: string): Promise<ChildProcess> {
  const child = spawn(process.execPath, ["--import", "tsx", "server/queue-worker.ts"], {
    env: { ...process.env, FERNWATER_QUEUE: queue, WORKER_PROCESSES: "1" },
    stdio: ["ignore", "pipe", "pipe"],
  });
  workers.push(child);
  return new Promise((resolve, reject) => {
    let out = "";
    child.stdout!.on("data", (d) => {
      out += d;
      if (out.includes("ready")) resolve(child);
    });
    child.stderr!.on("data", (d) => (out += d));
    child.once("exit", (code) => reject(new Error(`worker exited (${code}): ${out}`)));
  });
}

/** A pool for this test on a queue of its own; the previous pool comes back after the test. */
function useQueue(taskWaitMs?: number): string {
  const queue = `fernwater-test-${randomUUID()}`;
  process.env.FERNWATER_QUEUE = queue;
  const pool = queuePool(redisUrl!, createEnginePool({ workerUrl: null }), { size: 2, taskWaitMs });
  delete process.env.FERNWATER_QUEUE;
  const previous = setEnginePool(pool);
  cleanups.push(async () => {
    await pool.close();
    if (previous) setEnginePool(previous);
  });
  return queue;
}

// A year at hourly points: each run takes long enough (tens of ms) that a kill lands mid-sweep.
const scenario = ScenarioSchema.parse({
  fish: { feedGPerDay: 1, proteinFraction: 0.42 },
  run: { lengthDays: 365, outputIntervalDays: 1 / 24 },
});
const units = displayUnitsFor(DEFAULT_PREFERENCES);
const sweep = (userId: number) =>
  startJob(
    sweepJob(
      { id: userId },
      1,
      scenario,
      { setting: "fish.feedGPerDay", from: 0.2, to: 2, points: 30, outcome: "nitrateEnd" },
      units,
    ),
  );

async function settled(job: Job, ms: number): Promise<Job> {
  const deadline = Date.now() + ms;
  let now = findJob(job.userId, job.id)!;
  while (Date.now() < deadline && (now.status === "running" || now.status === "waiting")) {
    await new Promise((r) => setTimeout(r, 100));
    now = findJob(job.userId, job.id)!;
  }
  return now;
}

describe.skipIf(!redisUrl)("engine workers on the queue, when one dies", () => {
  it("hands a killed worker's task to another worker, and the sweep finishes with every point", async () => {
    const queue = useQueue();
    const [first] = await Promise.all([startWorker(queue), startWorker(queue)]);
    const job = sweep(70_001);
    while (findJob(job.userId, job.id)!.done < 3) await new Promise((r) => setTimeout(r, 20));
    first.kill("SIGKILL");
    const end = await settled(job, 60_000);
    expect(end.status).toBe("done");
    const points = (end.result as { points: { y: number | null; error: unknown }[] }).points;
    expect(points).toHaveLength(30);
    expect(points.every((p) => p.y !== null && p.error === null)).toBe(true);
  }, 90_000);

  it("fails the job with a message when every worker is gone, instead of running forever", async () => {
    // The failure is logged for the operator: expected here, and checked below.
    const logged: string[] = [];
    vi.mocked(console.error).mockImplementation((...args: unknown[]) => void logged.push(args.map(String).join(" ")));
    const queue = useQueue(8_000);
    const only = await startWorker(queue);
    const job = sweep(70_002);
    while (findJob(job.userId, job.id)!.done < 2) await new Promise((r) => setTimeout(r, 20));
    only.kill("SIGKILL");
    const end = await settled(job, 40_000);
    expect(end.status).toBe("failed");
    expect(end.error).toMatch(/engine worker could not finish/);
    expect(logged.some((line) => line.includes("job failed"))).toBe(true);
  }, 60_000);

  it("serves a new app process from the same queue and workers (an app restart loses nothing queued)", async () => {
    const queue = useQueue();
    await startWorker(queue);
    expect((await settled(sweep(70_003), 60_000)).status).toBe("done");
  }, 90_000);
});
