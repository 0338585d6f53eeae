// Starts Fernwater: `node server/start.mjs` serves the build; `--dev` serves through Vite.
// The port comes from PORT (default 3000); HOST defaults to 127.0.0.1 in local mode and to
// 0.0.0.0 in production (server/listen-host.mjs).
//
// WEB_CONCURRENCY app processes share the port (node:cluster): by default one per core in
// production, one in local mode and in dev. They share everything through the SQLite file
// (rate limits, jobs, sessions); the primary only migrates the database and keeps them running.
import cluster from "node:cluster";
import os from "node:os";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { webConcurrency } from "./web-concurrency.mjs";

const dev = process.argv.includes("--dev");
if (!dev) process.env.NODE_ENV ??= "production";
const processes = dev ? 1 : webConcurrency(process.env, os.availableParallelism());

if (processes > 1 && cluster.isPrimary) await runPrimary(processes);
else await import("./serve.mjs");

async function runPrimary(count) {
  const buildDir = path.resolve(process.env.FERNWATER_BUILD_DIR ?? "build");
  try {
    const loaded = await import(pathToFileURL(path.join(buildDir, "server/index.js")).href);
    await loaded.prepareDatabase();
    loaded.closeDb();
  } catch (error) {
    if (error && typeof error === "object" && error.name === "FernwaterConfigError") {
      console.error(`[fernwater] ${error.message}`);
      process.exit(1);
    }
    throw error;
  }
  console.log(`[fernwater] starting ${count} app processes (WEB_CONCURRENCY)`);
  let stopping = false;
  const startedAt = new Map();
  const fork = () => startedAt.set(cluster.fork().id, Date.now());
  for (let i = 0; i < count; i++) fork();
  cluster.on("exit", (worker, code, signal) => {
    if (stopping) {
      if (Object.keys(cluster.workers ?? {}).length === 0) process.exit(0);
      return;
    }
    // One that dies is replaced; one that dies at once (a wrong environment) stops everything.
    const lived = Date.now() - (startedAt.get(worker.id) ?? 0);
    console.error(`[fernwater] app process ${worker.process.pid} stopped (${signal ?? code})`);
    if (lived < 5000 && code === 1) process.exit(1);
    fork();
  });
  const stop = (signal) => {
    if (stopping) return;
    stopping = true;
    for (const worker of Object.values(cluster.workers ?? {})) worker?.process.kill(signal);
    setTimeout(() => process.exit(0), 8000).unref();
  };
  process.on("SIGTERM", () => stop("SIGTERM"));
  process.on("SIGINT", () => stop("SIGINT"));
}
