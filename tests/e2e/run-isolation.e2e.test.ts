import { describe, expect, it } from "vitest";
import { signInOverHttp } from "../support/built-server";
import { slowestScenarios } from "../support/slow-scenarios";
import { baseURL, DEMO } from "./support/browser";
import { expectNotHeldUp, PAGE_LIMIT_MS, tankListTimer, timeWhile } from "./support/isolation";

// Issue 10: one person's expensive saves must not hold up anyone else. Three people save the
// slowest valid scenarios the search finds (tests/support/slow-scenarios.ts) at the same time;
// meanwhile another person's tanks page must keep to the bar of ./support/isolation.ts (within
// 300 ms 9 times in 10, never a second). When those runs ran on the request thread, the page
// waited for all three (about 6–9 s here).

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
    const page = tankListTimer(baseURL(), await signInOverHttp(baseURL(), DEMO.student, DEMO.password));
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
    const pageMs = await timeWhile(() => pending > 0, page, 100);
    await Promise.all(saves);
    process.stdout.write(
      `run isolation: search ${searchMs.toFixed(0)} ms over ${found.length} scenarios (slowest ${slow.map((s) => `${s.ms.toFixed(0)} ms ${s.outcome}`).join(", ")}); ` +
        `saves took ${saveMs.map((m) => m.toFixed(0)).join(", ")} ms; the other page ${pageMs.length} times, slowest ${Math.max(...pageMs).toFixed(0)} ms\n`,
    );
    expectNotHeldUp(saveMs, pageMs);
  }, 120_000);
});
