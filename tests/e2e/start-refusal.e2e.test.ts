import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";

// The brief: production refuses to start without its secrets. The operator reads why in one
// line naming every missing variable — not a stack trace (our own check, on the built server).
describe("production start without its environment", () => {
  it("exits with one clear line naming each missing variable, and no stack", () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fernwater-refusal-"));
    const env: Record<string, string> = {
      ...(process.env as Record<string, string>),
      NODE_ENV: "production",
      DATABASE_URL: path.join(dir, "x.sqlite"),
      PORT: "0",
    };
    for (const name of ["FERNWATER_MODE", "SESSION_SECRET", "APP_URL", "SMTP_URL", "HOST"]) delete env[name];
    const started = spawnSync(process.execPath, ["server/start.mjs"], { env, encoding: "utf8", timeout: 30_000 });
    expect(started.status).toBe(1);
    const lines = `${started.stdout}${started.stderr}`.trim().split("\n");
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(/^\[fernwater\] Fernwater cannot start; fix the environment: /);
    for (const name of ["SESSION_SECRET", "APP_URL", "SMTP_URL"]) expect(lines[0]).toContain(name);
    expect(lines[0]).not.toMatch(/\bat .+:\d+:\d+/);
  });
});
