/**
 * The journal page's runs (replay and forecast) are the tank owner's runs in flight, and a
 * reload with nothing changed does not run the engine again (issue 14's note: a reload-heavy
 * visitor could keep the pool's interactive lane busy).
 */
import { describe, expect, it, vi } from "vitest";
import { getDb } from "~/db/client.server";
import { getEnginePool } from "~/features/jobs/engine-pool.server";
import { forgetJournalRuns } from "~/features/journal/journal-runs.server";
import { RUNS_IN_FLIGHT_PER_PERSON, resetRunGate, takeRunSlot } from "~/features/runs/run-gate.server";
import { action as pageAction, loader as pageLoader } from "~/routes/journal/journal";
import { call, get, post } from "../support/routes";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";
import { DAY, day } from "../support/journal";
import { unpackSeries } from "~/features/runs/series-packing";

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
      expect(unpackSeries(after.data.replay.packedSeries).no3).not.toEqual(
        unpackSeries(first.data.replay.packedSeries).no3,
      );
    } finally {
      runs.mockRestore();
    }
  });

  it("are kept until any write to the journal, whoever makes it: an insert, an edit and a delete in plain SQL each show", async () => {
    forgetJournalRuns();
    const { keeper, tankId } = await keeperWithJournal();
    const sql = getDb().$client;
    const version = () =>
      (sql.prepare("SELECT journal_version AS v FROM tanks WHERE id = ?").get(Number(tankId)) as { v: number }).v;
    const budgetIn = async () => (await load(tankId, keeper.cookie)).data.replay.budget.inputs.total as number;
    const before = await budgetIn();
    expect(await budgetIn()).toBe(before);
    // An ammonia dose written past the app (a script, another process): the page's replay has it.
    const v0 = version();
    const added = sql
      .prepare(
        "INSERT INTO journal_entries (tank_id, done_at, kind, details, note) VALUES (?, ?, 'ammonia_dosed', ?, '')",
      )
      .run(Number(tankId), Math.floor(Date.now() / DAY) * DAY - 3 * DAY, JSON.stringify({ ammoniaMgN: 2 }));
    expect(version()).toBe(v0 + 1);
    const dosed = await budgetIn();
    // 2 mg N/L dosed into 100 L adds 200 mg N to the inputs (our own worked example).
    expect(dosed - before).toBeCloseTo(200, 0);
    sql
      .prepare("UPDATE journal_entries SET details = ? WHERE id = ?")
      .run(JSON.stringify({ ammoniaMgN: 1 }), added.lastInsertRowid);
    expect(version()).toBe(v0 + 2);
    expect((await budgetIn()) - before).toBeCloseTo(100, 0);
    sql.prepare("DELETE FROM journal_entries WHERE id = ?").run(added.lastInsertRowid);
    expect(version()).toBe(v0 + 3);
    expect(await budgetIn()).toBe(before);
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
