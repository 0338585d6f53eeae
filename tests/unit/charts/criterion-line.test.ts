/**
 * The TAN caution line follows the run's pH: at each sample it is the short-term (acute)
 * criterion of US EPA (2013), "Aquatic Life Ambient Water Quality Criteria for Ammonia —
 * Freshwater", EPA 822-R-13-001 (docs/sources.md §2), at that sample's pH, so the chart agrees
 * with the warning, which checks every solver step at the pH of that step.
 */
import { describe, expect, it } from "vitest";
import { ammoniaCriteria, getPreset, ScenarioSchema, simulate } from "~models";
import { speciesFactor } from "~models/units";
import { acuteCriterionLine } from "~/features/runs/criterion-line";
import { packedResultsPayload, resultsPayload } from "~/features/runs/results.server";
import { unpackSeries } from "~/features/runs/series-packing";
import type { StoredRun } from "~/features/runs/simulation.server";
import { DEFAULT_PREFERENCES, displayUnitsFor } from "~/utils/display-units";

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe("the TAN criterion line", () => {
  it("is the acute criterion at each sample's pH as pH falls", () => {
    const ph = [8.5, 8, 7.5, 7, 6.5];
    const line = acuteCriterionLine({ t: [0, 1, 2, 3, 4], ph }, 8.5, 20);
    ph.forEach((p, k) => expect(line[k]).toBe(ammoniaCriteria(p, 20).acuteTanMgNPerL));
    // A falling pH leaves more of the ammonia ionised: the line rises.
    for (let k = 1; k < line.length; k++) expect(line[k]).toBeGreaterThan(line[k - 1]);
    // US EPA 2013 (docs/sources.md §2): acute criterion 17 mg TAN/L at pH 7 and 20 °C (two figures)
    expect(rel(line[3], 17)).toBeLessThan(0.03);
  });

  it("stays at the scenario's pH for a series stored without pH per sample", () => {
    // US EPA 2013 (docs/sources.md §2): the same function at the one pH there is
    const line = acuteCriterionLine({ t: [0, 1, 2] }, 7, 20);
    expect(line).toEqual([0, 1, 2].map(() => ammoniaCriteria(7, 20).acuteTanMgNPerL));
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

describe("the results payload's TAN criterion", () => {
  const payload = resultsPayload(run, scenario, units);
  const drawn = payload.series.tanCriterion!;
  const ph = result.series.ph;

  it("follows the run's pH sample by sample, in the viewer's units", () => {
    expect(Math.min(...ph)).toBeLessThan(6.5);
    expect(drawn).toHaveLength(payload.series.t.length);
    ph.forEach((p, k) => {
      // US EPA 2013 (docs/sources.md §2), the function the warnings use, at this sample's pH
      const expected = ammoniaCriteria(p, 26).acuteTanMgNPerL * factor;
      expect(rel(drawn[k], expected)).toBeLessThan(1e-3);
    });
    // Not a flat line at the starting pH.
    expect(Math.max(...drawn) / Math.min(...drawn)).toBeGreaterThan(3);
    // The owner's results page gets it packed; it must come back the same.
    expect(unpackSeries(packedResultsPayload(payload).packedSeries).tanCriterion).toEqual(drawn);
  });

  it("has TAN above the drawn line where the warning says it is above the short-term criterion", () => {
    const warning = payload.warnings.find((w) => w.code === "ammoniaAboveAcuteCriterion");
    expect(warning?.text).toMatch(/(above|twice|times) the short-term criterion at that day's pH/);
    const above = payload.series.tan.filter((v, k) => v > drawn[k]);
    expect(above.length).toBeGreaterThan(0);
    // The drift is what shows it: a line flat at the starting pH would have stayed above every sample.
    const flat = ammoniaCriteria(7, 26).acuteTanMgNPerL * factor;
    expect(payload.series.tan.every((v) => v <= flat)).toBe(true);
  });
});
