import { describe, expect, it } from "vitest";
import { signInOverHttp } from "../support/built-server";
import { slowestScenarios } from "../support/slow-scenarios";
import { baseURL, DEMO } from "./support/browser";

// Issue 10: one person's expensive saves must not hold up anyone else. Three people save the
// slowest valid scenarios the search finds (tests/support/slow-scenarios.ts) at the same time;
// meanwhile another person's tanks page must answer within 300 ms every time. When those runs
// ran on the request thread, the page waited for all three (about 6–9 s here). The machine is
// shared with other work, so one slow answer in ten is forgiven, but none may take a second:
// a margin that still fails by far when the runs block the request thread.
const PAGE_LIMIT_MS = 300;
const NEVER_MS = 1000;

describe("expensive saves do not stall other people", () => {
  it(`another person's page answers within ${PAGE_LIMIT_MS} ms while three slowest-valid scenarios are saved in parallel`, async () => {
    const searchStarted = performance.now();
    const found = slowestScenarios();
    const searchMs = performance.now() - searchStarted;
    const slow = found.slice(0, 3);
    const savers = await Promise.all(
      [DEMO.jonah, DEMO.ines, DEMO.theo].map(async (email) => {
        const cookie = await signInOverHttp(baseURL(), email, DEMO.password);
        const list = (await (await fetch(`${baseURL()}/api/tanks`, { headers: { Cookie: cookie } })).json()) as {
          tanks: { id: number }[];
        };
        return { cookie, tankId: list.tanks[0].id };
      }),
    );
    const reader = await signInOverHttp(baseURL(), DEMO.student, DEMO.password);
    const page = async () => {
      const t0 = performance.now();
      const res = await fetch(`${baseURL()}/tanks`, { headers: { Cookie: reader } });
      await res.text();
      expect(res.status).toBe(200);
      return performance.now() - t0;
    };
    await page(); // warm

    let pending = slow.length;
    const saveMs: number[] = [];
    const saves = slow.map(async ({ scenario }, i) => {
      const t0 = performance.now();
      const res = await fetch(`${baseURL()}/api/tanks/${savers[i].tankId}/scenarios`, {
        method: "POST",
        headers: { Cookie: savers[i].cookie, Origin: baseURL(), "Content-Type": "application/json" },
        body: JSON.stringify({ name: `Slowest ${i}`, settings: scenario }),
      });
      await res.text();
      saveMs.push(performance.now() - t0);
      pending--;
      // Saved, or refused by the engine's own bound with its typed error: never a 5xx.
      expect([201, 422]).toContain(res.status);
    });
    await new Promise((r) => setTimeout(r, 50));
    const pageMs: number[] = [];
    while (pending > 0) {
      pageMs.push(await page());
      await new Promise((r) => setTimeout(r, 100));
    }
    await Promise.all(saves);
    process.stdout.write(
      `run isolation: search ${searchMs.toFixed(0)} ms over ${found.length} scenarios (slowest ${slow.map((s) => `${s.ms.toFixed(0)} ms ${s.outcome}`).join(", ")}); ` +
        `saves took ${saveMs.map((m) => m.toFixed(0)).join(", ")} ms; the other page ${pageMs.length} times, slowest ${Math.max(...pageMs).toFixed(0)} ms\n`,
    );
    // The saves really were expensive, so the check below has teeth.
    expect(Math.max(...saveMs)).toBeGreaterThan(PAGE_LIMIT_MS);
    expect(Math.max(...pageMs)).toBeLessThan(NEVER_MS);
    const within = pageMs.filter((ms) => ms < PAGE_LIMIT_MS).length;
    expect(
      within / pageMs.length,
      `${within} of ${pageMs.length} answers within ${PAGE_LIMIT_MS} ms`,
    ).toBeGreaterThanOrEqual(0.9);
    expect(pageMs.length).toBeGreaterThanOrEqual(3);
  }, 120_000);
});
