/**
 * The saves limit (runs that store something) holds whichever route stores the run (issue 10:
 * nobody slips past a limit by another route doing the same thing). A stored run that has gone
 * stale is run again and stored when a page shows it; changing a tank's nitrate band is free and
 * makes every run of the tank stale, so page views alone once stored runs without any limit.
 * Our own checks against the limit in app/rate-limits.server.ts (the README's Reliability table).
 */
import { count, eq } from "drizzle-orm";
import { afterEach, describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { runs, tanks } from "~/db/schema";
import { LIMITS, resetRateLimits } from "~/rate-limits.server";
import { action as tankScenariosAction } from "~/routes/api/tank-scenarios";
import { loader as compareLoader } from "~/routes/tanks/compare";
import { loader as resultsLoader } from "~/routes/scenarios/results";
import { call, get, postJson } from "../support/routes";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

afterEach(() => resetRateLimits());

const SAVES = LIMITS.savesPerPerson.points;
const runsStored = () => getDb().select({ n: count() }).from(runs).get()!.n;
const runIdOf = (scenarioId: number) =>
  getDb().select({ id: runs.id }).from(runs).where(eq(runs.scenarioId, scenarioId)).get()?.id ?? null;

async function keeperWithScenarios(n: number) {
  const keeper = await userWithCookie();
  const tankId = createTank(keeper.id);
  const ids: number[] = [];
  for (let i = 0; i < n; i++) ids.push(await createScenario(keeper.id, tankId, { run: { lengthDays: 10 } }, `S${i}`));
  resetRateLimits();
  let band = 5;
  const newBand = () => {
    band += 0.5;
    getDb().update(tanks).set({ nitrateTargetHigh: band }).where(eq(tanks.id, tankId)).run();
  };
  const view = (scenarioId: number) =>
    call(resultsLoader, get(`/tanks/${tankId}/scenarios/${scenarioId}`, keeper.cookie), {
      tankId: String(tankId),
      scenarioId: String(scenarioId),
    });
  return { keeper, tankId, ids, newBand, view };
}

describe("the saves limit across routes", () => {
  it("counts the runs page views store after a new nitrate band", async () => {
    const { ids, newBand, view } = await keeperWithScenarios(1);
    const tries = SAVES + 10;
    let rerun = 0;
    for (let i = 0; i < tries; i++) {
      newBand();
      const before = runIdOf(ids[0]);
      const page = await view(ids[0]);
      expect(page.status).toBe(200);
      if (runIdOf(ids[0]) !== before) rerun++;
      else expect(page.data.error).toMatch(/Too many saves/);
    }
    expect(rerun).toBe(SAVES);
  });

  it("once saves are used up by the API, refuses the re-runs of the results and compare pages (nothing stored)", async () => {
    const { keeper, tankId, ids, newBand, view } = await keeperWithScenarios(2);
    for (let i = 0; i < SAVES; i++) {
      const made = await call(
        tankScenariosAction,
        postJson(
          `/api/tanks/${tankId}/scenarios`,
          { name: `API ${i}`, settings: { run: { lengthDays: 10 } } },
          keeper.cookie,
        ),
        { tankId: String(tankId) },
      );
      expect(made.status).toBe(201);
    }
    newBand();
    const stored = runsStored();
    const page = await view(ids[0]);
    expect(page.data.error).toMatch(/Too many saves/);
    const compare = await call(compareLoader, get(`/tanks/${tankId}/compare?s=${ids[0]}&s=${ids[1]}`, keeper.cookie), {
      tankId: String(tankId),
    });
    expect(compare.status).toBe(200);
    expect(compare.data.message).toMatch(/Too many saves/);
    expect(runsStored()).toBe(stored);
  });
});
