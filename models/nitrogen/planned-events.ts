/**
 * A scenario's periodic schedule written out as explicit events ("these events on these days"):
 * what a keeper plans to do, for a forecast, a calendar and the replay's equivalence check.
 * Fishless dosing with the "when cycled" rule depends on the water, so it is listed as if it
 * never stopped; the others are exactly the scenario's timetable.
 */
import { periodicTimes } from "../core/events";
import { BACTERIA } from "./parameters";
import type { Scenario } from "./scenario";
import type { TankEvent } from "./tank-events";

/** The bacteria a filter cleaning loses, as the scenario's rinse rule says. */
export function scenarioBacteriaShare(s: Scenario, inTapWater = s.filter.cleanedInTapWater): number {
  return (
    BACTERIA.shareInFilter.value *
    (inTapWater ? BACTERIA.killedByTapWaterRinse.value : BACTERIA.lostByTankWaterRinse.value)
  );
}

/**
 * The scenario's timed events on days [from, to): the first of each kind `offset` days after
 * `from` plus its interval (so a plan can resume from its last done date).
 */
export function plannedEvents(s: Scenario, to: number, from = 0): TankEvent[] {
  const out: TankEvent[] = [];
  const times = (interval: number, first = interval) => periodicTimes(interval, to - from, first).map((t) => t + from);
  const m = s.maintenance;
  if (m.waterChangeIntervalDays > 0 && m.waterChangeFraction > 0) {
    for (const day of times(m.waterChangeIntervalDays)) {
      out.push({
        kind: "waterChange",
        day,
        fraction: m.waterChangeFraction,
        tapNitrate: null,
        roShare: null,
        gravelFraction: m.gravelCleaningFraction,
      });
    }
  }
  const f = s.filter;
  if (f.cleaningIntervalDays > 0) {
    for (const day of times(f.cleaningIntervalDays)) {
      out.push({
        kind: "filterCleaning",
        day,
        sludgeFraction: f.organicsRemovedFraction,
        bacteriaShare: scenarioBacteriaShare(s),
        inTapWater: f.cleanedInTapWater,
      });
    }
  }
  for (const g of s.plants) {
    if (g.trim.rule !== "everyDays") continue;
    for (const day of times(g.trim.everyDays)) {
      out.push({ kind: "trim", day, groupId: g.id, toG: g.trim.trimToFraction * g.maxMassG });
    }
  }
  const fc = s.fishlessCycling;
  if (fc.enabled && fc.doseMgNPerL > 0) {
    const last = fc.stopRule === "afterDays" ? fc.stopAfterDays : Infinity;
    for (const day of times(fc.doseIntervalDays, 0)) {
      if (day > last + 1e-9) break;
      out.push({ kind: "dose", day, mgNPerL: fc.doseMgNPerL });
    }
  }
  return out.sort((a, b) => a.day - b.day);
}
