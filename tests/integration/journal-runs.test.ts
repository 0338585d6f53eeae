/**
 * The journal page's runs (replay and forecast) are the tank owner's runs in flight, and a
 * reload with nothing changed does not run the engine again (issue 14's note: a reload-heavy
 * visitor could keep the pool's interactive lane busy).
 */
import { describe, expect, it, vi } from "vitest";
import { getEnginePool } from "~/features/jobs/engine-pool.server";
import { forgetJournalRuns } from "~/features/journal/journal-runs.server";
import { RUNS_IN_FLIGHT_PER_PERSON, resetRunGate, takeRunSlot } from "~/features/runs/run-gate.server";
import { action as pageAction, loader as pageLoader } from "~/routes/journal/journal";
import { call, get, post } from "../support/routes";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";
import { day } from "../support/journal";


async function keeperWithJournal() {
  const keeper = await userWithCookie();
  const tankId = String(createTank(keeper.id));
  await createScenario(keeper.id, Number(tankId), {
    water: { volumeL: 100, startNitrate: 9 },
    fish: { feedGPerDay: 0.5 },
    maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 },
    tapWater: { nitrate: 0, roShare: 0 },
  });
  await call(
    pageAction,
    post(
      `/tanks/${tankId}/journal`,
      { intent: "add", date: day(5), kind: "water_change", water_changed_percent: "40" },
      keeper.cookie,
    ),
    { tankId },
  );
  return { keeper, tankId };
}

const load = (tankId: string, cookie: string) => call(pageLoader, get(`/tanks/${tankId}/journal`, cookie), { tankId });

describe("the journal page's runs", () => {
  it("are not run again on a reload with nothing changed, and run again after a new entry", async () => {
    forgetJournalRuns();
    const { keeper, tankId } = await keeperWithJournal();
    const runs = vi.spyOn(getEnginePool(), "run");
    try {
      const first = await load(tankId, keeper.cookie);
      const ranFirst = runs.mock.calls.length;
      expect(ranFirst).toBeGreaterThanOrEqual(2); // the replay and at least one forecast run
      const again = await load(tankId, keeper.cookie);
      expect(runs.mock.calls.length).toBe(ranFirst);
      expect(again.data.replay).toEqual(first.data.replay);
      expect(again.data.forecast).toEqual(first.data.forecast);
      await call(
        pageAction,
        post(
          `/tanks/${tankId}/journal`,
          { intent: "add", date: day(2), kind: "water_change", water_changed_percent: "50" },
          keeper.cookie,
        ),
        { tankId },
      );
      const after = await load(tankId, keeper.cookie);
      expect(runs.mock.calls.length).toBeGreaterThan(ranFirst);
      expect(after.data.replay.no3).not.toEqual(first.data.replay.no3);
    } finally {
      runs.mockRestore();
    }
  });

  it("count against the owner's runs in flight: with the limit taken the page says so and runs nothing", async () => {
    forgetJournalRuns();
    resetRunGate();
    const { keeper, tankId } = await keeperWithJournal();
    const releases = [];
    for (let i = 0; i < RUNS_IN_FLIGHT_PER_PERSON; i++) releases.push(await takeRunSlot(keeper.id));
    const runs = vi.spyOn(getEnginePool(), "run");
    try {
      const busy = await load(tankId, keeper.cookie);
      expect(runs.mock.calls.length).toBe(0);
      expect(busy.data.replay).toBeNull();
      expect(busy.data.problem).toMatch(/model runs going/);
      for (const release of releases) release();
      const free = await load(tankId, keeper.cookie);
      expect(free.data.problem).toBeNull();
      expect(free.data.replay).not.toBeNull();
    } finally {
      runs.mockRestore();
      resetRunGate();
    }
  }, 20_000);

  it("waits for a slot the person's last page is about to give back, instead of refusing at once", async () => {
    forgetJournalRuns();
    resetRunGate();
    const { keeper, tankId } = await keeperWithJournal();
    const releases: (() => void)[] = [];
    for (let i = 0; i < RUNS_IN_FLIGHT_PER_PERSON; i++) releases.push(await takeRunSlot(keeper.id));
    // The runs of a page just left finish a moment later.
    const freed = setTimeout(() => releases.forEach((release) => release()), 400);
    try {
      const page = await load(tankId, keeper.cookie);
      expect(page.data.problem).toBeNull();
      expect(page.data.replay).not.toBeNull();
    } finally {
      clearTimeout(freed);
      resetRunGate();
    }
  });
});
