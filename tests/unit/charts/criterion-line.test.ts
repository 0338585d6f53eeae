/**
 * The two TAN caution lines follow the run's pH: at each sample they are the long-term (chronic)
 * and short-term (acute) criteria of US EPA (2013), "Aquatic Life Ambient Water Quality Criteria
 * for Ammonia — Freshwater", EPA 822-R-13-001 (docs/sources.md §2), at that sample's pH, so the
 * chart agrees with the warning, which checks every solver step at the pH of that step.
 */
import { describe, expect, it } from "vitest";
import { ammoniaCriteria, getPreset, ScenarioSchema, simulate } from "~models";
import { speciesFactor } from "~models/units";
import { tanCriterionLines } from "~/features/runs/criterion-line";
import { packedResultsPayload, resultsPayload } from "~/features/runs/results.server";
import { unpackSeries } from "~/features/runs/series-packing";
import type { StoredRun } from "~/features/runs/simulation.server";
import { DEFAULT_PREFERENCES, displayUnitsFor } from "~/utils/display-units";

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe("the TAN criterion lines", () => {
  const ph = [8.5, 8, 7.5, 7, 6.5];
  const { longTerm, shortTerm } = tanCriterionLines({ t: [0, 1, 2, 3, 4], ph }, 8.5, 20);

  it("are the chronic and acute criteria at each sample's pH as pH falls", () => {
    ph.forEach((p, k) => {
      expect(longTerm[k]).toBe(ammoniaCriteria(p, 20).chronicTanMgNPerL);
      expect(shortTerm[k]).toBe(ammoniaCriteria(p, 20).acuteTanMgNPerL);
    });
    // A falling pH leaves more of the ammonia ionised: both lines rise.
    for (let k = 1; k < ph.length; k++) {
      expect(longTerm[k]).toBeGreaterThan(longTerm[k - 1]);
      expect(shortTerm[k]).toBeGreaterThan(shortTerm[k - 1]);
    }
    // US EPA 2013 (docs/sources.md §2): at pH 7 and 20 °C the chronic criterion is 1.9 mg TAN/L
    // and the acute 17 (two figures)
    expect(rel(longTerm[3], 1.9)).toBeLessThan(0.03);
    expect(rel(shortTerm[3], 17)).toBeLessThan(0.03);
  });

  it("keep the long-term limit below the short-term criterion", () => {
    // US EPA 2013 (docs/sources.md §2): the 30-day limit is the more protective one
    ph.forEach((_p, k) => expect(longTerm[k]).toBeLessThan(shortTerm[k]));
  });

  it("stay at the scenario's pH for a series stored without pH per sample", () => {
    // US EPA 2013 (docs/sources.md §2): the same function at the one pH there is
    const lines = tanCriterionLines({ t: [0, 1, 2] }, 7, 20);
    expect(lines.longTerm).toEqual([0, 1, 2].map(() => ammoniaCriteria(7, 20).chronicTanMgNPerL));
    expect(lines.shortTerm).toEqual([0, 1, 2].map(() => ammoniaCriteria(7, 20).acuteTanMgNPerL));
  });
});

// A new filter at pH 7 with little KH: nitrification eats the KH and pH falls below 6.5, then
// the water changes bring KH back and pH climbs above where it started.
const base = getPreset("first-light-fishless")!.scenario;
const scenario = ScenarioSchema.parse({
  ...base,
  water: { ...base.water, pH: 7, khDkh: 1, phFollowsKh: true, temperatureC: 26 },
});
const result = simulate(scenario);
const run: StoredRun = {
  id: 1,
  scenarioId: 1,
  settingsHash: "criterion-line-test",
  engineVersion: result.engineVersion,
  keyFigures: result.keyFigures,
  budget: result.budget,
  events: result.events,
  series: result.series,
  stats: result.stats,
  findings: {
    warnings: result.warnings,
    lowOxygenZones: result.lowOxygenZones,
    ammoniaCriteria: result.ammoniaCriteria,
  },
  createdAt: new Date(0),
};
const units = displayUnitsFor(DEFAULT_PREFERENCES);
const factor = speciesFactor("ammonia", units);

describe("the results payload's TAN criteria", () => {
  const payload = resultsPayload(run, scenario, units);
  const longTerm = payload.series.tanLongTerm!;
  const shortTerm = payload.series.tanShortTerm!;
  const ph = result.series.ph;

  it("follow the run's pH sample by sample, in the viewer's units", () => {
    expect(Math.min(...ph)).toBeLessThan(6.5);
    expect(longTerm).toHaveLength(payload.series.t.length);
    expect(shortTerm).toHaveLength(payload.series.t.length);
    ph.forEach((p, k) => {
      // US EPA 2013 (docs/sources.md §2), the function the warnings use, at this sample's pH
      const c = ammoniaCriteria(p, 26);
      expect(rel(longTerm[k], c.chronicTanMgNPerL * factor)).toBeLessThan(1e-3);
      expect(rel(shortTerm[k], c.acuteTanMgNPerL * factor)).toBeLessThan(1e-3);
      // The long-term limit is the lower line everywhere.
      expect(longTerm[k]).toBeLessThan(shortTerm[k]);
    });
    // Not flat lines at the starting pH.
    expect(Math.max(...longTerm) / Math.min(...longTerm)).toBeGreaterThan(2);
    expect(Math.max(...shortTerm) / Math.min(...shortTerm)).toBeGreaterThan(3);
    // The owner's results page gets them packed; they must come back the same.
    const unpacked = unpackSeries(packedResultsPayload(payload).packedSeries);
    expect(unpacked.tanLongTerm).toEqual(longTerm);
    expect(unpacked.tanShortTerm).toEqual(shortTerm);
  });

  it("has TAN above the drawn short-term line where the warning says it is above the short-term criterion", () => {
    const warning = payload.warnings.find((w) => w.code === "ammoniaAboveAcuteCriterion");
    expect(warning?.text).toMatch(/(above|twice|times) the short-term criterion at that day's pH/);
    const above = payload.series.tan.filter((v, k) => v > shortTerm[k]);
    expect(above.length).toBeGreaterThan(0);
    // The drift is what shows it: a line flat at the starting pH would have stayed above every sample.
    const flat = ammoniaCriteria(7, 26).acuteTanMgNPerL * factor;
    expect(payload.series.tan.every((v) => v <= flat)).toBe(true);
  });
});
