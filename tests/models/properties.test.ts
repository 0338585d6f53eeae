import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { ModelError, ScenarioSchema, simulate } from "../../models/index";
import type { Scenario, SimulationResult } from "../../models/index";
import { plantGroupArb, scenarioArb } from "./arbitraries";

// Our own properties of a conserving, non-negative model; fast-check picks the scenarios.
// numRuns is kept modest so the engine suite stays well under a minute on two cores.

/** Dissolved inorganic N at the end, mg N/L, from the unrounded budget stocks. */
const dinEnd = (r: SimulationResult, s: Scenario) => r.budget.stockEnd.water.total / s.water.volumeL;

function everyNumber(value: unknown, visit: (n: number, path: string) => void, path = ""): void {
  if (typeof value === "number") visit(value, path);
  else if (Array.isArray(value)) value.forEach((v, i) => everyNumber(v, visit, `${path}[${i}]`));
  else if (value && typeof value === "object")
    for (const [k, v] of Object.entries(value)) everyNumber(v, visit, `${path}.${k}`);
}

describe("properties over random valid scenarios", () => {
  it("nitrogen balance closes, nothing is negative, every output is finite", () => {
    fc.assert(
      fc.property(scenarioArb, (s) => {
        const r = simulate(s, { rawSeries: true });
        // inputs − outputs − Δstock = 0 to 1e-6 relative
        expect(r.budget.imbalanceRelative).toBeLessThan(1e-6);
        everyNumber(r, (n, path) => {
          if (!Number.isFinite(n)) throw new Error(`non-finite ${path}`);
        });
        // The chart series are clamped at zero for display, so the checks read the raw,
        // unclamped samples the solver produced: anything below zero must be solver noise,
        // under 1e-4 mg N/L (or mg O2/L) for dissolved species and 1e-6 of the nitrogen in play
        // for the pools.
        const { names, rows } = r.rawSeries;
        const V = s.water.volumeL;
        const scale = r.budget.stockStart.total + r.budget.inputs.total;
        const dissolved = new Set([
          "TAN (mg N/L)",
          "nitrite-N (mg N/L)",
          "nitrate-N (mg N/L)",
          "dissolved oxygen (mg/L)",
        ]);
        names.forEach((name, i) => {
          if (name === "pH (unclamped)") return;
          const lowest = Math.min(...rows.map((row) => row[i]));
          if (dissolved.has(name)) expect(lowest, name).toBeGreaterThan(-1e-4);
          else if (name === "KH (dKH)") expect(lowest, name).toBeGreaterThan(-1e-6);
          else expect(lowest, name).toBeGreaterThan(-1e-6 * Math.max(scale, V));
        });
        // pH: the chart shows the carbonate relation of the raw KH (clamped only for display);
        // with pH fixed it is the pH entered.
        const ph = names.indexOf("pH (unclamped)");
        const kh = names.indexOf("KH (dKH)");
        rows.forEach((row, k) => {
          const expected = s.water.phFollowsKh
            ? s.water.pH + Math.log10(Math.max(row[kh], 1e-3) / s.water.khDkh)
            : s.water.pH;
          expect(row[ph]).toBeCloseTo(expected, 9);
          expect(r.series.ph[k]).toBeCloseTo(Math.min(10, Math.max(4, row[ph])), 4);
        });
        // The budget reports raw solver stocks too.
        const st = r.budget.stockEnd;
        for (const v of [st.water.tan, st.water.nitrite, st.water.nitrate]) expect(v).toBeGreaterThan(-1e-4 * V);
        for (const v of [st.detritus.tank, st.detritus.filter, st.bacteria.total, st.plants, st.fishGut]) {
          expect(v).toBeGreaterThan(-1e-6 * scale);
        }
        // time runs forward; two samples at each event
        const { series } = r;
        expect(series.t.every((t, k) => k === 0 || t >= series.t[k - 1])).toBe(true);
        expect(series.t[series.t.length - 1]).toBeCloseTo(s.run.lengthDays, 5);
      }),
      { numRuns: 100, seed: 20250301 },
    );
  });

  it("stiff tiny tanks close the balance too, on the stiff solver", () => {
    // our own property: RODAS4 keeps the linear nitrogen invariant like odex does
    const stiffTank = fc.record({
      volumeL: fc.double({ min: 1, max: 5, noNaN: true }),
      drip: fc.oneof(fc.constant(0), fc.double({ min: 500, max: 10000, noNaN: true })),
      plantG: fc.oneof(fc.constant(0), fc.double({ min: 500, max: 4000, noNaN: true })),
      zone: fc.oneof(fc.constant(0), fc.double({ min: 1000, max: 10000, noNaN: true })),
      feed: fc.double({ min: 0, max: 2, noNaN: true }),
    });
    let stiffRuns = 0;
    fc.assert(
      fc.property(stiffTank, (x) => {
        const s = ScenarioSchema.parse({
          water: { volumeL: x.volumeL, startTan: 2, startNitrate: 5 },
          fish: { feedGPerDay: x.feed },
          plants: x.plantG > 0 ? [{ id: "f", growthForm: "floating", startMassG: x.plantG, maxMassG: 5000 }] : [],
          maintenance: { dripLPerDay: x.drip, waterChangeIntervalDays: 7 },
          lowOxygen: {
            enabled: x.zone > 0,
            zoneSize: "fromCapacity",
            denitrificationCapacityMgNPerDay: x.zone,
            anammoxEnabled: true,
            anammoxCapacityMgNPerDay: x.zone,
          },
          run: { lengthDays: 30 },
        });
        const r = simulate(s);
        if (r.stats.stiffSegments > 0) stiffRuns++;
        expect(r.budget.imbalanceRelative).toBeLessThan(1e-6);
      }),
      { numRuns: 15, seed: 20261214 },
    );
    expect(stiffRuns).toBeGreaterThan(5);
  });

  it("with nitrogen-free change water, a larger water-change fraction never ends with more DIN", () => {
    fc.assert(
      fc.property(
        scenarioArb,
        fc.double({ min: 0, max: 0.9, noNaN: true }),
        fc.double({ min: 0, max: 0.9, noNaN: true }),
        fc.double({ min: 2, max: 14, noNaN: true }),
        (s0, a, b, interval) => {
          const base = {
            ...s0,
            tapWater: { ...s0.tapWater, nitrate: 0, tan: 0 },
            maintenance: { ...s0.maintenance, waterChangeIntervalDays: interval },
          };
          const small = ScenarioSchema.parse({
            ...base,
            maintenance: { ...base.maintenance, waterChangeFraction: Math.min(a, b) },
          });
          const large = ScenarioSchema.parse({
            ...base,
            maintenance: { ...base.maintenance, waterChangeFraction: Math.max(a, b) },
          });
          const dSmall = dinEnd(simulate(small), small);
          const dLarge = dinEnd(simulate(large), large);
          expect(dLarge).toBeLessThanOrEqual(dSmall * (1 + 1e-6) + 1e-6);
        },
      ),
      { numRuns: 50, seed: 20250302 },
    );
  });

  it("with low-oxygen zones off, adding plant mass never ends with more DIN", () => {
    fc.assert(
      fc.property(
        scenarioArb,
        plantGroupArb("added"),
        fc.double({ min: 1, max: 4, noNaN: true }),
        (s0, extra, scale) => {
          const base = ScenarioSchema.parse({ ...s0, lowOxygen: { ...s0.lowOxygen, enabled: false } });
          const withGroup = ScenarioSchema.parse({ ...base, plants: [...base.plants, extra] });
          // also: the same groups scaled up (more of the same plants in a bigger planted area)
          const scaled = ScenarioSchema.parse({
            ...base,
            plants: base.plants.map((g) => ({ ...g, startMassG: g.startMassG * scale, maxMassG: g.maxMassG * scale })),
          });
          const d0 = dinEnd(simulate(base), base);
          expect(dinEnd(simulate(withGroup), withGroup)).toBeLessThanOrEqual(d0 * (1 + 1e-6) + 1e-6);
          expect(dinEnd(simulate(scaled), scaled)).toBeLessThanOrEqual(d0 * (1 + 1e-6) + 1e-6);
        },
      ),
      { numRuns: 50, seed: 20250303 },
    );
  });

  it("is deterministic and leaves its input untouched", () => {
    fc.assert(
      fc.property(scenarioArb, (s) => {
        const frozen = structuredClone(s);
        const deepFreeze = (o: unknown): void => {
          if (o && typeof o === "object") {
            Object.freeze(o);
            Object.values(o).forEach(deepFreeze);
          }
        };
        deepFreeze(frozen);
        const a = simulate(frozen);
        const b = simulate(frozen);
        expect(frozen).toEqual(s);
        // everything but the wall-clock figure is identical
        expect({ ...a, stats: { ...a.stats, wallMs: 0 } }).toEqual({ ...b, stats: { ...b.stats, wallMs: 0 } });
      }),
      { numRuns: 15, seed: 20250304 },
    );
  });

  it("extreme but valid settings either run cleanly or throw ModelError — never NaN, never a hang", () => {
    const extreme = fc.record({
      volumeL: fc.constantFrom(1, 5, 10000),
      capacity: fc.constantFrom(1, 100000),
      mult: fc.constantFrom(0.1, 10),
      growth: fc.constantFrom(0, 1),
      maxMassG: fc.constantFrom(0.01, 5000),
      feed: fc.constantFrom(0, 1000),
      denit: fc.constantFrom(0, 10000),
      established: fc.boolean(),
      drip: fc.constantFrom(0, 10000),
    });
    fc.assert(
      fc.property(extreme, (x) => {
        const s = ScenarioSchema.parse({
          water: { volumeL: x.volumeL, startTan: 5 },
          fish: { feedGPerDay: x.feed },
          plants: [{ id: "p", startMassG: x.maxMassG / 2, maxMassG: x.maxMassG, growthRatePerDay: x.growth }],
          filter: { capacityMgTanPerDay: x.capacity, establishedAtStart: x.established },
          maintenance: { dripLPerDay: x.drip },
          lowOxygen: {
            enabled: x.denit > 0,
            denitrificationCapacityMgNPerDay: x.denit,
            anammoxEnabled: true,
            anammoxCapacityMgNPerDay: x.denit,
          },
          multipliers: { feedLoad: x.mult, plantUptake: x.mult, nitrifierCapacity: x.mult },
          run: { lengthDays: 60 },
        });
        const started = performance.now();
        try {
          const r = simulate(s, { maxWallMs: 400, maxSteps: 30_000 });
          everyNumber(r, (n, path) => {
            if (!Number.isFinite(n)) throw new Error(`non-finite ${path}`);
          });
          expect(r.budget.imbalanceRelative).toBeLessThan(1e-6);
        } catch (e) {
          expect(e).toBeInstanceOf(ModelError);
          expect((e as ModelError).message.length).toBeGreaterThan(20);
        }
        expect(performance.now() - started).toBeLessThan(3000);
      }),
      { numRuns: 20, seed: 20250305 },
    );
  });
});
