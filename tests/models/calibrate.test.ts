import { describe, expect, it } from "vitest";
import {
  calibrateMultipliers,
  inferKit,
  levenbergMarquardt,
  negLogLikelihood,
  observationsOf,
  observe,
  pseudoResiduals,
  readingInterval,
  withMultipliers,
  type Kit,
} from "../../models/nitrogen/calibrate";
import { logPhi, logPhiDifference } from "../../models/nitrogen/calibration/normal";
import { rangeThreshold, studentT975 } from "../../models/nitrogen/calibration/threshold";
import { DAYS, MOSSBANK, PLANTED_120, predictIn } from "./calibration-cases";

import { toCanonical } from "../../models/units";

// mg N/L per mg/L NH3 and NO3, as readings are stored (docs/sources.md §0: × 0.82244 and × 0.22590).
const NH3 = toCanonical("ammonia", 1, "asNH3");
const NO3 = toCanonical("nitrate", 1, "asNO3");

describe("bounded Levenberg–Marquardt", () => {
  it("solves a linear least-squares problem exactly and holds a parameter at its bound", async () => {
    // Our own worked example: r = (a − 3, b + 1, a + b − 2) has its unconstrained minimum at
    // a = 3, b = −1 (normal equations); with b ≥ 0 the constrained minimum is a = 2.5, b = 0.
    const residuals = async (points: number[][]) => points.map(([a, b]) => [a - 3, b + 1, a + b - 2]);
    const free = await levenbergMarquardt({ start: [0, 0], lower: [-10, -10], upper: [10, 10], residuals });
    expect(free.params[0]).toBeCloseTo(3, 6);
    expect(free.params[1]).toBeCloseTo(-1, 6);
    expect(free.converged).toBe(true);
    const bounded = await levenbergMarquardt({ start: [0, 1], lower: [-10, 0], upper: [10, 10], residuals });
    expect(bounded.params[0]).toBeCloseTo(2.5, 6);
    expect(bounded.params[1]).toBe(0);
    expect(bounded.atBound).toEqual([false, true]);
  });

  it("goes on down Rosenbrock's curved valley instead of stopping where the gain per step is small", async () => {
    // Rosenbrock (1960) as least squares, r = (10(y − x²), 1 − x): minimum at (1, 1) from (−1.2, 1)
    // (Moré, Garbow & Hillstrom 1981, problem 1; docs/sources.md §17).
    const residuals = async (points: number[][]) => points.map(([x, y]) => [10 * (y - x * x), 1 - x]);
    const fit = await levenbergMarquardt({
      start: [-1.2, 1],
      lower: [-5, -5],
      upper: [5, 5],
      residuals,
      maxIterations: 200,
      step: 1e-7,
    });
    expect(fit.params[0]).toBeCloseTo(1, 5);
    expect(fit.params[1]).toBeCloseTo(1, 5);
    expect(fit.converged).toBe(true);
  });
});

describe("the normal distribution's tails", () => {
  it("matches tabulated values of Φ, and stays finite far out", () => {
    // Abramowitz & Stegun (1964) Table 26.1: Φ(1.96) = 0.9750021, Φ(−3) = 0.0013499; the upper
    // tail Q(10) = 7.6199e-24 (Table 26.1's asymptotic column; docs/sources.md §17).
    expect(Math.exp(logPhi(1.96))).toBeCloseTo(0.9750021, 6);
    expect(Math.exp(logPhi(-3)) / 0.0013499).toBeCloseTo(1, 4);
    expect(Math.exp(logPhi(-10)) / 7.6199e-24).toBeCloseTo(1, 3);
    expect(Number.isFinite(logPhi(-60))).toBe(true);
    // Φ(1.96) − Φ(−1.96) = 0.95 (the 95 % two-sided interval)
    expect(Math.exp(logPhiDifference(-1.96, 1.96))).toBeCloseTo(0.95, 4);
    // Far into one tail the difference is still computed without cancellation.
    expect(logPhiDifference(30, 31)).toBeCloseTo(logPhi(-30) + Math.log1p(-Math.exp(logPhi(-31) - logPhi(-30))), 8);
  });
});

describe("the 95 % range's threshold", () => {
  it("matches Student's t table and tends to χ² with one degree of freedom", () => {
    // Abramowitz & Stegun (1964) Table 26.10, t at 0.975 (docs/sources.md §17).
    const table: [number, number][] = [
      [1, 12.706],
      [4, 2.776],
      [5, 2.571],
      [10, 2.228],
      [20, 2.086],
      [30, 2.042],
      [60, 2.0],
      [120, 1.98],
    ];
    for (const [nu, t] of table) expect(Math.abs(studentT975(nu) - t), `ν = ${nu}`).toBeLessThan(0.001);
    // Bates & Watts (1988) §6.1: n·ln(1 + t²(n − p)/(n − p)); 30 readings, 2 multipliers: t(28) = 2.048.
    expect(rangeThreshold(30, 2)).toBeCloseTo(30 * Math.log(1 + 2.048 ** 2 / 28), 2);
    // χ² with one degree of freedom at 0.95 is 3.841 (Abramowitz & Stegun Table 26.8).
    expect(rangeThreshold(1e6, 2)).toBeCloseTo(3.841, 2);
    expect(rangeThreshold(2, 2)).toBe(Infinity);
  });
});

describe("kit readings as intervals", () => {
  const card: Kit = { kind: "card", unit: "asNH3", values: [0, 0.25, 0.5, 1, 2, 4, 8] };

  it("reads a colour card's value as half way to each neighbouring colour", () => {
    expect(NH3).toBeCloseTo(0.82244, 5);
    expect(NO3).toBeCloseTo(0.2259, 5);
    // Our own worked example: "0.25 mg/L NH3" on a 0 / 0.25 / 0.5 card is 0.125–0.375 mg/L NH3.
    const i = readingInterval("tan", 0.25 * NH3, card);
    expect(i.lo / NH3).toBeCloseTo(0.125, 9);
    expect(i.hi / NH3).toBeCloseTo(0.375, 9);
    expect(readingInterval("tan", 0, card)).toEqual({ lo: -Infinity, hi: 0.125 * NH3 });
    expect(readingInterval("tan", 8 * NH3, card).hi).toBe(Infinity);
    const steps = readingInterval("no3", 17.5 * NO3, { kind: "steps", unit: "asNO3", step: 0.5 });
    expect(steps.lo / NO3).toBeCloseTo(17.25, 9);
    expect(steps.hi / NO3).toBeCloseTo(17.75, 9);
  });

  it("infers the kit from the readings' values", () => {
    // Our own worked examples: drop-test values sit on the card, photometer values on half steps.
    expect(inferKit("tan", [0, 0.25 * NH3, 0.5 * NH3], "asNH3")).toMatchObject({ kind: "card", unit: "asNH3" });
    expect(
      inferKit(
        "no3",
        [17.5, 23, 29.5].map((v) => v * NO3),
        "asNO3",
      ),
    ).toEqual({ kind: "steps", unit: "asNO3", step: 0.5 });
    expect(inferKit("no3", [3.4571, 4.1234])).toEqual({ kind: "exact" });
  });

  it("gives the same cost to every model value inside a wide interval, and grows outside it", () => {
    // Our own check: a card reading of 20 mg/L NO3 (15–30) says nothing between 15 and 30.
    const kit: Kit = { kind: "card", unit: "asNO3", values: [0, 5, 10, 20, 40, 80] };
    const obs = observationsOf([{ day: 1, no3: 20 * NO3 }], (s, v) => ({
      ...readingInterval(s, v, kit),
      colour: true,
    }));
    const cost = (mgNo3: number) => negLogLikelihood(obs, [mgNo3 * NO3], 0.05);
    expect(Math.abs(cost(18) - cost(27))).toBeLessThan(0.01);
    expect(cost(40)).toBeGreaterThan(cost(27) + 5);
    const r = (mgNo3: number) => pseudoResiduals(obs, [mgNo3 * NO3], 0.05)[0];
    expect(r(40)).toBeGreaterThan(r(30));
    expect(r(5)).toBeLessThan(r(15));
  });
});

describe("a cost that stays smooth across a trim", () => {
  // The shipped example trims its stem plants "when full". At feed ×1.45 the trim near day 67
  // crosses the reading of day 67.35 as plant uptake moves from ×0.93 to ×0.96; the readings
  // are the model's own values at feed ×1.3, plant uptake ×0.7 (all three species, exact).
  const truth = observe(withMultipliers(MOSSBANK, { feedLoad: 1.3, plantUptake: 0.7 }), DAYS).samples;
  const readings = DAYS.map((day, i) => ({ day, tan: truth.tan[i], no2: truth.no2[i], no3: truth.no3[i] }));
  const kit = { kind: "exact" } as const;
  const obs = observationsOf(readings, (s, v) => ({ ...readingInterval(s, v, kit), colour: false }));
  const grid = Array.from({ length: 25 }, (_v, k) => 0.93 * Math.exp(k * 0.0013));
  const costOf = (pins?: number[][]) =>
    grid.map((p) => {
      const o = observe(withMultipliers(MOSSBANK, { feedLoad: 1.45, plantUptake: p }), DAYS, { pinnedTrimDays: pins });
      return negLogLikelihood(
        obs,
        obs.map((ob) => o.samples[ob.species][ob.reading]),
        0.01,
      );
    });
  const interiorMinima = (c: number[]) =>
    c.filter((v, i) => i > 0 && i < c.length - 1 && v < c[i - 1] && v < c[i + 1]).length;

  it("shows the kink in the free model, and none with the trim pinned", () => {
    const pins = observe(withMultipliers(MOSSBANK, { feedLoad: 1.45, plantUptake: 0.946 }), DAYS).trimDays;
    expect(pins[0].some((t) => t > 66 && t < 68)).toBe(true);
    // The free model's cost has a false local minimum where the trim crosses the reading …
    expect(interiorMinima(costOf())).toBeGreaterThan(0);
    // … the pinned model's (what the fit differentiates) is smooth: no minimum, second differences small.
    const pinned = costOf(pins);
    expect(interiorMinima(pinned)).toBe(0);
    const second = pinned.slice(1, -1).map((v, i) => Math.abs(pinned[i] - 2 * v + pinned[i + 2]));
    const first = pinned.slice(1).map((v, i) => Math.abs(v - pinned[i]));
    expect(Math.max(...second)).toBeLessThan(0.1 * Math.max(...first));
  });

  it("recovers feed load 1.3 and plant uptake 0.7 within 1 % from the default multipliers", async () => {
    const fit = await calibrateMultipliers({
      scenario: MOSSBANK,
      readings,
      fit: ["feedLoad", "plantUptake"],
      kits: { tan: kit, no2: kit, no3: kit },
      predict: predictIn(DAYS),
    });
    const m = Object.fromEntries(fit.multipliers.map((x) => [x.key, x]));
    expect(Math.abs(m.feedLoad.value / 1.3 - 1)).toBeLessThan(0.01);
    expect(Math.abs(m.plantUptake.value / 0.7 - 1)).toBeLessThan(0.01);
    expect(m.feedLoad.low95!).toBeLessThanOrEqual(1.3);
    expect(m.feedLoad.high95!).toBeGreaterThanOrEqual(1.3);
    expect(fit.converged).toBe(true);
  }, 60_000);
});

describe("calibration's refusals", () => {
  it("refuses to fit more multipliers than there are measured values", async () => {
    await expect(
      calibrateMultipliers({
        scenario: PLANTED_120,
        readings: [{ day: 3, no3: 3 }],
        fit: ["feedLoad", "plantUptake"],
        predict: predictIn([3]),
      }),
    ).rejects.toThrow(/needs more than 2 measured values/);
    await expect(
      calibrateMultipliers({ scenario: PLANTED_120, readings: [{ day: 3, no3: 3 }], fit: [], predict: predictIn([3]) }),
    ).rejects.toThrow(/at least one/);
  });
});
