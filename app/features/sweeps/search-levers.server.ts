/**
 * The settings the target finder may change, as the search sees them: each is a setting of the
 * shared vocabulary (models/nitrogen/scenario/settings.ts) with the direction that counts as
 * "more change", the search's resolution, and sentences for the result. Canonical units.
 *
 * Bisection needs the goal to be met on one side of a single threshold. That holds for these
 * levers where the science says so: a larger water-change fraction, more frequent changes, more
 * reverse-osmosis water, less feed and more plants (start and maximum scaled together) each lower
 * nitrate (and ammonia) or leave it.
 */
import { applyChanges, scenarioSetting, type Scenario, type Setting, type SettingChange } from "~models";
import { TARGET_LEVER_SETTINGS, type TargetLeverId } from "~/features/sweeps/target-levers";
import { formatNumber } from "~/utils/display-units";

/** A lever as the search sees it (canonical units). */
export type SearchLever = {
  id: TargetLeverId;
  lo: number;
  hi: number;
  /** Which way is "more change": towards hi ("up") or towards lo ("down"). */
  moreChange: "up" | "down";
  integer: boolean;
  /** Bisection stops when the bracket is this narrow (a ratio for log-scaled levers). */
  tolerance: number;
  scale: "linear" | "log";
  current: number;
  changes(value: number): SettingChange[];
  /** The value in the person's units, and a sentence for it. */
  show(value: number): string;
  advice(value: number): string;
};

const everyDays = (n: number) => (n === 1 ? "every day" : `every ${formatNumber(n)} days`);
const pct = (f: number) => `${formatNumber(f * 100, 3)} %`;

export const RO_KH_NOTE =
  "Reverse-osmosis water carries almost no KH: used on its own it lets KH fall until the filter stalls and ammonia climbs (remineralise it, or mix it with tap water).";

/** Nitrate entering with the change water, mg N/L (tap blended with RO). */
export function changeWaterNitrate(s: Scenario): number {
  return s.tapWater.nitrate * (1 - s.tapWater.roShare);
}

/** The vocabulary's setting behind a lever; throws if the scenario schema lost it (a bug). */
function setting(scenario: Scenario, id: TargetLeverId): Setting | null {
  return scenarioSetting(scenario, TARGET_LEVER_SETTINGS[id]);
}

function required(found: Setting | null, id: TargetLeverId): Setting {
  if (!found) throw new Error(`The target lever ${id} has no setting in the scenario`);
  return found;
}

/**
 * The levers of a scenario. `intervalDays` fixes the interval for the fraction lever and
 * `fraction` the share for the interval lever (defaults: the scenario's, or weekly / 25 %).
 * Returns the lever, or a sentence saying why it does not apply.
 */
export function searchLever(
  id: TargetLeverId,
  scenario: Scenario,
  opts: { intervalDays?: number; fraction?: number } = {},
): SearchLever | { unavailable: string } {
  const m = scenario.maintenance;
  const interval = opts.intervalDays ?? (m.waterChangeIntervalDays > 0 ? m.waterChangeIntervalDays : 7);
  const fraction = opts.fraction ?? (m.waterChangeFraction > 0 ? m.waterChangeFraction : 0.25);
  const intervalSetting = required(setting(scenario, "waterChangeInterval"), id);
  const fractionSetting = required(setting(scenario, "waterChangeFraction"), id);
  switch (id) {
    case "waterChangeFraction":
      return {
        id,
        lo: fractionSetting.min,
        hi: fractionSetting.max,
        moreChange: "up",
        integer: false,
        tolerance: 1e-4,
        scale: "linear",
        current: m.waterChangeIntervalDays > 0 ? m.waterChangeFraction : 0,
        changes: (v) => [...fractionSetting.changes(v), ...intervalSetting.changes(interval)],
        show: (v) => `${pct(v)} ${everyDays(interval)}`,
        advice: (v) => `Change ${pct(v)} of the water ${everyDays(interval)}.`,
      };
    case "waterChangeInterval": {
      // At least every day, at most a third of the run (so a few changes fall within it).
      const longest = Math.max(2, Math.min(60, Math.floor(scenario.run.lengthDays / 3)));
      return {
        id,
        lo: 1,
        hi: longest,
        moreChange: "down",
        integer: true,
        tolerance: 1,
        scale: "linear",
        current: m.waterChangeIntervalDays,
        changes: (v) => [...intervalSetting.changes(v), ...fractionSetting.changes(fraction)],
        show: (v) => `${pct(fraction)} ${everyDays(v)}`,
        advice: (v) => `Change ${pct(fraction)} of the water at least ${everyDays(v)}.`,
      };
    }
    case "plantMass": {
      const plants = setting(scenario, "plantMass");
      if (!plants)
        return { unavailable: "There are no plants in this scenario: add a plant group in the setup first." };
      return {
        id,
        lo: plants.min,
        hi: plants.max,
        moreChange: "up",
        integer: false,
        tolerance: 1.005,
        scale: "log",
        current: plants.current,
        changes: plants.changes,
        show: (v) => `${formatNumber(v)} g dry of plants`,
        advice: (v) =>
          `Grow about ${formatNumber(v)} g dry of plants in all (now ${formatNumber(plants.current)} g), with room to grow in proportion.`,
      };
    }
    case "feed": {
      const food = required(setting(scenario, "feed"), id);
      const feed = food.current;
      if (!(feed > 0)) return { unavailable: "This scenario feeds nothing, so there is no food to cut." };
      // Less food only: from nothing up to what is fed now.
      return {
        id,
        lo: food.min,
        hi: feed,
        moreChange: "down",
        integer: false,
        tolerance: Math.max(0.001, feed * 0.002),
        scale: "linear",
        current: feed,
        changes: food.changes,
        show: (v) => `${formatNumber(v)} g of food a day`,
        advice: (v) => `Feed at most ${formatNumber(v)} g a day (now ${formatNumber(feed)} g).`,
      };
    }
    case "roShare": {
      const ro = required(setting(scenario, "roShare"), id);
      return {
        id,
        lo: ro.min,
        hi: ro.max,
        moreChange: "up",
        integer: false,
        tolerance: 1e-3,
        scale: "linear",
        current: ro.current,
        changes: ro.changes,
        show: (v) => `${pct(v)} reverse-osmosis water`,
        advice: (v) => `Make at least ${pct(v)} of the change water reverse-osmosis water (now ${pct(ro.current)}).`,
      };
    }
  }
}

/** The scenario with a found value applied (for "save as a new scenario"). */
export function applyLever(scenario: Scenario, lever: SearchLever, value: number): Scenario {
  return applyChanges(scenario, lever.changes(value));
}
