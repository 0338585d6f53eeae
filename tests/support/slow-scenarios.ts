/**
 * The slowest valid scenarios we can find at the schema's extremes, through the engine's public
 * API only (models/index.ts). Used to check that one person's expensive saves do not hold up
 * anyone else. The search keeps the run at a year with daily points and without modelled meals
 * — the runs that look short by their length, and that the server once ran on its request
 * thread — and tries the extremes of everything else: tiny tanks, huge feed, daily events,
 * twelve plant groups trimmed daily, every capacity and multiplier at a bound.
 */
import fc from "fast-check";
import { isModelError, ScenarioSchema, simulate, type Scenario, type ScenarioInput } from "../../models";

const ends = <T>(...values: T[]) => fc.constantFrom(...values);

const plantGroup = (i: number) =>
  fc.record({
    id: fc.constant(`g${i}`),
    growthForm: ends("stem", "floating", "moss", "rosette"),
    startMassG: ends(0, 0.01, 5000),
    maxMassG: ends(0.01, 5000),
    growthRatePerDay: ends(0, 1),
    nitrogenContent: ends(0, 0.08),
    trim: fc.record({
      rule: ends("none", "whenFull", "everyDays"),
      everyDays: ends(1, 365),
      fullAtFraction: ends(0.9, 1),
      trimToFraction: ends(0, 0.6),
    }),
  });

const extremes: fc.Arbitrary<ScenarioInput> = fc
  .record({
    water: fc.record({
      volumeL: ends(1, 10000),
      temperatureC: ends(0, 40),
      pH: ends(4, 10),
      khDkh: ends(0, 30),
      startTan: ends(0, 50),
      startNitrite: ends(0, 50),
      startNitrate: ends(0, 200),
      phFollowsKh: fc.boolean(),
    }),
    fish: fc.record({
      feedGPerDay: ends(0, 1000),
      proteinFraction: ends(0, 0.8),
      feedsPerDay: ends(1, 12),
      fractionEaten: ends(0, 1),
      leftoversRemoved: fc.boolean(),
    }),
    plants: fc
      .integer({ min: 0, max: 12 })
      .chain((n) => fc.tuple(...Array.from({ length: n }, (_, i) => plantGroup(i)))),
    filter: fc.record({
      capacityMgTanPerDay: ends(1, 100000),
      establishedAtStart: fc.boolean(),
      cleaningIntervalDays: ends(0, 1, 365),
      organicsRemovedFraction: ends(0, 1),
      cleanedInTapWater: fc.boolean(),
    }),
    maintenance: fc.record({
      waterChangeIntervalDays: ends(0, 1, 365),
      waterChangeFraction: ends(0, 0.95),
      gravelCleaningFraction: ends(0, 1),
      dripLPerDay: ends(0, 10000),
    }),
    tapWater: fc.record({ nitrate: ends(0, 100), tan: ends(0, 10), khDkh: ends(0, 30), roShare: ends(0, 1) }),
    lowOxygen: fc.record({
      enabled: fc.boolean(),
      denitrificationCapacityMgNPerDay: ends(0, 10000),
      anammoxEnabled: fc.boolean(),
      anammoxCapacityMgNPerDay: ends(0, 10000),
    }),
    fishlessCycling: fc.record({
      enabled: fc.boolean(),
      doseMgNPerL: ends(0, 10),
      doseIntervalDays: ends(0.25, 30),
      stopRule: ends("whenCycled", "afterDays", "never"),
    }),
    multipliers: fc.record({ feedLoad: ends(0.1, 10), plantUptake: ends(0.1, 10), nitrifierCapacity: ends(0.1, 10) }),
  })
  .map(
    (s) =>
      ({
        ...s,
        fish: { ...s.fish, pulsedFeeding: false },
        run: { lengthDays: 365, outputIntervalDays: 1 },
      }) as ScenarioInput,
  );

/** A first guess from the description: a tiny tank, extreme feed, daily events, every setting near a bound. */
const FIRST_GUESS: ScenarioInput = {
  water: { volumeL: 1, temperatureC: 40, pH: 10, khDkh: 30 },
  fish: { feedGPerDay: 1000, proteinFraction: 0.8, feedsPerDay: 12, fractionEaten: 0 },
  plants: Array.from({ length: 12 }, (_, i) => ({
    id: `p${i}`,
    growthForm: "floating" as const,
    startMassG: 0,
    maxMassG: 0.01,
    growthRatePerDay: 1,
    trim: { rule: "everyDays" as const, everyDays: 1 },
  })),
  filter: { capacityMgTanPerDay: 100000, cleaningIntervalDays: 1, establishedAtStart: false },
  maintenance: { waterChangeIntervalDays: 1, waterChangeFraction: 0.95, dripLPerDay: 10000 },
  lowOxygen: {
    enabled: true,
    denitrificationCapacityMgNPerDay: 10000,
    anammoxEnabled: true,
    anammoxCapacityMgNPerDay: 10000,
  },
  fishlessCycling: { enabled: true, doseMgNPerL: 10, doseIntervalDays: 0.25, stopRule: "never" },
  multipliers: { feedLoad: 10, plantUptake: 10, nitrifierCapacity: 10 },
  run: { lengthDays: 365, outputIntervalDays: 1 },
};

export type SlowScenario = { scenario: Scenario; ms: number; outcome: "finished" | string };

/**
 * Tries `tries` valid extreme scenarios (the first guess first), each for at most `capMs` of
 * engine time, and returns them slowest first. Deterministic apart from timing (seeded).
 */
export function slowestScenarios(options: { tries?: number; capMs?: number; seed?: number } = {}): SlowScenario[] {
  const { tries = 16, capMs = 600, seed = 20261203 } = options;
  const candidates = [FIRST_GUESS, ...fc.sample(extremes, { numRuns: tries * 4, seed })];
  const found: SlowScenario[] = [];
  for (const input of candidates) {
    if (found.length >= tries) break;
    const parsed = ScenarioSchema.safeParse(input);
    if (!parsed.success) continue;
    const t0 = performance.now();
    let outcome = "finished";
    try {
      simulate(parsed.data, { maxWallMs: capMs, maxSteps: 300_000 });
    } catch (error) {
      if (!isModelError(error)) throw error;
      outcome = error.code;
    }
    found.push({ scenario: parsed.data, ms: performance.now() - t0, outcome });
  }
  return found.sort((a, b) => b.ms - a.ms);
}
