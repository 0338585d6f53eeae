/**
 * A replay's events ("these events on these days", ./tank-events.ts) as scheduled jumps. With
 * the same events the periodic schedule would make, the arithmetic is the same, so the replay
 * equals the scenario run (tests/models/explicit-schedule.test.ts).
 */
import { ModelError } from "../core/errors";
import type { EventOutcome, ScheduledEvent } from "../core/events";
import type { Effect } from "./event-effects";
import { addPlants, dose, filterCleaning, gravelCleaning, trim, waterChange } from "./event-effects";
import type { Scenario } from "./scenario";
import type { Ledger } from "./schedule";
import { IX, PLANT0 } from "./state";
import type { TankConstants } from "./tank-constants";
import { deriveConstants } from "./tank-constants";
import type { TankEvent } from "./tank-events";

type Mutable<T> = { -readonly [K in keyof T]: T[K] };

/** The change water's make-up for one water change: the scenario's unless the journal says otherwise. */
function changeWater(s: Scenario, c: TankConstants, e: Extract<TankEvent, { kind: "waterChange" }>): TankConstants {
  if (e.tapNitrate === null && e.roShare === null) return c;
  const blend = 1 - (e.roShare ?? s.tapWater.roShare);
  return {
    ...c,
    changeTan: s.tapWater.tan * blend,
    changeNo3: (e.tapNitrate ?? s.tapWater.nitrate) * blend,
    changeKh: s.tapWater.khDkh * blend,
  };
}

/** The feed-dependent constants at a new daily feed (the scenario's other feeding settings kept). */
function feedRates(s: Scenario, feedGPerDay: number) {
  const k = deriveConstants({ ...s, fish: { ...s.fish, feedGPerDay } });
  return { feedN: k.feedN, fishO2: k.fishO2, gutIn: k.gutIn, uneatenToDetritus: k.uneatenToDetritus };
}

export function explicitEvents(
  s: Scenario,
  c: TankConstants,
  rates: Mutable<TankConstants>,
  tEnd: number,
  list: readonly TankEvent[],
  ledger: Ledger,
  adopt: (e: Effect) => EventOutcome,
): ScheduledEvent[] {
  const out: ScheduledEvent[] = [];
  const at = (t: number, order: number, apply: (y: readonly number[]) => EventOutcome) => {
    if (t < tEnd) out.push({ t, order, apply });
  };
  const groupIndex = (id: string) => {
    const i = s.plants.findIndex((g) => g.id === id);
    if (i < 0) throw new ModelError("INVALID", `The journal names a plant group “${id}” the scenario does not have.`);
    return i;
  };
  // Feed changes: the rate is piecewise constant, so its total is a sum of exact products.
  const feedChanges = list
    .filter((e): e is Extract<TankEvent, { kind: "feeding" }> => e.kind === "feeding" && e.day < tEnd)
    .sort((a, b) => a.day - b.day);
  if (feedChanges.length > 0) {
    let total = 0;
    let since = 0;
    let rate = c.feedN;
    for (const f of feedChanges) {
      const next = feedRates(s, f.feedGPerDay);
      total += rate * (f.day - since);
      since = f.day;
      rate = next.feedN;
      at(f.day, 5, (y) => {
        Object.assign(rates, next);
        const detail = `Feeding changed to ${f.feedGPerDay} g a day`;
        return { y: y.slice(), records: [{ day: f.day, kind: "feedingChanged", detail }] };
      });
    }
    ledger.feedContinuousMgN = total + rate * (tEnd - since);
  }
  for (const e of list) {
    const t = e.day;
    switch (e.kind) {
      case "waterChange": {
        const water = changeWater(s, c, e);
        at(t, 40, (y) => {
          ledger.nitrateBeforeLastChange = y[IX.no3];
          return adopt(waterChange(water, e.fraction, e.gravelFraction, t, y));
        });
        break;
      }
      case "filterCleaning":
        at(t, 30, (y) => adopt(filterCleaning(e.sludgeFraction, e.bacteriaShare, e.inTapWater, t, y)));
        break;
      case "gravelCleaning":
        at(t, 41, (y) => adopt(gravelCleaning(e.fraction, t, y)));
        break;
      case "plants": {
        const i = groupIndex(e.groupId);
        const name = s.plants[i].name;
        at(t, 50 + i, (y) =>
          adopt(
            e.changeG >= 0
              ? addPlants(c, i, name, e.changeG, t, y)
              : trim(c, i, name, Math.max(0, y[PLANT0 + i] + e.changeG), t, y),
          ),
        );
        break;
      }
      case "trim": {
        const i = groupIndex(e.groupId);
        at(t, 50 + i, (y) => adopt(trim(c, i, s.plants[i].name, e.toG, t, y)));
        break;
      }
      case "dose":
        at(t, 10, (y) => adopt(dose(c, e.mgNPerL, t, y)));
        break;
      case "feeding":
        break;
    }
  }
  return out;
}
