import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import Database from "better-sqlite3";
import { describe, expect, it } from "vitest";
import { signInOverHttp, startBuiltServer, type BuiltServer } from "../support/built-server";
import { DEMO } from "./support/browser";

// Fault injection: SIGKILL the server in the middle of a stream of writes (scenario saves and
// CSV imports), start it again on the same file, and check that SQLite kept every write it
// acknowledged and no half of any import (SQLite's atomic commit with WAL; our transactions).
const ROWS_PER_IMPORT = 150;

function csvBatch(batch: number): string {
  const start = Date.UTC(2025, 0, 1) + batch * ROWS_PER_IMPORT * 3_600_000;
  const lines = ["datetime,nitrate_no3_mg_l,note"];
  for (let i = 0; i < ROWS_PER_IMPORT; i++) {
    lines.push(
      `${new Date(start + i * 3_600_000).toISOString().slice(0, 16)},${(5 + (i % 20)).toFixed(1)},crash batch ${batch}`,
    );
  }
  return lines.join("\n") + "\n";
}

describe("a crash in the middle of writes", () => {
  it("keeps every acknowledged write and no half-written import", async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "fernwater-crash-"));
    const databaseFile = path.join(dir, "crash.sqlite");
    let server: BuiltServer = await startBuiltServer({ databaseFile });
    const cookie = await signInOverHttp(server.baseURL, DEMO.ines, DEMO.password);
    const headers = { Cookie: cookie, Origin: server.baseURL };
    const tanks = (await (await fetch(`${server.baseURL}/api/tanks`, { headers })).json()) as {
      tanks: { id: number }[];
    };
    const tankId = tanks.tanks[0].id;

    const savedScenarios: string[] = [];
    const savedImports: number[] = [];
    let stop = false;
    let attempts = 0;

    const saver = (async () => {
      for (let n = 0; !stop; n++) {
        const name = `crash scenario ${n}`;
        attempts++;
        try {
          const res = await fetch(`${server.baseURL}/api/tanks/${tankId}/scenarios`, {
            method: "POST",
            headers: { ...headers, "Content-Type": "application/json" },
            body: JSON.stringify({ name, settings: { run: { lengthDays: 30 } } }),
          });
          if (res.status === 201) savedScenarios.push(name);
        } catch {
          return; // the server died under us
        }
      }
    })();
    const importer = (async () => {
      for (let batch = 0; !stop; batch++) {
        attempts++;
        const form = new FormData();
        form.set("file", new File([csvBatch(batch)], `batch-${batch}.csv`, { type: "text/csv" }));
        try {
          const res = await fetch(`${server.baseURL}/tanks/${tankId}/readings/upload`, {
            method: "POST",
            headers,
            body: form,
          });
          if (res.status === 200) savedImports.push(batch);
        } catch {
          return;
        }
      }
    })();

    await new Promise((r) => setTimeout(r, 2500));
    server.child.kill("SIGKILL");
    stop = true;
    await Promise.all([saver, importer]);
    await new Promise((r) => setTimeout(r, 200));
    expect(savedScenarios.length + savedImports.length).toBeGreaterThan(2);

    // Straight after the crash, before anything else opens the file.
    const db = new Database(databaseFile);
    expect(db.pragma("integrity_check", { simple: true })).toBe("ok");
    const names = new Set(db.prepare("select name from scenarios").pluck().all() as string[]);
    for (const name of savedScenarios) expect(names.has(name), `acknowledged "${name}" is missing`).toBe(true);
    const perBatch = new Map(
      (
        db.prepare("select note, count(*) as n from readings where note like 'crash batch %' group by note").all() as {
          note: string;
          n: number;
        }[]
      ).map((r) => [r.note, r.n]),
    );
    for (const [, n] of perBatch) expect(n, "an import was stored in part").toBe(ROWS_PER_IMPORT);
    for (const batch of savedImports) expect(perBatch.get(`crash batch ${batch}`)).toBe(ROWS_PER_IMPORT);
    // Every scenario has its run: scenario and run are written in one transaction.
    const orphans = db
      .prepare("select count(*) from scenarios s where not exists (select 1 from runs r where r.scenario_id = s.id)")
      .pluck()
      .get();
    expect(orphans).toBe(0);
    db.close();

    // The server starts again on the same file and serves what was kept.
    server = await startBuiltServer({ databaseFile });
    try {
      const again = await signInOverHttp(server.baseURL, DEMO.ines, DEMO.password);
      const list = await fetch(`${server.baseURL}/api/tanks/${tankId}/scenarios`, { headers: { Cookie: again } });
      expect(list.status).toBe(200);
      const listed = ((await list.json()) as { scenarios: { name: string }[] }).scenarios.map((s) => s.name);
      for (const name of savedScenarios) expect(listed).toContain(name);
    } finally {
      await server.stop();
    }
    process.stdout.write(
      `crash test: ${attempts} writes attempted, ${savedScenarios.length} scenario saves and ${savedImports.length} imports acknowledged before SIGKILL; all present\n`,
    );
  }, 90_000);
});
