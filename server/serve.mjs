// One app process: serves the build (or, with `--dev`, through Vite) on PORT. server/start.mjs
// runs it directly, or as several cluster workers sharing one port (WEB_CONCURRENCY).
import path from "node:path";
import { pathToFileURL } from "node:url";
import compression from "compression";
import express from "express";
import { chooseListenHost } from "./listen-host.mjs";

const dev = process.argv.includes("--dev");
if (!dev) process.env.NODE_ENV ??= "production";

const buildDir = path.resolve(process.env.FERNWATER_BUILD_DIR ?? "build");
const port = Number(process.env.PORT ?? 3000);
const { host, note: hostNote } = chooseListenHost(process.env);

const server = express();
server.disable("x-powered-by");
server.set("trust proxy", process.env.TRUST_PROXY === "1" ? 1 : false);
// Level 1: most of the saving for a fraction of the CPU (the request thread is the bottleneck).
server.use(compression({ level: 1 }));

// Requests slower than SLOW_REQUEST_MS (default 1 s) are logged: the first thing to look at
// when people say the site is slow.
const slowMs = Number(process.env.SLOW_REQUEST_MS ?? 1000);
server.use((req, res, next) => {
  const started = process.hrtime.bigint();
  res.on("finish", () => {
    const ms = Number(process.hrtime.bigint() - started) / 1e6;
    if (ms >= slowMs)
      console.warn(
        `[fernwater] slow request: ${req.method} ${req.originalUrl.split("?")[0]} ${res.statusCode} ${ms.toFixed(0)} ms`,
      );
  });
  next();
});

let appModule;
let stopBoot;
try {
  ({ appModule, stopBoot } = await loadApp());
} catch (error) {
  // A wrong environment is the operator's to fix: one clear line, not a stack.
  if (error && typeof error === "object" && error.name === "FernwaterConfigError") {
    console.error(`[fernwater] ${error.message}`);
    process.exit(1);
  }
  throw error;
}

/** Loads the app (through Vite in dev, else the build) and boots it; an environment problem throws FernwaterConfigError. */
async function loadApp() {
  let loaded;
  if (dev) {
    const vite = await import("vite");
    const viteDev = await vite.createServer({ server: { middlewareMode: true } });
    server.use(viteDev.middlewares);
    loaded = await viteDev.ssrLoadModule("./server/app.ts");
    server.use(async (req, res, next) => {
      try {
        const fresh = await viteDev.ssrLoadModule("./server/app.ts");
        return fresh.app(req, res, next);
      } catch (error) {
        if (typeof error === "object" && error instanceof Error) viteDev.ssrFixStacktrace(error);
        next(error);
      }
    });
  } else {
    loaded = await import(pathToFileURL(path.join(buildDir, "server/index.js")).href);
    // Fingerprinted assets never change; everything else in public/ may.
    server.use(
      "/assets",
      express.static(path.join(buildDir, "client/assets"), { immutable: true, maxAge: "1y", index: false }),
    );
    // Other public files (favicon…) only for paths that look like files, so page requests skip the disk.
    const publicFiles = express.static(path.join(buildDir, "client"), { maxAge: "1h", index: false });
    server.use((req, res, next) =>
      /\.[a-z0-9]{2,5}$/i.test(req.path) && !req.path.endsWith(".data") ? publicFiles(req, res, next) : next(),
    );
    server.use(loaded.app);
  }
  return { appModule: loaded, stopBoot: await loaded.boot() };
}

const listener = server.listen(port, host, () => {
  const address = listener.address();
  const actualPort = typeof address === "object" && address ? address.port : port;
  if (hostNote) console.log(hostNote);
  const shown =
    host === "0.0.0.0" || host === "::" || host === "127.0.0.1" ? "localhost" : host.includes(":") ? `[${host}]` : host;
  console.log(`[fernwater] listening on http://${shown}:${actualPort} (address ${host})`);
});

let stopping = false;
async function shutdown(signal) {
  if (stopping) return;
  stopping = true;
  console.log(`[fernwater] ${signal}: finishing open requests, then stopping`);
  listener.close(async () => {
    await stopBoot();
    appModule.closeDb?.();
    process.exit(0);
  });
  setTimeout(() => process.exit(0), 5000).unref();
}
process.on("SIGTERM", () => shutdown("SIGTERM"));
process.on("SIGINT", () => shutdown("SIGINT"));
