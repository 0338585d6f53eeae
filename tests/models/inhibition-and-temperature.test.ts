import { describe, expect, it } from "vitest";
import { ScenarioSchema, getPreset, simulate, type ScenarioInput } from "../../models/index";
import { cardinalFactor } from "../../models/nitrogen/temperature";
import { bareTank, feedForLoad, merge } from "./helpers";

const fishless = getPreset("first-light-fishless")!.scenario;
const cycle = (over: object) => simulate(ScenarioSchema.parse(merge(fishless, over)));

describe("free ammonia inhibits nitrite oxidisers", () => {
  it("an ammonia spike leaves nitrite standing at pH 9 but not at pH 7", () => {
    // Anthonisen et al. 1976: free ammonia above 0.1–1.0 mg NH3/L inhibits nitrite oxidisers
    // (docs/sources.md §13); the classic high-pH nitrite build-up in a cycled tank
    const at = (pH: number) =>
      simulate(
        bareTank({
          water: { pH, khDkh: 10, startTan: 5 },
          fish: { feedGPerDay: feedForLoad(100) },
          filter: { capacityMgTanPerDay: 1000 },
          run: { lengthDays: 10, outputIntervalDays: 0.25 },
        }),
      );
    const high = at(9);
    const neutral = at(7);
    const onDay = (r: ReturnType<typeof at>, day: number) => r.series.no2[r.series.t.findIndex((t) => t >= day)];
    expect(high.keyFigures.peakNitrite.value).toBeGreaterThan(3 * neutral.keyFigures.peakNitrite.value);
    expect(onDay(high, 2)).toBeGreaterThan(1);
    expect(onDay(neutral, 2)).toBeLessThan(0.1);
  });
});

describe("a temperature optimum", () => {
  it("the cardinal model peaks at the optimum and is zero outside the range", () => {
    // Rosso et al. 1993 (docs/sources.md §14)
    const c = { min: 0, opt: 35, max: 45 };
    expect(cardinalFactor(35, c)).toBeCloseTo(1, 12);
    expect(cardinalFactor(0, c)).toBe(0);
    expect(cardinalFactor(45, c)).toBe(0);
    expect(cardinalFactor(30, c)).toBeLessThan(1);
    expect(cardinalFactor(40, c)).toBeLessThan(1);
    // near 20–25 °C it rises about as fast as Metcalf & Eddy's θ = 1.072 per °C
    expect(cardinalFactor(25, c) / cardinalFactor(20, c)).toBeGreaterThan(1.072 ** 5 * 0.95);
    expect(cardinalFactor(25, c) / cardinalFactor(20, c)).toBeLessThan(1.072 ** 5 * 1.05);
  });

  it("a new tank cycles faster at 30 °C than at 20 °C, but not fastest at 40 °C", () => {
    // US EPA (1993): nitrifiers' optimum about 35 °C, growth falls off above it (docs/sources.md §14)
    const finished = (temperatureC: number) =>
      cycle({ water: { temperatureC }, run: { lengthDays: 120 } }).keyFigures.cyclingFinishedDay ?? Infinity;
    const t20 = finished(20);
    const t30 = finished(30);
    const t35 = finished(35);
    const t40 = finished(40);
    expect(t30).toBeLessThan(t20);
    expect(t40).toBeGreaterThan(t35);
  });
});

describe("resident nitrifiers", () => {
  it("do not wash out below what a new filter starts with, however long plants take all the ammonia", () => {
    // model choice, no source (docs/engine.md): the resident floor equals a new filter's seed
    const planted: ScenarioInput = {
      fish: { feedGPerDay: 0.05 },
      plants: [{ id: "f", growthForm: "floating", startMassG: 20, maxMassG: 400, growthRatePerDay: 0.3 }],
      run: { lengthDays: 300 },
    };
    const established = simulate(bareTank(planted));
    const seed = simulate(bareTank({ ...planted, filter: { establishedAtStart: false }, run: { lengthDays: 1 } }));
    expect(Math.min(...established.series.aob)).toBeGreaterThanOrEqual(seed.series.aob[0] * (1 - 1e-6));
    expect(Math.min(...established.series.nob)).toBeGreaterThanOrEqual(seed.series.nob[0] * (1 - 1e-6));
  });
});
