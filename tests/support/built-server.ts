/**
 * Starts the built server (server/start.mjs) as a child process, as a person would run it:
 * local mode (fake SMTP inside), a throwaway SQLite file seeded with the demo club, a free
 * port. Used by the end-to-end tests and the HTTP benchmarks.
 */
import { spawn, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";

export type BuiltServer = {
  baseURL: string;
  mailDir: string;
  databaseFile: string;
  child: ChildProcess;
  log: () => string;
  stop: () => Promise<void>;
};

export async function freePort(): Promise<number> {
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

/**
 * @param options.cwd another checkout to serve (its own build, server and migrations), for
 *   benchmarks that compare two versions; this one by default
 */
export async function startBuiltServer(
  options: { env?: Record<string, string>; databaseFile?: string; cwd?: string } = {},
): Promise<BuiltServer> {
  const cwd = options.cwd ?? process.cwd();
  const buildDir = options.cwd ? "build" : (process.env.FERNWATER_BUILD_DIR ?? "build");
  if (!fs.existsSync(path.join(cwd, buildDir, "server/index.js"))) {
    throw new Error(`No build in ${path.join(cwd, buildDir)}/: run \`npm run build\` first.`);
  }
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fernwater-server-"));
  const port = await freePort();
  const mailDir = path.join(dir, "mail");
  const databaseFile = options.databaseFile ?? path.join(dir, "fernwater.sqlite");
  let output = "";
  // SERVER_CPU_PROFILE_DIR=<dir> writes a V8 CPU profile of the server, for finding what is slow.
  const profile = process.env.SERVER_CPU_PROFILE_DIR
    ? ["--cpu-prof", `--cpu-prof-dir=${process.env.SERVER_CPU_PROFILE_DIR}`]
    : [];
  const child = spawn(process.execPath, [...profile, "server/start.mjs"], {
    cwd,
    env: {
      ...process.env,
      NODE_ENV: "production",
      FERNWATER_MODE: "local",
      DATABASE_URL: databaseFile,
      MAIL_CAPTURE_DIR: mailDir,
      PORT: String(port),
      HOST: "127.0.0.1",
      SMTP_URL: "",
      ...(options.cwd ? { FERNWATER_BUILD_DIR: buildDir } : {}),
      ...options.env,
    },
    stdio: ["ignore", "pipe", "pipe"],
  });
  child.stdout!.on("data", (d) => (output += d));
  child.stderr!.on("data", (d) => (output += d));
  const baseURL = `http://127.0.0.1:${port}`;
  const log = () => output;
  await waitForHealth(`${baseURL}/api/health`, child, log);
  return {
    baseURL,
    mailDir,
    databaseFile,
    child,
    log,
    stop: async () => {
      if (child.exitCode !== null) return;
      const exited = new Promise((r) => child.once("exit", r));
      child.kill("SIGTERM");
      await Promise.race([exited, new Promise((r) => setTimeout(r, 5000))]);
      if (child.exitCode === null) child.kill("SIGKILL");
    },
  };
}

/** Signs in over HTTP like a browser form post; returns the session cookie ("name=value"). */
export async function signInOverHttp(baseURL: string, email: string, password: string): Promise<string> {
  const res = await fetch(`${baseURL}/sign-in`, {
    method: "POST",
    redirect: "manual",
    headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: baseURL },
    body: new URLSearchParams({ email, password }),
  });
  const cookie = res.headers.get("set-cookie");
  if (res.status !== 302 || !cookie) throw new Error(`sign-in failed with ${res.status}`);
  return cookie.split(";")[0];
}
