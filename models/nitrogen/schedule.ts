/**
 * The tank's events in time: water changes, filter cleanings, trims (on a schedule or when a
 * group fills its space), ammonia doses and meals. Effects are pure (./event-effects.ts); this
 * module books their flows into the run's ledger and keeps the little memory events need
 * (doses given, the nitrate just before the last water change).
 *
 * Two sources of dated events: the scenario's periodic schedule, or an explicit list ("these
 * events on these days", ./tank-events.ts) that replaces the periodic water changes, filter
 * cleanings, trims on a timetable and doses. Meals and "trim when full" stay as the scenario
 * says: they are how the tank is kept, not things a keeper notes down each time.
 */
import type { EventOutcome, ScheduledEvent } from "../core/events";
import { periodicTimes } from "../core/events";
import type { Watch } from "../core/problem";
import type { EventFlows } from "./budget";
import { bookFlows, emptyFlows } from "./budget";
import type { Effect } from "./event-effects";
import { dose, filterCleaning, meal, trim, waterChange } from "./event-effects";
import { explicitEvents } from "./explicit-schedule";
import { scenarioBacteriaShare } from "./planned-events";
import { SCENARIO_DEFAULTS } from "./parameters";
import type { Scenario } from "./scenario";
import { IX, PLANT0 } from "./state";
import type { TankConstants } from "./tank-constants";
import type { TankEvent } from "./tank-events";

/** What events booked over a run. */
export interface Ledger {
  readonly flows: EventFlows;
  /** Dry mass trimmed per group, g. */
  readonly trimmedG: number[];
  /** Nitrate-N (mg N/L) just before the latest water change, or null before the first. */
  nitrateBeforeLastChange: number | null;
  /** Continuous feed N over the run when a replay changed the rate (null: constant rate). */
  feedContinuousMgN: number | null;
}

export interface TankSchedule {
  readonly events: ScheduledEvent[];
  readonly watches: Watch[];
  onCrossing(index: number, t: number, y: readonly number[]): EventOutcome;
  readonly ledger: Ledger;
  /** The constants the right-hand side reads: a replay's feeding changes alter them in time. */
  readonly rates: TankConstants;
}

/**
 * The run's events. `explicit` (a replay's list) replaces the periodic maintenance; without it
 * the scenario's schedule is used.
 */
export function buildSchedule(
  s: Scenario,
  c: TankConstants,
  tEnd: number,
  explicit?: readonly TankEvent[],
  pinnedTrimDays?: readonly (readonly number[] | null | undefined)[],
): TankSchedule {
  const ledger: Ledger = {
    flows: emptyFlows(c.plantCount),
    trimmedG: new Array<number>(c.plantCount).fill(0),
    nitrateBeforeLastChange: null,
    feedContinuousMgN: null,
  };
  const rates = { ...c };
  const adopt = (e: Effect): EventOutcome => {
    bookFlows(ledger.flows, ledger.trimmedG, e.booking);
    return { y: e.y, records: e.records };
  };
  const events: ScheduledEvent[] = [];
  const at = (t: number, order: number, apply: (y: readonly number[]) => EventOutcome) =>
    events.push({ t, order, apply });

  const m = s.maintenance;
  if (explicit) {
    const add = explicitEvents(s, c, rates, tEnd, explicit, ledger, adopt);
    events.push(...add);
  }
  if (!explicit && m.waterChangeIntervalDays > 0 && m.waterChangeFraction > 0) {
    for (const t of periodicTimes(m.waterChangeIntervalDays, tEnd)) {
      at(t, 40, (y) => {
        ledger.nitrateBeforeLastChange = y[IX.no3];
        return adopt(waterChange(c, m.waterChangeFraction, m.gravelCleaningFraction, t, y));
      });
    }
  }

  const fl = s.filter;
  if (!explicit && fl.cleaningIntervalDays > 0) {
    const share = scenarioBacteriaShare(s);
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
      if (explicit) return;
      for (const t of periodicTimes(g.trim.everyDays, tEnd)) at(t, 50 + i, (y) => trimGroup(i, t, y));
    } else if (g.trim.rule === "whenFull" && pinnedTrimDays?.[i]) {
      for (const t of pinnedTrimDays[i]!) if (t >= 0 && t < tEnd) at(t, 50 + i, (y) => trimGroup(i, t, y));
    } else if (g.trim.rule === "whenFull") {
      watches.push({ index: PLANT0 + i, threshold: g.trim.fullAtFraction * g.maxMassG });
      watchGroup.push(i);
    }
  });

  const fc = s.fishlessCycling;
  if (!explicit && fc.enabled && fc.doseMgNPerL > 0) {
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
    for (const t of periodicTimes(1 / c.feedsPerDay, tEnd, 0)) at(t, 20, (y) => adopt(meal(rates, t, y)));
  }

  return { events, watches, onCrossing: (w, t, y) => trimGroup(watchGroup[w], t, y), ledger, rates };
}
