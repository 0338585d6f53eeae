/**
 * Calibration says "no good fit" when the model cannot follow the readings, instead of calling
 * a multiplier determined: readings that jump (an event the model was not told of), readings
 * in another unit, readings no run can reach. A fit to such readings still finds *a* best point,
 * and without a check of the fit its likelihood ranges look as narrow as a real fit's.
 * The truths and readings are our own worked examples (fitting data made by the model itself,
 * Raue et al. 2009; docs/sources.md §17).
 */
import { describe, expect, it } from "vitest";
import {
  calibrateMultipliers,
  observe,
  runsZ,
  withMultipliers,
  type CalibrationReading,
  type Kits,
  type MultiplierKey,
} from "../../models/nitrogen/calibrate";
import { N_FRACTION } from "../../models/nitrogen/chemistry";
import { DAYS, normalNoise, PLANTED_120, predictIn } from "./calibration-cases";

const EXACT: Kits = { tan: { kind: "exact" }, no2: { kind: "exact" }, no3: { kind: "exact" } };
const FIT: MultiplierKey[] = ["feedLoad", "plantUptake"];
const TRUTH = observe(withMultipliers(PLANTED_120, { feedLoad: 1.3, plantUptake: 0.7 }), DAYS).samples;

const fitOf = (readings: CalibrationReading[]) =>
  calibrateMultipliers({ scenario: PLANTED_120, readings, fit: FIT, kits: EXACT, predict: predictIn(DAYS) });
const determined = (r: Awaited<ReturnType<typeof fitOf>>) =>
  r.multipliers.filter((m) => m.fitted && m.verdict?.determined).map((m) => m.key);

describe("the runs test", () => {
  it("matches the Wald–Wolfowitz mean and variance of the number of runs", () => {
    // Draper & Smith 1998 §7.1 (from memory): μ = 2n₁n₂/n + 1, σ² = 2n₁n₂(2n₁n₂ − n)/(n²(n − 1)).
    // Ten of each sign in two blocks: 2 runs, μ = 11, σ² = 36000/7600, z = −9/√4.7368 = −4.135.
    const blocks = [...Array(10).fill(1), ...Array(10).fill(-1)];
    expect(runsZ(blocks)).toBeCloseTo(-4.135, 3);
    // Alternating signs: 20 runs, z = +9/√4.7368 = +4.135 (too many runs is not a lack of fit).
    expect(runsZ(blocks.map((_v, i) => (i % 2 ? 1 : -1)))).toBeCloseTo(4.135, 3);
  });
});

describe("calibration says when no multiplier explains the readings", () => {
  it("a control: readings from a known truth, with 5 % noise, fit well and feed load is determined", async () => {
    const n = normalNoise(11);
    const r = await fitOf(DAYS.map((day, i) => ({ day, no3: TRUTH.no3[i] * (1 + 0.05 * n()) })));
    expect(r.quality.good).toBe(true);
    expect(determined(r)).toContain("feedLoad");
  }, 60_000);

  it("nitrate that jumps by 15 mg N/L from day 45 (a dose the model was not told of): no good fit, nothing determined", async () => {
    const r = await fitOf(DAYS.map((day, i) => ({ day, no3: TRUTH.no3[i] + (day > 45 ? 15 : 0) })));
    expect(r.quality).toMatchObject({ good: false, reason: "systematic", species: "no3", readingsAbove: true });
    // The stretch named is the one after the jump (the first reading after day 45 is day 46.35).
    if (!r.quality.good && r.quality.reason === "systematic") expect(r.quality.from).toBeGreaterThan(45);
    expect(determined(r)).toEqual([]);
    const feed = r.multipliers.find((m) => m.key === "feedLoad")!;
    expect(feed.verdict!.reason).toBe("poorFit");
    // No range narrower than "anything the model allows" is claimed for it.
    expect([feed.low95, feed.high95, feed.lowOpen, feed.highOpen]).toEqual([0.1, 10, true, true]);
    expect(r.qualityText).toMatch(/No good fit.*nitrate.*above/);
  }, 60_000);

  it("nitrate read in mg/L NO3 but stored as NO3-N (4.43× too high): no good fit, nothing determined", async () => {
    // 1 mg/L NO3 is 0.2259 mg N/L (docs/sources.md §0): the number typed is 1/0.2259 = 4.43× too high.
    const r = await fitOf(DAYS.map((day, i) => ({ day, no3: TRUTH.no3[i] / N_FRACTION.NO3 })));
    expect(r.quality.good).toBe(false);
    expect(determined(r)).toEqual([]);
  }, 60_000);

  it("nitrate, ammonia and nitrite all read 0 (no run of a fed tank gets there): no good fit", async () => {
    const r = await fitOf(DAYS.map((day) => ({ day, tan: 0, no2: 0, no3: 0 })));
    expect(r.quality.good).toBe(false);
    expect(determined(r)).toEqual([]);
  }, 60_000);
});
