/**
 * The tank's events in time: water changes, filter cleanings, trims (on a schedule or when a
 * group fills its space), ammonia doses and meals. Effects are pure (./event-effects.ts); this
 * module books their flows into the run's ledger and keeps the little memory events need
 * (doses given, the nitrate just before the last water change).
 */
import type { EventOutcome, ScheduledEvent } from "../core/events";
import { periodicTimes } from "../core/events";
import type { Watch } from "../core/problem";
import type { EventFlows } from "./budget";
import { bookFlows, emptyFlows } from "./budget";
import type { Effect } from "./event-effects";
import { dose, filterCleaning, meal, trim, waterChange } from "./event-effects";
import { BACTERIA, SCENARIO_DEFAULTS } from "./parameters";
import type { Scenario } from "./scenario";
import { IX, PLANT0 } from "./state";
import type { TankConstants } from "./tank-constants";

/** What events booked over a run. */
interface Ledger {
  readonly flows: EventFlows;
  /** Dry mass trimmed per group, g. */
  readonly trimmedG: number[];
  /** Nitrate-N (mg N/L) just before the latest water change, or null before the first. */
  nitrateBeforeLastChange: number | null;
}

export interface TankSchedule {
  readonly events: ScheduledEvent[];
  readonly watches: Watch[];
  onCrossing(index: number, t: number, y: readonly number[]): EventOutcome;
  readonly ledger: Ledger;
}

export function buildSchedule(
  s: Scenario,
  c: TankConstants,
  tEnd: number,
  pinnedTrimDays?: readonly (readonly number[] | null | undefined)[],
): TankSchedule {
  const ledger: Ledger = {
    flows: emptyFlows(c.plantCount),
    trimmedG: new Array<number>(c.plantCount).fill(0),
    nitrateBeforeLastChange: null,
  };
  const adopt = (e: Effect): EventOutcome => {
    bookFlows(ledger.flows, ledger.trimmedG, e.booking);
    return { y: e.y, records: e.records };
  };
  const events: ScheduledEvent[] = [];
  const at = (t: number, order: number, apply: (y: readonly number[]) => EventOutcome) =>
    events.push({ t, order, apply });

  const m = s.maintenance;
  if (m.waterChangeIntervalDays > 0 && m.waterChangeFraction > 0) {
    for (const t of periodicTimes(m.waterChangeIntervalDays, tEnd)) {
      at(t, 40, (y) => {
        ledger.nitrateBeforeLastChange = y[IX.no3];
        return adopt(waterChange(c, m.waterChangeFraction, m.gravelCleaningFraction, t, y));
      });
    }
  }

  const fl = s.filter;
  if (fl.cleaningIntervalDays > 0) {
    const share =
      BACTERIA.shareInFilter.value *
      (fl.cleanedInTapWater ? BACTERIA.killedByTapWaterRinse.value : BACTERIA.lostByTankWaterRinse.value);
    for (const t of periodicTimes(fl.cleaningIntervalDays, tEnd)) {
      at(t, 30, (y) => adopt(filterCleaning(fl.organicsRemovedFraction, share, fl.cleanedInTapWater, t, y)));
    }
  }

  const trimGroup = (i: number, t: number, y: readonly number[]) => {
    const g = s.plants[i];
    return adopt(trim(c, i, g.name, g.trim.trimToFraction * g.maxMassG, t, y));
  };
  const watches: Watch[] = [];
  const watchGroup: number[] = [];
  s.plants.forEach((g, i) => {
    if (g.trim.rule === "everyDays") {
      for (const t of periodicTimes(g.trim.everyDays, tEnd)) at(t, 50 + i, (y) => trimGroup(i, t, y));
    } else if (g.trim.rule === "whenFull" && pinnedTrimDays?.[i]) {
      for (const t of pinnedTrimDays[i]!) if (t >= 0 && t < tEnd) at(t, 50 + i, (y) => trimGroup(i, t, y));
    } else if (g.trim.rule === "whenFull") {
      watches.push({ index: PLANT0 + i, threshold: g.trim.fullAtFraction * g.maxMassG });
      watchGroup.push(i);
    }
  });

  const fc = s.fishlessCycling;
  if (fc.enabled && fc.doseMgNPerL > 0) {
    const clear = SCENARIO_DEFAULTS.cycling.clearThreshold.value;
    let doses = 0;
    let stopped = false;
    const last = fc.stopRule === "afterDays" ? fc.stopAfterDays : Infinity;
    for (const t of periodicTimes(fc.doseIntervalDays, tEnd, 0)) {
      if (t > last + 1e-9) break;
      at(t, 10, (y) => {
        if (stopped) return { y, records: [] };
        if (fc.stopRule === "whenCycled" && doses > 0 && y[IX.tan] < clear && y[IX.no2] < clear) {
          stopped = true;
          const detail = "The last dose was cleared before the next one: dosing stopped";
          return { y, records: [{ day: t, kind: "dosingStopped", detail }] };
        }
        doses++;
        return adopt(dose(c, fc.doseMgNPerL, t, y));
      });
    }
  }

  if (c.pulsedFeeding && c.feedN > 0) {
    for (const t of periodicTimes(1 / c.feedsPerDay, tEnd, 0)) at(t, 20, (y) => adopt(meal(c, t, y)));
  }

  return { events, watches, onCrossing: (w, t, y) => trimGroup(watchGroup[w], t, y), ledger };
}
