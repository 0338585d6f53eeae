import Database from "better-sqlite3";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { signInOverHttp, startBuiltServer, type BuiltServer } from "../support/built-server";
import { DEMO } from "./support/browser";
import { expectNotHeldUp, PAGE_LIMIT_MS, tankListTimer, timeWhile } from "./support/isolation";

// A person's whole downloads must not hold up anyone else (issue 15: the request thread is the
// limit). A full journal (20,000 entries, the most a tank keeps) takes about 0.1 s to write as
// CSV; ten asked at once (the most a person may in a minute) took the request thread about a
// second when they were written there, and another person's page waited for it. Now they are
// written on the chores thread, and the page must keep to the bar of ./support/isolation.ts
// (within 300 ms 9 times in 10, never a second), as for expensive saves (run-isolation.e2e.test.ts).
const ENTRIES = 20_000;
const DOWNLOADS = 10;
const DAY = 86_400_000;

let server: BuiltServer;
beforeAll(async () => {
  server = await startBuiltServer();
}, 60_000);
afterAll(async () => {
  await server?.stop();
});

describe("whole downloads do not stall other people", () => {
  it(`another person's page answers within ${PAGE_LIMIT_MS} ms while ${DOWNLOADS} full journals download at once`, async () => {
    const owner = await signInOverHttp(server.baseURL, DEMO.jonah, DEMO.password);
    const tanks = (await (await fetch(`${server.baseURL}/api/tanks`, { headers: { Cookie: owner } })).json()) as {
      tanks: { id: number }[];
    };
    const tankId = tanks.tanks[0].id;
    // A full journal, written straight into the database file (the journal's version trigger
    // still moves, so the server reads it afresh).
    const db = new Database(server.databaseFile);
    try {
      const add = db.prepare(
        "INSERT INTO journal_entries (tank_id, done_at, kind, details, note) VALUES (?, ?, ?, ?, ?)",
      );
      const start = Date.now() - 700 * DAY;
      db.transaction(() => {
        for (let i = 0; i < ENTRIES; i++)
          add.run(tankId, start + i * 3_000_000, "water_change", JSON.stringify({ share: 0.2 }), `entry ${i}`);
      })();
    } finally {
      db.close();
    }
    const page = tankListTimer(server.baseURL, await signInOverHttp(server.baseURL, DEMO.student, DEMO.password));
    await page(); // warm
    // The journal is read once per version and kept (journalOf): read it before, so what the
    // downloads cost is writing the file, not the database's first read.
    const first = await fetch(`${server.baseURL}/tanks/${tankId}/journal/export`, { headers: { Cookie: owner } });
    expect((await first.text()).split("\n").length).toBeGreaterThan(ENTRIES);

    let pending = DOWNLOADS - 1;
    const downloadMs: number[] = [];
    const downloads = Array.from({ length: DOWNLOADS - 1 }, async () => {
      const t0 = performance.now();
      const res = await fetch(`${server.baseURL}/tanks/${tankId}/journal/export`, { headers: { Cookie: owner } });
      const text = await res.text();
      downloadMs.push(performance.now() - t0);
      pending--;
      expect(res.status).toBe(200);
      expect(text.split("\n").length).toBeGreaterThan(ENTRIES);
    });
    const pageMs = await timeWhile(() => pending > 0, page, 20);
    await Promise.all(downloads);
    process.stdout.write(
      `download isolation: ${DOWNLOADS - 1} downloads took ${downloadMs.map((m) => m.toFixed(0)).join(", ")} ms; ` +
        `the other page ${pageMs.length} times: ${pageMs.map((m) => m.toFixed(0)).join(", ")} ms\n`,
    );
    expectNotHeldUp(downloadMs, pageMs);
  }, 120_000);
});
