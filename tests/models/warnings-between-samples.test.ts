/**
 * A warning about the water must not depend on the chart spacing: the ammonia criteria are
 * checked at every solver step, so a spike between two chart samples still warns, and a 30-day
 * or 4-day average is an average over days, not over however many samples fell in it.
 */
import { describe, expect, it } from "vitest";
import { PRESETS, ScenarioSchema, simulate, type Scenario } from "../../models/index";
import { bareTank, rel } from "./helpers";

const HOURLY = 1 / 24;
const codes = (s: Scenario, outputIntervalDays: number) =>
  simulate(s, { outputIntervalDays })
    .warnings.map((w) => w.code)
    .sort();
const warning = (s: Scenario, outputIntervalDays: number, code: string) =>
  simulate(s, { outputIntervalDays }).warnings.find((w) => w.code === code);

/** One big meal a day in a small, hard, pH 9 tank: TAN peaks hours after each meal and is cleared by the next. */
const MEAL_SPIKES = bareTank({
  water: { volumeL: 30, pH: 9, temperatureC: 28, khDkh: 15 },
  tapWater: { khDkh: 15 },
  fish: { feedGPerDay: 1, pulsedFeeding: true, feedsPerDay: 1 },
  run: { lengthDays: 20, outputIntervalDays: 1 },
});

/** A new filter at pH 8 fed from day 0: TAN climbs for weeks. */
const NEW_FILTER = bareTank({
  water: { pH: 8 },
  fish: { feedGPerDay: 5 },
  filter: { establishedAtStart: false },
  run: { lengthDays: 40 },
});

describe("ammonia warnings between chart samples", () => {
  it("a spike of a few hours between daily samples still crosses the acute criterion", () => {
    // US EPA 2013 (docs/sources.md §2): the acute criterion is a one-hour average, so a spike of
    // hours counts. Daily samples fall at meal times, when TAN is lowest.
    const hourly = warning(MEAL_SPIKES, HOURLY, "ammoniaAboveAcuteCriterion");
    expect(hourly, "the hourly chart sees the spike").toBeDefined();
    const daily = warning(MEAL_SPIKES, 1, "ammoniaAboveAcuteCriterion");
    expect(daily, "the daily chart must warn too").toBeDefined();
    expect(daily!.value).toBeGreaterThan(daily!.limit);
    expect(rel(daily!.value, hourly!.value)).toBeLessThan(0.01);
    // the day is within the day of a meal, not a sample day
    expect(daily!.day! % 1).toBeGreaterThan(0);
  });

  it("the chronic criterion still holds with a chart every 7 days", () => {
    // US EPA 2013 (docs/sources.md §2): 30-day average, and no 4-day average above 2.5 times it
    const hourly = warning(NEW_FILTER, HOURLY, "ammoniaAboveChronicCriterion");
    expect(hourly).toBeDefined();
    const weekly = warning(NEW_FILTER, 7, "ammoniaAboveChronicCriterion");
    expect(weekly, "weekly samples must not hide it").toBeDefined();
    expect(rel(weekly!.value, hourly!.value)).toBeLessThan(0.02);
  });

  const cases: [string, Scenario][] = [
    ["meal spikes", MEAL_SPIKES],
    ["a new filter", NEW_FILTER],
    ...PRESETS.map((p): [string, Scenario] => [p.id, ScenarioSchema.parse(p.scenario)]),
  ];
  it.each(cases)("%s: the same warnings at hourly, daily and weekly chart spacing", (_name, s) => {
    // our own check: the chart spacing is a display choice, not a model setting
    const hourly = codes(s, HOURLY);
    expect(codes(s, 1)).toEqual(hourly);
    expect(codes(s, 7)).toEqual(hourly);
  });
});
