/**
 * What each tank event does, as pure functions: the state before → the state after, the flows
 * to book (mg N) and a sentence for people. Nothing here changes its input.
 */
import type { EventRecord } from "../core/events";
import type { FlowBooking } from "./budget";
import { EATEN_N_SPLIT } from "./chemistry";
import { IX, PLANT0 } from "./state";
import type { TankConstants } from "./tank-constants";

export interface Effect {
  readonly y: number[];
  readonly booking: FlowBooking;
  readonly records: EventRecord[];
}

const pct = (f: number) => `${Math.round(f * 100)} %`;
const mg = (x: number) => `${x >= 100 ? Math.round(x) : Number(x.toPrecision(3))} mg N`;

/** A fraction `f` of the water replaced by change water (at oxygen saturation); a share `gravel` of tank detritus siphoned. */
export function waterChange(
  c: TankConstants,
  f: number,
  gravel: number,
  day: number,
  before: readonly number[],
): Effect {
  const y = before.slice();
  const out = f * c.volumeL * (y[IX.tan] + y[IX.no2] + y[IX.no3]);
  const inN = f * c.volumeL * (c.changeTan + c.changeNo3);
  y[IX.tan] += f * (c.changeTan - y[IX.tan]);
  y[IX.no2] -= f * y[IX.no2];
  y[IX.no3] += f * (c.changeNo3 - y[IX.no3]);
  y[IX.kh] += f * (c.changeKh - y[IX.kh]);
  y[IX.o2] += f * (c.o2Sat - y[IX.o2]);
  const siphoned = gravel * y[IX.orgW];
  y[IX.orgW] -= siphoned;
  const gravelText = gravel > 0 ? `; ${pct(gravel)} of the detritus siphoned (${mg(siphoned)})` : "";
  return {
    y,
    booking: { waterChanges: out, tapWaterByChanges: inN, gravelCleaning: siphoned },
    records: [
      {
        day,
        kind: "waterChange",
        detail: `${pct(f)} of the water changed: ${mg(out)} out, ${mg(inN)} in${gravelText}`,
      },
    ],
  };
}

/** Filter cleaning: a share of the sludge out, and `bacteriaShare` of the nitrifiers lost. */
export function filterCleaning(
  sludgeShare: number,
  bacteriaShare: number,
  inTapWater: boolean,
  day: number,
  before: readonly number[],
): Effect {
  const y = before.slice();
  const sludge = sludgeShare * y[IX.orgF];
  const bacteria = bacteriaShare * (y[IX.aob] + y[IX.nob]);
  y[IX.orgF] -= sludge;
  y[IX.aob] -= bacteriaShare * y[IX.aob];
  y[IX.nob] -= bacteriaShare * y[IX.nob];
  const how = inTapWater ? "rinsed in tap water" : "rinsed in tank water";
  return {
    y,
    booking: { filterCleaning: sludge + bacteria },
    records: [
      {
        day,
        kind: "filterCleaning",
        detail: `Filter ${how}: ${mg(sludge)} of sludge out, ${pct(bacteriaShare)} of the bacteria lost`,
      },
    ],
  };
}

/** Cut plant group `index` back to `targetG` dry mass (nothing happens if it is not above it). */
export function trim(
  c: TankConstants,
  index: number,
  name: string,
  targetG: number,
  day: number,
  before: readonly number[],
): Effect {
  const cut = before[PLANT0 + index] - targetG;
  if (!(cut > 0)) return { y: before.slice(), booking: {}, records: [] };
  const y = before.slice();
  const n = cut * c.plantNmg[index];
  y[PLANT0 + index] = targetG;
  return {
    y,
    booking: { trimmedGroup: { index, mgN: n, dryG: cut } },
    records: [{ day, kind: "trim", detail: `${name}: ${Number(cut.toPrecision(3))} g dry trimmed out (${mg(n)})` }],
  };
}

/** An ammonia dose (fishless cycling), `doseMgNPerL` of TAN-N. */
export function dose(c: TankConstants, doseMgNPerL: number, day: number, before: readonly number[]): Effect {
  const y = before.slice();
  y[IX.tan] += doseMgNPerL;
  const total = doseMgNPerL * c.volumeL;
  return {
    y,
    booking: { dosing: total },
    records: [{ day, kind: "dose", detail: `+${doseMgNPerL} mg N/L (${mg(total)})` }],
  };
}

/** One meal (pulsed feeding): eaten food into the fish, leftovers to the tank detritus or out. */
export function meal(c: TankConstants, day: number, before: readonly number[]): Effect {
  const y = before.slice();
  const food = c.feedN / c.feedsPerDay;
  const eaten = food * c.eatenShare;
  const uneaten = food - eaten;
  const intoGut = eaten * (1 - EATEN_N_SPLIT.fishGrowth);
  y[IX.gut] += intoGut;
  if (!c.leftoversRemoved) y[IX.orgW] += uneaten;
  return {
    y,
    booking: {
      feed: food,
      fishGrowth: eaten * EATEN_N_SPLIT.fishGrowth,
      eatenIntoGut: intoGut,
      leftoversRemoved: c.leftoversRemoved ? uneaten : 0,
    },
    records: [{ day, kind: "feeding", detail: `Meal: ${mg(food)} in the food` }],
  };
}

/** Gravel siphoned without a water change: a share `f` of the tank's detritus out. */
export function gravelCleaning(f: number, day: number, before: readonly number[]): Effect {
  const y = before.slice();
  const siphoned = f * y[IX.orgW];
  y[IX.orgW] -= siphoned;
  return {
    y,
    booking: { gravelCleaning: siphoned },
    records: [
      { day, kind: "gravelCleaning", detail: `Gravel cleaned: ${pct(f)} of the detritus siphoned (${mg(siphoned)})` },
    ],
  };
}

/** Plants put in: `addedG` dry mass joins group `index`, bringing its nitrogen with it. */
export function addPlants(
  c: TankConstants,
  index: number,
  name: string,
  addedG: number,
  day: number,
  before: readonly number[],
): Effect {
  const y = before.slice();
  const n = addedG * c.plantNmg[index];
  y[PLANT0 + index] += addedG;
  return {
    y,
    booking: { plantsAdded: n },
    records: [
      { day, kind: "plantsAdded", detail: `${name}: ${Number(addedG.toPrecision(3))} g dry put in (${mg(n)})` },
    ],
  };
}
