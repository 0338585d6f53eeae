/**
 * The journal's "as it happened" chart is the results page's chart: a logged ammonia dose that
 * crosses the long-term TAN criterion shows as the TAN curve over the criterion line drawn at the
 * replay's pH, with the dose marked, and the keeper's readings of any species as points.
 */
import { describe, expect, it } from "vitest";
import { getDb } from "~/db/client.server";
import { readings } from "~/db/schema";
import { unpackSeries } from "~/features/runs/series-packing";
import { action as journalApiPost } from "~/routes/api/tank-journal";
import { loader as pageLoader } from "~/routes/journal/journal";
import { DEFAULT_PREFERENCES, displayUnitsFor, unitLabels } from "~/utils/display-units";
import { call, get, postJson } from "../support/routes";
import { createScenario, createTank } from "../support/tanks";
import { userWithCookie } from "../support/users";
import { DAY, day } from "../support/journal";
import { today } from "../support/journal-days";

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);
const units = displayUnitsFor(DEFAULT_PREFERENCES);
// A new keeper reads ammonia as NH3: NH3 = 14.007 + 3 × 1.008 = 17.031 g/mol per 14.007 g N
// (IUPAC atomic weights, docs/sources.md §0).
const perMgN = 17.031 / 14.007;

/** A tank held at pH 7 and 20 °C (pH not following KH), fed lightly, with a 4 mg N/L ammonia dose logged three days ago. */
async function dosedTankAtPh7() {
  const keeper = await userWithCookie();
  const tankId = String(createTank(keeper.id));
  await createScenario(keeper.id, Number(tankId), {
    water: { volumeL: 100, startNitrate: 5, pH: 7, temperatureC: 20, phFollowsKh: false },
    fish: { feedGPerDay: 0.5 },
    maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 },
    tapWater: { nitrate: 0, roShare: 0 },
  });
  for (const entry of [
    { date: day(10), kind: "water_change", water_changed_percent: 30 },
    { date: day(3), kind: "ammonia_dosed", ammonia_n_mg_l: 4 },
  ]) {
    const r = await call(journalApiPost, postJson(`/api/tanks/${tankId}/journal`, entry, keeper.cookie), { tankId });
    expect(r.status).toBe(201);
  }
  return { keeper, tankId };
}

describe("the journal replay's chart", () => {
  it("draws the TAN curve crossing the long-term criterion line, drawn at the replay's pH, with the dose marked", async () => {
    const { keeper, tankId } = await dosedTankAtPh7();
    const page = await call(pageLoader, get(`/tanks/${tankId}/journal`, keeper.cookie), { tankId });
    expect(page.status).toBe(200);
    const replay = page.data.replay;
    expect(replay.labels.ammonia).toBe(unitLabels(units).ammonia);
    expect(replay.labels.ammonia).toMatch(/NH3/);
    const s = unpackSeries(replay.packedSeries);
    expect(s.tanLongTerm).toHaveLength(s.t.length);
    expect(s.tanShortTerm).toHaveLength(s.t.length);
    // US EPA 2013 (docs/sources.md §2): at pH 7 and 20 °C the long-term (chronic) criterion is
    // 1.9 mg TAN-N/L and the short-term (acute) 17 (two figures)
    for (const v of s.tanLongTerm!) expect(rel(v / perMgN, 1.9)).toBeLessThan(0.03);
    for (const v of s.tanShortTerm!) expect(rel(v / perMgN, 17)).toBeLessThan(0.03);
    // 4 mg N/L of TAN dosed into the water is over the 1.9 line just after the dose (mass balance):
    // the curve crosses the line on the dose's day, and stays below it before.
    const doseDay = (today() - 3 * DAY - replay.startMs) / DAY;
    const over = s.t.flatMap((t, k) => (s.tan[k] > s.tanLongTerm![k] ? [t] : []));
    expect(over.length).toBeGreaterThan(0);
    expect(Math.min(...over)).toBeGreaterThanOrEqual(doseDay);
    expect(Math.min(...over)).toBeLessThan(doseDay + 1);
    expect(replay.events.filter((e: { kind: string }) => e.kind === "dose")).toHaveLength(1);
    // The flat caution lines, as on a results page: free ammonia 0.02 mg/L NH3 and nitrite
    // 0.1 mg/L NO2-N (common practice, no source), the latter as NO2: × 46.005 / 14.007 (IUPAC
    // atomic weights, docs/sources.md §0)
    expect(replay.guides.freeAmmoniaCaution).toBeCloseTo(0.02, 6);
    expect(replay.guides.nitriteCaution).toBeCloseTo((0.1 * 46.005) / 14.007, 3);
    expect(replay.guides.nitrateBand.high).toBeGreaterThan(replay.guides.nitrateBand.low);
    // A reload with nothing changed reuses the chart made from the kept replay.
    const again = await call(pageLoader, get(`/tanks/${tankId}/journal`, keeper.cookie), { tankId });
    expect(again.data.replay.packedSeries).toBe(replay.packedSeries);
  });

  it("draws a reading of ammonia alone as a point, in the person's unit", async () => {
    const { keeper, tankId } = await dosedTankAtPh7();
    getDb()
      .insert(readings)
      .values({ tankId: Number(tankId), takenAt: new Date(today() - 2 * DAY + 9 * 3_600_000), tan: 1.5 })
      .run();
    const page = await call(pageLoader, get(`/tanks/${tankId}/journal`, keeper.cookie), { tankId });
    const points = page.data.replay.readings as { day: number; tan?: number | null; no3?: number | null }[];
    expect(points).toHaveLength(1);
    expect(points[0].no3).toBeNull();
    // 1.5 mg N/L as NH3 (docs/sources.md §0)
    expect(points[0].tan).toBeCloseTo(1.5 * perMgN, 4);
    expect(page.data.replay.readingsTotal).toBe(1);
  });
});
