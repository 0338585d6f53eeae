import fc from "fast-check";
import { GROWTH_FORMS, ScenarioSchema } from "../../models/index";
import type { Scenario, ScenarioInput } from "../../models/index";

const num = (min: number, max: number) => fc.double({ min, max, noNaN: true, noDefaultInfinity: true });
/** Zero about a third of the time, else in [min, max]. */
const often0 = (min: number, max: number) => fc.oneof(fc.constant(0), num(min, max), num(min, max));

export const plantGroupArb = (id: string) =>
  fc
    .record({
      growthForm: fc.constantFrom(...GROWTH_FORMS),
      startMassG: num(0, 50),
      extra: num(0.5, 100),
      nitrogenContent: num(0.015, 0.05),
      growthRatePerDay: num(0, 0.4),
      rule: fc.constantFrom("none", "whenFull", "everyDays"),
      fullAtFraction: num(0.6, 1),
      trimShare: num(0.2, 0.9),
      everyDays: num(3, 30),
    })
    .map((g) => ({
      id,
      name: `Group ${id}`,
      growthForm: g.growthForm,
      startMassG: g.startMassG,
      maxMassG: g.startMassG + g.extra,
      nitrogenContent: g.nitrogenContent,
      growthRatePerDay: g.growthRatePerDay,
      trim: {
        rule: g.rule as "none" | "whenFull" | "everyDays",
        fullAtFraction: g.fullAtFraction,
        trimToFraction: g.fullAtFraction * g.trimShare,
        everyDays: g.everyDays,
      },
    }));

/** Random valid scenarios across the ranges keepers use, kept short so the suite stays fast. */
export const scenarioArb: fc.Arbitrary<Scenario> = fc
  .record({
    water: fc.record({
      volumeL: num(10, 500),
      temperatureC: num(15, 32),
      pH: num(6, 8.5),
      khDkh: num(1, 12),
      startTan: often0(0, 3),
      startNitrite: often0(0, 2),
      startNitrate: num(0, 20),
      phFollowsKh: fc.boolean(),
    }),
    fish: fc.record({
      feedGPerDay: num(0, 3),
      proteinFraction: num(0.3, 0.6),
      feedsPerDay: fc.integer({ min: 1, max: 4 }),
      fractionEaten: num(0.6, 1),
      leftoversRemoved: fc.boolean(),
      pulsedFeeding: fc.boolean(),
    }),
    plants: fc
      .integer({ min: 0, max: 3 })
      .chain((n) => fc.tuple(...Array.from({ length: n }, (_, i) => plantGroupArb(`g${i}`)))),
    filter: fc.record({
      capacityMgTanPerDay: num(20, 2000),
      establishedAtStart: fc.boolean(),
      cleaningIntervalDays: often0(5, 60),
      organicsRemovedFraction: num(0, 1),
      cleanedInTapWater: fc.boolean(),
    }),
    maintenance: fc.record({
      waterChangeIntervalDays: often0(2, 21),
      waterChangeFraction: num(0, 0.6),
      gravelCleaningFraction: num(0, 0.5),
      dripLPerDay: often0(0.1, 10),
    }),
    tapWater: fc.record({ nitrate: num(0, 10), tan: often0(0, 0.5), khDkh: num(0, 12), roShare: often0(0, 1) }),
    lowOxygen: fc.record({
      enabled: fc.boolean(),
      denitrificationCapacityMgNPerDay: num(0, 100),
      anammoxEnabled: fc.boolean(),
      anammoxCapacityMgNPerDay: num(0, 50),
    }),
    fishlessCycling: fc.record({
      enabled: fc.boolean(),
      doseMgNPerL: num(0, 3),
      doseIntervalDays: num(1, 3),
      stopRule: fc.constantFrom("whenCycled", "afterDays", "never"),
      stopAfterDays: num(0, 60),
    }),
    run: fc.record({ lengthDays: num(5, 90), outputIntervalDays: fc.constantFrom(1, 0.5, 1 / 24) }),
    multipliers: fc.record({ feedLoad: num(0.5, 2), plantUptake: num(0.5, 2), nitrifierCapacity: num(0.5, 2) }),
  })
  .map((raw) => ScenarioSchema.parse(raw as ScenarioInput));
