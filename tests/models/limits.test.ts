import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { ModelError, ScenarioSchema, simulate, type ScenarioInput, type SimulationResult } from "../../models/index";
import { REQUEST_RUN_LIMITS } from "~/simulation.server";

// Our own check of the engine's contract under the bounds the web app runs it with
// (REQUEST_RUN_LIMITS: 3 s of wall time, 300 000 solver steps): every scenario the schema
// accepts either finishes with finite, non-negative output or ends with the typed ModelError —
// within the wall bound plus a small margin for the last step and the result assembly.
const WALL_BOUND_MS = REQUEST_RUN_LIMITS.maxWallMs + 750;

function runWithinBound(input: ScenarioInput): { result?: SimulationResult; error?: ModelError; ms: number } {
  const scenario = ScenarioSchema.parse(input);
  const t0 = performance.now();
  try {
    const result = simulate(scenario, REQUEST_RUN_LIMITS);
    return { result, ms: performance.now() - t0 };
  } catch (error) {
    if (!(error instanceof ModelError)) throw error;
    return { error, ms: performance.now() - t0 };
  }
}

function expectSane({ result, error, ms }: ReturnType<typeof runWithinBound>) {
  expect(ms).toBeLessThan(WALL_BOUND_MS);
  if (error) {
    expect(["MAX_STEPS", "WALL_TIME", "NON_FINITE"]).toContain(error.code);
    expect(error.message.length).toBeGreaterThan(20);
    return;
  }
  const s = result!.series;
  for (const column of [s.tan, s.nh3, s.no2, s.no3, s.kh, s.ph, s.aob, s.nob, s.organicWater, s.organicFilter, ...s.plants.map((p) => p.massG)]) {
    for (const v of column) {
      expect(Number.isFinite(v)).toBe(true);
      expect(v).toBeGreaterThanOrEqual(0);
    }
  }
  expect(Number.isFinite(result!.keyFigures.nitrateEnd)).toBe(true);
}

describe("engine limits", () => {
  it("refuses an interval below a day instead of scheduling millions of events", () => {
    // Found by the property below: 1e-300 days between water changes exhausted the heap.
    expect(ScenarioSchema.safeParse({ maintenance: { waterChangeIntervalDays: 1e-300 } }).success).toBe(false);
    expect(ScenarioSchema.safeParse({ filter: { cleaningIntervalDays: 0.5 } }).success).toBe(false);
    expect(ScenarioSchema.safeParse({ maintenance: { waterChangeIntervalDays: 0 } }).success).toBe(true);
  });

  it.each<[string, ScenarioInput]>([
    // Emerson et al. 1975: at pH 9.5 and 32 °C about two thirds of TAN is free NH3.
    ["pH 9.5 at 32 °C", { water: { pH: 9.5, temperatureC: 32 }, fish: { feedGPerDay: 2 }, run: { lengthDays: 120 } }],
    ["a 1 L tank fed 1000 g a day", { water: { volumeL: 1 }, fish: { feedGPerDay: 1000 }, run: { lengthDays: 60 } }],
    [
      "no bacteria to speak of",
      { filter: { capacityMgTanPerDay: 1, establishedAtStart: false }, multipliers: { nitrifierCapacity: 0.1 }, fish: { feedGPerDay: 5 }, run: { lengthDays: 120 } },
    ],
    [
      "everything at its most, two years at hourly output",
      {
        water: { volumeL: 10000, temperatureC: 40, pH: 10, khDkh: 30, startTan: 50, startNitrite: 50, startNitrate: 200 },
        fish: { feedGPerDay: 1000, proteinFraction: 0.8, feedsPerDay: 12, pulsedFeeding: true },
        filter: { capacityMgTanPerDay: 100000, cleaningIntervalDays: 1 },
        lowOxygen: { enabled: true, denitrificationCapacityMgNPerDay: 10000, anammoxEnabled: true, anammoxCapacityMgNPerDay: 10000 },
        multipliers: { feedLoad: 10, plantUptake: 10, nitrifierCapacity: 10 },
        run: { lengthDays: 730, outputIntervalDays: 1 / 24 },
      },
    ],
    [
      "cold, acid and empty",
      { water: { temperatureC: 0, pH: 4, khDkh: 0 }, fish: { feedGPerDay: 0 }, plants: [], maintenance: { waterChangeIntervalDays: 0 }, run: { lengthDays: 730 } },
    ],
  ])("%s: finishes within the bound or says why not", (_name, input) => {
    expectSane(runWithinBound(input));
  }, 60_000);

  const anywhere = (min: number, max: number) => fc.double({ min, max, noNaN: true, noDefaultInfinity: true });
  it("holds for random scenarios across the whole range the schema accepts", () => {
    fc.assert(
      fc.property(
        fc.record({
          water: fc.record({ volumeL: anywhere(1, 10000), temperatureC: anywhere(0, 40), pH: anywhere(4, 10), khDkh: anywhere(0, 30), startTan: anywhere(0, 50) }),
          fish: fc.record({ feedGPerDay: anywhere(0, 1000), proteinFraction: anywhere(0, 0.8), fractionEaten: anywhere(0, 1) }),
          filter: fc.record({ capacityMgTanPerDay: anywhere(1, 100000), establishedAtStart: fc.boolean() }),
          maintenance: fc.record({
            waterChangeIntervalDays: fc.oneof(fc.constant(0), anywhere(1, 365)),
            waterChangeFraction: anywhere(0, 0.95),
          }),
          multipliers: fc.record({ feedLoad: anywhere(0.1, 10), plantUptake: anywhere(0.1, 10), nitrifierCapacity: anywhere(0.1, 10) }),
          run: fc.record({ lengthDays: anywhere(1, 730), outputIntervalDays: fc.constantFrom(1 / 24, 0.25, 1, 7) }),
        }),
        (input) => expectSane(runWithinBound(input as ScenarioInput)),
      ),
      { numRuns: 12, seed: 20261202 },
    );
  }, 120_000);
});
