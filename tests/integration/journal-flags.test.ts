/**
 * The tank list and the tank page flag what the journal's replay found (the keeper's real tank),
 * not only the scenario's idealised timetable: a logged ammonia dose that harms fish shows on the
 * first screen. The findings are kept per journal version, recomputed after a change, go with
 * the tank, and a refused replay says "open the journal" on a page that still loads.
 */
import { createElement } from "react";
import { renderToString } from "react-dom/server";
import { createRoutesStub } from "react-router";
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { scenarios, tanks } from "~/db/schema";
import { journalFindings } from "~/db/schema-care";
import { JournalFlagNote } from "~/components/journal-flag";
import type { JournalFlag } from "~/features/journal/journal-flag";
import { journalFlags } from "~/features/journal/journal-findings.server";
import { forgetJournalRuns } from "~/features/journal/journal-runs.server";
import { readStoredSettings } from "~/features/runs/simulation.server";
import { saveScenarioWithRun } from "~/features/scenarios/scenario-api.server";
import { RUNS_IN_FLIGHT_PER_PERSON, resetRunGate, takeRunSlot } from "~/features/runs/run-gate.server";
import { loader as journalLoader } from "~/routes/journal/journal";
import { loader as listLoader } from "~/routes/tanks/list";
import { action as tankAction, loader as tankLoader } from "~/routes/tanks/detail";
import { call, get, post } from "../support/routes";
import { addThroughPage, DAY, day, tankAtPh8 } from "../support/journal";
import { createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";

type ListedTank = { id: number; name: string; journal: JournalFlag };

async function listed(cookie: string): Promise<ListedTank[]> {
  const page = await call(listLoader, get("/tanks", cookie));
  expect(page.status).toBe(200);
  return page.data.tanks;
}
const journalOf = async (cookie: string, tankId: string) =>
  (await listed(cookie)).find((t) => String(t.id) === tankId)!.journal;

const findings = (tankId: string) =>
  getDb()
    .select()
    .from(journalFindings)
    .where(eq(journalFindings.tankId, Number(tankId)))
    .get();
const versionOf = (tankId: string) =>
  getDb()
    .select({ v: tanks.journalVersion })
    .from(tanks)
    .where(eq(tanks.id, Number(tankId)))
    .get()!.v;

/** The flag as the page shows it (our own check of the markup). */
function flagHtml(tankId: string, flag: JournalFlag): string {
  const Stub = createRoutesStub([
    { path: "/", Component: () => createElement(JournalFlagNote, { tankId: Number(tankId), flag, perView: 3 }) },
  ]);
  return renderToString(createElement(Stub, { initialEntries: ["/"] }));
}

// Emerson et al. 1975: about 10 % of TAN is free NH3 at pH 8.2 and 28 °C, so a dose of 4 mg/L
// lifts free ammonia far above the 0.02 mg/L NH3 caution line (common practice, no source).
const FREE_AMMONIA = "Journal replay: free ammonia above the caution line";

describe("the journal replay's findings on the tank list and the tank page", () => {
  it("a logged ammonia dose is flagged on the list and the tank page; a quiet journal is not", async () => {
    const keeper = await userWithCookie();
    const dosed = await tankAtPh8(keeper, "Dosed tank");
    await dosed.log({ date: day(10), kind: "water_change", water_changed_percent: 30 });
    await dosed.log({ date: day(3), kind: "ammonia_dosed", ammonia_n_mg_l: 4 });
    const quiet = await tankAtPh8(keeper, "Quiet tank");
    await quiet.log({ date: day(10), kind: "water_change", water_changed_percent: 30 });
    await quiet.log({ date: day(3), kind: "water_change", water_changed_percent: 30 });

    const list = await listed(keeper.cookie);
    const flagOf = (id: string) => list.find((t) => String(t.id) === id)!.journal;
    const hot = flagOf(dosed.tankId);
    expect(hot).toMatchObject({ state: "found", dangers: expect.arrayContaining([FREE_AMMONIA]) });
    expect(flagHtml(dosed.tankId, hot)).toContain(`href="/tanks/${dosed.tankId}/journal"`);
    // our own worked example: water changes alone cross no line
    expect(flagOf(quiet.tankId)).toEqual({ state: "found", dangers: [] });
    expect(flagHtml(quiet.tankId, flagOf(quiet.tankId))).toBe("");
    expect(findings(dosed.tankId)).toMatchObject({
      journalVersion: versionOf(dosed.tankId),
      freeNh3AboveCaution: true,
    });
    expect(findings(dosed.tankId)!.warningCodes).toContain("freeAmmoniaAboveCaution");

    const tankPage = await call(tankLoader, get(`/tanks/${dosed.tankId}`, keeper.cookie), { tankId: dosed.tankId });
    expect(tankPage.data.journal).toMatchObject({ state: "found", dangers: expect.arrayContaining([FREE_AMMONIA]) });
  });

  it("a new entry makes the list replay the journal again: the findings follow its version", async () => {
    const { keeper, tankId, log } = await tankAtPh8();
    await log({ date: day(10), kind: "water_change", water_changed_percent: 30 });
    expect(await journalOf(keeper.cookie, tankId)).toEqual({ state: "found", dangers: [] });
    const before = findings(tankId)!.journalVersion;
    // Through the journal page's form, in the keeper's units (mg/L NH3): about 3.3 mg N/L.
    const added = await addThroughPage(tankId, keeper.cookie, {
      date: day(2),
      kind: "ammonia_dosed",
      ammonia_n_mg_l: "4",
    });
    expect(added.status).toBe(200);
    expect(versionOf(tankId)).toBeGreaterThan(before);
    // The journal page's own replay keeps its findings too.
    expect((await call(journalLoader, get(`/tanks/${tankId}/journal`, keeper.cookie), { tankId })).status).toBe(200);
    expect(findings(tankId)).toMatchObject({ journalVersion: versionOf(tankId), freeNh3AboveCaution: true });
    expect(await journalOf(keeper.cookie, tankId)).toMatchObject({ dangers: expect.arrayContaining([FREE_AMMONIA]) });
    expect(findings(tankId)!.journalVersion).toBe(versionOf(tankId));
  });

  it("a scenario edit makes the kept findings stale: the list replays on the edited plan", async () => {
    const { keeper, tankId, log } = await tankAtPh8();
    await log({ date: day(3), kind: "ammonia_dosed", ammonia_n_mg_l: 4 });
    expect(await journalOf(keeper.cookie, tankId)).toMatchObject({ dangers: expect.arrayContaining([FREE_AMMONIA]) });
    const before = findings(tankId)!;
    // The keeper measures again and finds pH 6.5: the same dose is far less toxic. Emerson et al.
    // 1975: at pH 6.5 and 28 °C about 0.2 % of TAN is free NH3, so about 3.3 mg N/L of TAN gives
    // under 0.01 mg/L NH3, below the 0.02 mg/L caution line (common practice, no source).
    const row = getDb()
      .select()
      .from(scenarios)
      .where(eq(scenarios.tankId, Number(tankId)))
      .get()!;
    const tank = getDb()
      .select()
      .from(tanks)
      .where(eq(tanks.id, Number(tankId)))
      .get()!;
    const settings = readStoredSettings(row.settings)!;
    await saveScenarioWithRun(tank, row.id, row.name, { ...settings, water: { ...settings.water, pH: 6.5 } });
    // The journal did not change, so its version alone would keep the old, now wrong, flag.
    expect(versionOf(tankId)).toBe(before.journalVersion);
    const after = await journalOf(keeper.cookie, tankId);
    expect(after).toMatchObject({ state: "found" });
    expect(after && "dangers" in after ? after.dangers : []).not.toContain(FREE_AMMONIA);
    expect(findings(tankId)!.settingsHash).not.toBe(before.settingsHash);
    // The tank page says the same.
    const tankPage = await call(tankLoader, get(`/tanks/${tankId}`, keeper.cookie), { tankId });
    expect(tankPage.data.journal).toEqual(after);
  });

  it("findings from an earlier day are replayed again (the replay runs to today)", async () => {
    const { keeper, tankId, log } = await tankAtPh8();
    await log({ date: day(3), kind: "water_change", water_changed_percent: 30 });
    await listed(keeper.cookie);
    const first = findings(tankId)!.computedAt.getTime();
    const tank = getDb()
      .select()
      .from(tanks)
      .where(eq(tanks.id, Number(tankId)))
      .get()!;
    // The same day: kept, no replay.
    await journalFlags([tank], first + 1000);
    expect(findings(tankId)!.computedAt.getTime()).toBe(first);
    // The next day: replayed and kept again.
    const flags = await journalFlags([tank], first + DAY);
    expect(flags.get(tank.id)).toEqual({ state: "found", dangers: [] });
    expect(findings(tankId)!.computedAt.getTime()).toBe(first + DAY);
  });

  it("replays at most three journals a view and says so for the rest", async () => {
    const keeper = await userWithCookie();
    for (const name of ["Tank A", "Tank B", "Tank C", "Tank D"]) {
      const { log } = await tankAtPh8(keeper, name);
      await log({ date: day(4), kind: "water_change", water_changed_percent: 30 });
    }
    // A journal with no scenario to replay on is not flagged and uses none of the view's replays.
    const bare = String(createTank(keeper.id, "A tank without a scenario"));
    await addThroughPage(bare, keeper.cookie, { date: day(4), kind: "water_change", water_changed_percent: "30" });
    const first = (await listed(keeper.cookie)).slice(1);
    expect(first.map((t) => t.journal?.state)).toEqual(["found", "found", "found", "later"]);
    expect(flagHtml(String(first[3].id), first[3].journal)).toMatch(
      /at most 3 journals a view.*open the journal to replay it/,
    );
    const second = await listed(keeper.cookie);
    expect(second.map((t) => t.journal?.state ?? null)).toEqual([null, "found", "found", "found", "found"]);
  });

  it("deleting the tank deletes its findings", async () => {
    const { keeper, tankId, log } = await tankAtPh8();
    await log({ date: day(3), kind: "water_change", water_changed_percent: 30 });
    await listed(keeper.cookie);
    expect(findings(tankId)).toBeDefined();
    const done = await call(
      tankAction,
      post(`/tanks/${tankId}`, { intent: "delete-tank", confirm: "yes" }, keeper.cookie),
      {
        tankId,
      },
    );
    expect(done.status).toBe(302);
    expect(findings(tankId)).toBeUndefined();
  });

  it("with the run gate refusing, the list still loads and says to open the journal", async () => {
    forgetJournalRuns();
    resetRunGate();
    const { keeper, tankId, log } = await tankAtPh8();
    await log({ date: day(3), kind: "ammonia_dosed", ammonia_n_mg_l: 4 });
    const other = await tankAtPh8(keeper, "Another tank");
    await other.log({ date: day(3), kind: "water_change", water_changed_percent: 30 });
    const releases: (() => void)[] = [];
    for (let i = 0; i < RUNS_IN_FLIGHT_PER_PERSON; i++) releases.push(await takeRunSlot(keeper.id));
    try {
      const started = Date.now();
      const list = await listed(keeper.cookie);
      // One wait for a slot (the gate's five seconds), not one a tank.
      expect(Date.now() - started).toBeLessThan(9_000);
      const refused = list.find((t) => String(t.id) === tankId)!.journal;
      expect(refused).toEqual({ state: "refused" });
      expect(list.find((t) => String(t.id) === other.tankId)!.journal).toEqual({ state: "refused" });
      expect(flagHtml(tankId, refused)).toMatch(/open the journal to replay it/);
      expect(findings(tankId)).toBeUndefined();
    } finally {
      releases.forEach((release) => release());
      resetRunGate();
    }
    expect(await journalOf(keeper.cookie, tankId)).toMatchObject({ dangers: expect.arrayContaining([FREE_AMMONIA]) });
  }, 20_000);
});
