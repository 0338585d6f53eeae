import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { plantGroupFromForm, ScenarioSchema, simulate } from "../../models/index";
import type { Scenario } from "../../models/index";
import {
  calibrateMultipliers,
  levenbergMarquardt,
  residualScales,
  withMultipliers,
  type CalibrationReading,
  type ModelSamples,
} from "../../models/nitrogen/calibrate";

// Our own worked example: a 120 L planted community tank, 90 days, readings every third day.
// Its plants are trimmed on fixed days: trims "when full" move with the multipliers and leave
// kinks in the fit's objective, which a worked example of recovery should not depend on.
// The plants start small, so their uptake grows over the run: a plant sink that stays the same
// all along looks to nitrate exactly like less food, and (since the whole alkalinity balance
// keeps KH, and so TAN, steady) nothing else in the readings tells the two apart.
const TANK: Scenario = ScenarioSchema.parse({
  water: { volumeL: 120, temperatureC: 25, pH: 7.2, khDkh: 5, startNitrate: 3.4 },
  fish: { feedGPerDay: 1, proteinFraction: 0.42, feedsPerDay: 2, fractionEaten: 0.9 },
  plants: [
    plantGroupFromForm("stem", {
      id: "stems",
      name: "Stem plants",
      startMassG: 5,
      maxMassG: 60,
      trim: { rule: "everyDays", everyDays: 14, trimToFraction: 0.5, fullAtFraction: 0.9 },
    }),
  ],
  filter: { capacityMgTanPerDay: 600, cleaningIntervalDays: 30 },
  maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.25, gravelCleaningFraction: 0.2 },
  tapWater: { nitrate: 2.26, khDkh: 6 },
  run: { lengthDays: 90 },
});
const DAYS = Array.from({ length: 30 }, (_v, i) => 1.35 + 3 * i);

/** Model values at `days` (linear between samples; on an event day, before it), as the app's engine task reads them. */
function sample(s: Scenario, days: readonly number[]): ModelSamples {
  const r = simulate(s);
  const at = (y: number[]) =>
    days.map((d) => {
      const i = r.series.t.findIndex((t) => t >= d);
      if (r.series.t[i] === d) return y[i];
      const w = (d - r.series.t[i - 1]) / (r.series.t[i] - r.series.t[i - 1]);
      return y[i - 1] + w * (y[i] - y[i - 1]);
    });
  return { tan: at(r.series.tan), no2: at(r.series.no2), no3: at(r.series.no3) };
}

/** Seeded normal noise (Box–Muller on a linear congruential generator), so the test is repeatable. */
function noise(seed: number) {
  let x = seed;
  const u = () => ((x = (x * 1103515245 + 12345) % 2147483648) + 1) / 2147483649;
  return () => Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u());
}

function readingsFrom(s: Scenario, relativeNoise: number, seed = 7): CalibrationReading[] {
  const m = sample(s, DAYS);
  const n = noise(seed);
  return DAYS.map((day, i) => ({
    day,
    tan: m.tan[i] * (1 + relativeNoise * n()),
    no2: m.no2[i] * (1 + relativeNoise * n()),
    no3: m.no3[i] * (1 + relativeNoise * n()),
  }));
}

/** ln of a multiplier, log-uniform over 0.1–10 in steps of 0.001 decades (doubles would crowd near 0, i.e. ×1). */
const logMultiplier = fc.noBias(fc.integer({ min: -1000, max: 1000 })).map((k) => (k / 1000) * Math.LN10);

const predict = async (list: Scenario[]) => list.map((s) => sample(s, DAYS));

describe("bounded Levenberg–Marquardt", () => {
  it("solves a linear least-squares problem exactly and holds a parameter at its bound", async () => {
    // Our own worked example: r = (a − 3, b + 1, a + b − 2) has its unconstrained minimum at
    // a = 3, b = −1 (normal equations); with b ≥ 0 the constrained minimum is a = 2.5, b = 0.
    const residuals = async (points: number[][]) => points.map(([a, b]) => [a - 3, b + 1, a + b - 2]);
    const free = await levenbergMarquardt({ start: [0, 0], lower: [-10, -10], upper: [10, 10], residuals });
    expect(free.params[0]).toBeCloseTo(3, 4);
    expect(free.params[1]).toBeCloseTo(-1, 4);
    const bounded = await levenbergMarquardt({ start: [0, 1], lower: [-10, 0], upper: [10, 10], residuals });
    expect(bounded.params[0]).toBeCloseTo(2.5, 4);
    expect(bounded.params[1]).toBe(0);
    expect(bounded.atBound).toEqual([false, true]);
  });
});

describe("calibration of the model's multipliers", () => {
  it("weighs each species on its own scale, never below a test kit's resolution", () => {
    // common practice, no source: kit steps of about 0.2 mg N/L ammonia, 0.075 nitrite, 1.13 nitrate
    const s = residualScales([
      { day: 1, tan: 0, no3: 4 },
      { day: 2, tan: 0, no3: 3 },
    ]);
    expect(s.tan).toBe(0.2);
    expect(s.no2).toBe(0.075);
    expect(s.no3).toBeCloseTo(Math.sqrt((16 + 9) / 2), 12);
  });

  it("recovers feed load 1.3, plant uptake 0.7 and filter capacity 1.0 from noisy engine readings within 5 %", async () => {
    // Our own worked example: readings made by the engine with known multipliers, 2 % noise.
    const truth = { feedLoad: 1.3, plantUptake: 0.7, nitrifierCapacity: 1.0 };
    const readings = readingsFrom(withMultipliers(TANK, truth), 0.02);
    const fit = await calibrateMultipliers({
      scenario: TANK,
      readings,
      fit: ["feedLoad", "plantUptake", "nitrifierCapacity"],
      predict,
    });
    for (const m of fit.multipliers) {
      expect(Math.abs(m.value / truth[m.key] - 1), m.key).toBeLessThan(0.05);
      // the truth lies within the reported 95 % range
      expect(m.low95!, m.key).toBeLessThan(truth[m.key]);
      expect(m.high95!, m.key).toBeGreaterThan(truth[m.key]);
    }
    expect(fit.rmseAfter.no3!).toBeLessThan(fit.rmseBefore.no3! / 3);
    expect(fit.weightedRmseAfter).toBeLessThan(fit.weightedRmseBefore);
    expect(fit.converged).toBe(true);
  });

  it("over random multipliers within bounds, reproduces noise-free engine readings and finds the feed load", async () => {
    // Our own property: the model can always fit its own output; feed load is the best-determined multiplier.
    await fc.assert(
      fc.asyncProperty(
        // Log-uniform over the schema's bounds 0.1–10, without fast-check's bias towards 0 (×1, the start).
        fc.record({
          feedLoad: logMultiplier,
          plantUptake: logMultiplier,
          nitrifierCapacity: logMultiplier,
        }),
        async (logs) => {
          const truth = {
            feedLoad: Math.exp(logs.feedLoad),
            plantUptake: Math.exp(logs.plantUptake),
            nitrifierCapacity: Math.exp(logs.nitrifierCapacity),
          };
          const readings = readingsFrom(withMultipliers(TANK, truth), 0);
          const fit = await calibrateMultipliers({
            scenario: TANK,
            readings,
            fit: ["feedLoad", "plantUptake", "nitrifierCapacity"],
            predict,
          });
          expect(fit.weightedRmseAfter).toBeLessThanOrEqual(fit.weightedRmseBefore);
          expect(fit.weightedRmseAfter).toBeLessThan(0.02);
          const feed = fit.multipliers.find((m) => m.key === "feedLoad")!;
          expect(Math.abs(feed.value / truth.feedLoad - 1)).toBeLessThan(0.05);
        },
      ),
      { numRuns: 8, seed: 20260301 },
    );
  });

  it("refuses to fit more multipliers than there are measured values", async () => {
    await expect(
      calibrateMultipliers({
        scenario: TANK,
        readings: [{ day: 3, no3: 3 }],
        fit: ["feedLoad", "plantUptake"],
        predict,
      }),
    ).rejects.toThrow(/needs more than 2 measured values/);
  });
});
