/**
 * A burst of page loads by one person cannot queue unbounded model work (issue 10: nobody can
 * freeze the server). Every page that runs the model for a person counts its runs against the
 * person's runs in flight, so twenty tabs opened at once queue no more work than two; the rest of
 * the pages answer without the runs (a message, or the page without its check).
 *
 * The pool here holds every task until the test lets it go, so the burst surely overlaps however
 * fast the machine, and the tasks waiting are counted as they would wait for a worker.
 */
import { afterEach, describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { readings, tanks } from "~/db/schema";
import { eq } from "drizzle-orm";
import { runEngineTask, type EngineTask } from "~/features/jobs/engine-tasks.server";
import { setEnginePool, type EnginePool } from "~/features/jobs/engine-pool.server";
import { RUNS_IN_FLIGHT_PER_PERSON } from "~/features/runs/run-gate.server";
import { resetRateLimits } from "~/rate-limits.server";
import { loader as calibrateLoader } from "~/routes/calibrate/calibrate";
import { loader as resultsLoader } from "~/routes/scenarios/results";
import { call, get, type RouteResult } from "../support/routes";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

afterEach(() => resetRateLimits());

const BURST = 20;

/** A pool whose tasks wait until released; counts the most that ever waited at once. */
function heldPool() {
  const held: (() => void)[] = [];
  let most = 0;
  const pool: EnginePool = {
    mode: "inline",
    size: 1,
    run: (task: EngineTask) =>
      new Promise((resolve) => {
        held.push(() => resolve(runEngineTask(task)));
        most = Math.max(most, held.length);
      }),
    waiting: () => ({ interactive: held.length, job: 0 }),
    close: async () => {},
  };
  return { pool, held, most: () => most };
}

/** Fires the burst, lets it settle with everything held, then releases tasks until every page answered. */
async function burst(requests: (() => Promise<RouteResult>)[]) {
  const h = heldPool();
  const previous = setEnginePool(h.pool);
  try {
    const pending = Promise.all(requests.map((r) => r()));
    // Let every request reach the pool (or be refused) before anything runs.
    await new Promise((r) => setTimeout(r, 300));
    const queuedAtOnce = h.held.length;
    let done = false;
    void pending.finally(() => (done = true));
    while (!done) {
      h.held.splice(0).forEach((release) => release());
      await new Promise((r) => setTimeout(r, 5));
    }
    return { answers: await pending, queuedAtOnce, most: h.most() };
  } finally {
    setEnginePool(previous!);
  }
}

describe("a burst of page loads by one person", () => {
  it("queues the calibration check of at most as many loads as the person's runs in flight", async () => {
    const keeper = await userWithCookie();
    const tankId = createTank(keeper.id);
    const scenarioId = await createScenario(keeper.id, tankId, { run: { lengthDays: 30 } });
    // Nitrate readings inside the run, so the page checks what they can tell.
    const start = Date.now();
    getDb()
      .insert(readings)
      .values([3, 8, 14, 20].map((d) => ({ tankId, takenAt: new Date(start + d * 86_400_000), nitrate: 2 + d / 4 })))
      .run();
    const params = { tankId: String(tankId), scenarioId: String(scenarioId) };
    const path = `/tanks/${tankId}/scenarios/${scenarioId}/calibrate`;
    const { answers, queuedAtOnce } = await burst(
      Array.from({ length: BURST }, () => () => call(calibrateLoader, get(path, keeper.cookie), params)),
    );
    expect(answers.map((a) => a.status)).toEqual(answers.map(() => 200));
    // Each check is a base run first (then one run per multiplier): one waiting task per check.
    expect(queuedAtOnce).toBeLessThanOrEqual(RUNS_IN_FLIGHT_PER_PERSON);
    // The checks that ran still tell something (the burst did not break the page).
    expect(answers.some((a) => a.data.multipliers.some((m: { assessment: unknown }) => m.assessment !== null))).toBe(
      true,
    );
  });

  it("re-runs at most as many stale scenarios at once as the person's runs in flight", async () => {
    const keeper = await userWithCookie();
    const tankId = createTank(keeper.id);
    const ids: number[] = [];
    for (let i = 0; i < BURST; i++)
      ids.push(await createScenario(keeper.id, tankId, { run: { lengthDays: 20 } }, `S${i}`));
    // A new nitrate band makes every stored run stale (the band enters the key figures).
    getDb().update(tanks).set({ nitrateTargetHigh: 7 }).where(eq(tanks.id, tankId)).run();
    const { answers, queuedAtOnce } = await burst(
      ids.map(
        (id) => () =>
          call(resultsLoader, get(`/tanks/${tankId}/scenarios/${id}`, keeper.cookie), {
            tankId: String(tankId),
            scenarioId: String(id),
          }),
      ),
    );
    expect(answers.every((a) => a.status === 200)).toBe(true);
    expect(queuedAtOnce).toBeLessThanOrEqual(RUNS_IN_FLIGHT_PER_PERSON);
  });
});
