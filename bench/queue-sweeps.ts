/**
 * Sweeps on the job queue (BullMQ on a real Redis, issue 15) with 1 and then 2 engine worker
 * processes (`npm run worker`), against the built server: the median time of a 50-point sweep
 * from POST to done, and of two people's sweeps at once. Starts its own redis-server on a free
 * loopback port. Alone: `npx tsx bench/queue-sweeps.ts` after `npm run build`.
 */
import { spawn, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import process from "node:process";
import { freePort, signInOverHttp, startBuiltServer } from "../tests/support/built-server";

type Job = { id: string; status: string; error: string | null };
const SWEEP = { setting: "plantMass", from: 5, to: 60, points: 50, outcome: "nitrateBeforeLastWaterChange" };
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[xs.length >> 1];

async function sweepOnce(baseURL: string, cookie: string, scenarioId: number): Promise<number> {
  const headers = { Cookie: cookie, Origin: baseURL, "Content-Type": "application/json" };
  const t0 = performance.now();
  const res = await fetch(`${baseURL}/api/scenarios/${scenarioId}/sweeps`, {
    method: "POST",
    headers,
    body: JSON.stringify(SWEEP),
  });
  const { job } = (await res.json()) as { job: Job };
  if (res.status !== 202) throw new Error(`sweep start answered ${res.status}`);
  for (;;) {
    const now = ((await (await fetch(`${baseURL}/api/jobs/${job.id}`, { headers })).json()) as { job: Job }).job;
    if (now.status === "done") return performance.now() - t0;
    if (now.status !== "running" && now.status !== "waiting")
      throw new Error(`sweep ended ${now.status}: ${now.error}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

async function firstScenario(baseURL: string, cookie: string): Promise<number> {
  const headers = { Cookie: cookie };
  const tanks = (await (await fetch(`${baseURL}/api/tanks`, { headers })).json()) as { tanks: { id: number }[] };
  const list = (await (await fetch(`${baseURL}/api/tanks/${tanks.tanks[0].id}/scenarios`, { headers })).json()) as {
    scenarios: { id: number }[];
  };
  return list.scenarios[0].id;
}

function startWorkers(redisUrl: string, processes: number): Promise<ChildProcess> {
  const child = spawn(process.execPath, ["--import", "tsx", "server/queue-worker.ts"], {
    env: { ...process.env, REDIS_URL: redisUrl, WORKER_PROCESSES: String(processes) },
    stdio: ["ignore", "pipe", "pipe"],
  });
  return new Promise((resolve) => {
    let ready = 0;
    child.stdout!.on("data", (d: Buffer) => {
      ready += (String(d).match(/ready/g) ?? []).length;
      if (ready >= processes) resolve(child);
    });
  });
}

export async function run() {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fernwater-redis-"));
  const port = await freePort();
  const redis = spawn(
    "redis-server",
    ["--port", String(port), "--bind", "127.0.0.1", "--save", "", "--appendonly", "no", "--dir", dir],
    { stdio: "ignore" },
  );
  await new Promise((r) => setTimeout(r, 300));
  const redisUrl = `redis://127.0.0.1:${port}`;
  const server = await startBuiltServer({ env: { SEED_IF_EMPTY: "1", REDIS_URL: redisUrl } });
  const lines = ["sweeps on the job queue (BullMQ, local Redis, built server; workers are separate processes)"];
  try {
    const jonah = await signInOverHttp(server.baseURL, "jonah@tidewell.example", "tidewell-demo-2026");
    const ines = await signInOverHttp(server.baseURL, "ines@tidewell.example", "tidewell-demo-2026");
    const [a, b] = [await firstScenario(server.baseURL, jonah), await firstScenario(server.baseURL, ines)];
    for (const processes of [1, 2]) {
      const workers = await startWorkers(redisUrl, processes);
      try {
        await sweepOnce(server.baseURL, jonah, a); // warm-up
        const one: number[] = [];
        for (let i = 0; i < 3; i++) one.push(await sweepOnce(server.baseURL, jonah, a));
        const two: number[] = [];
        for (let i = 0; i < 2; i++) {
          const t0 = performance.now();
          await Promise.all([sweepOnce(server.baseURL, jonah, a), sweepOnce(server.baseURL, ines, b)]);
          two.push(performance.now() - t0);
        }
        lines.push(
          `  ${processes} worker process${processes > 1 ? "es" : ""}: one 50-point sweep median ${median(one).toFixed(0)} ms; two people's sweeps at once, both done in ${median(two).toFixed(0)} ms`,
        );
      } finally {
        workers.kill("SIGTERM");
        await new Promise((r) => workers.once("exit", r));
      }
    }
  } finally {
    await server.stop();
    redis.kill("SIGTERM");
  }
  process.stdout.write(lines.join("\n") + "\n");
}

if (process.argv[1] && /bench[\\/]queue-sweeps\.ts$/.test(process.argv[1])) await run();
