/**
 * Starts the built server once for the end-to-end run: local mode (fake SMTP inside the
 * server process), a throwaway SQLite file seeded with the demo club, a free port.
 * Needs `react-router build` first (npm run test:e2e does it).
 */
import { spawn, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import type { TestProject } from "vitest/node";

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.once("error", reject);
    srv.listen(0, "127.0.0.1", () => {
      const port = (srv.address() as net.AddressInfo).port;
      srv.close(() => resolve(port));
    });
  });
}

async function waitForHealth(url: string, child: ChildProcess, log: () => string): Promise<void> {
  const deadline = Date.now() + 30_000;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`server exited early (${child.exitCode}):\n${log()}`);
    try {
      const res = await fetch(url);
      if (res.ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`server did not become healthy:\n${log()}`);
}

let server: ChildProcess | undefined;

export default async function setup(project: TestProject) {
  if (!fs.existsSync("build/server/index.js")) throw new Error("No build found: run `npm run build` before the end-to-end tests.");
  const chromium = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";
  if (!fs.existsSync(chromium)) throw new Error(`Chromium not found at ${chromium}: apt-get install -y chromium`);
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fernwater-e2e-"));
  const port = await freePort();
  const mailDir = path.join(dir, "mail");
  let output = "";
  server = spawn(process.execPath, ["server/start.mjs"], {
    env: {
      ...process.env,
      NODE_ENV: "production",
      FERNWATER_MODE: "local",
      DATABASE_URL: path.join(dir, "e2e.sqlite"),
      MAIL_CAPTURE_DIR: mailDir,
      PORT: String(port),
      HOST: "127.0.0.1",
      SMTP_URL: "",
    },
    stdio: ["ignore", "pipe", "pipe"],
  });
  server.stdout!.on("data", (d) => (output += d));
  server.stderr!.on("data", (d) => (output += d));
  const baseURL = `http://127.0.0.1:${port}`;
  await waitForHealth(`${baseURL}/api/health`, server, () => output);
  fs.mkdirSync("test-results/screenshots", { recursive: true });
  project.provide("baseURL", baseURL);
  project.provide("mailDir", mailDir);
  project.provide("databaseFile", path.join(dir, "e2e.sqlite"));
  return async () => {
    server?.kill("SIGTERM");
    await new Promise((r) => setTimeout(r, 300));
    if (process.env.E2E_SERVER_LOG) fs.writeFileSync(process.env.E2E_SERVER_LOG, output);
  };
}

declare module "vitest" {
  export interface ProvidedContext {
    baseURL: string;
    mailDir: string;
    databaseFile: string;
  }
}
