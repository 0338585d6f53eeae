/**
 * The nitrogen budget: where every milligram of nitrogen came from and went, over a run.
 * All values in mg N, cumulative from day 0 to the end.
 */
import { EATEN_N_SPLIT } from "./chemistry";
import { IX } from "./state";
import type { Stocks } from "./stocks";
import type { TankConstants } from "./tank-constants";

/** Flows booked at discrete events (and the analytic continuous ones), in mg N. */
export interface EventFlows {
  feed: number;
  tapWaterByChanges: number;
  dosing: number;
  /** Plant mass a keeper put in (a replayed journal), as N. */
  plantsAdded: number;
  waterChanges: number;
  trims: number;
  trimsByGroup: number[];
  fishGrowth: number;
  leftoversRemoved: number;
  filterCleaning: number;
  gravelCleaning: number;
  /** Eaten feed N put into the fish by meals (pulsed feeding). */
  eatenIntoGut: number;
}

/** Flow amounts an event books (mg N), by name; trims also say which group. */
export type FlowBooking = Partial<Record<Exclude<keyof EventFlows, "trimsByGroup">, number>> & {
  readonly trimmedGroup?: { readonly index: number; readonly mgN: number; readonly dryG: number };
};

/** Add one event's booking to the running flows (and the trimmed dry mass per group). */
export function bookFlows(flows: EventFlows, trimmedG: number[], booking: FlowBooking): void {
  for (const [key, value] of Object.entries(booking)) {
    if (key === "trimmedGroup" || typeof value !== "number") continue;
    flows[key as Exclude<keyof EventFlows, "trimsByGroup">] += value;
  }
  const t = booking.trimmedGroup;
  if (t) {
    flows.trims += t.mgN;
    flows.trimsByGroup[t.index] += t.mgN;
    trimmedG[t.index] += t.dryG;
  }
}

export function emptyFlows(plantCount: number): EventFlows {
  return {
    feed: 0,
    tapWaterByChanges: 0,
    dosing: 0,
    plantsAdded: 0,
    waterChanges: 0,
    trims: 0,
    trimsByGroup: new Array<number>(plantCount).fill(0),
    fishGrowth: 0,
    leftoversRemoved: 0,
    filterCleaning: 0,
    gravelCleaning: 0,
    eatenIntoGut: 0,
  };
}

export interface NitrogenBudget {
  /** mg N brought in. */
  inputs: {
    feed: number;
    /** Tap (blended) water: water changes plus drip. */
    tapWater: number;
    dosing: number;
    /** Plants put into the tank (only in a replayed journal). */
    plantsAdded: number;
    total: number;
  };
  /** mg N taken out or lost. */
  outputs: {
    /** Dissolved N (TAN, nitrite, nitrate) removed with changed water. */
    waterChanges: number;
    /** Dissolved N carried out by a continuous drip. */
    drip: number;
    trims: number;
    /** N2 gas from denitrification. */
    denitrificationN2: number;
    /** N2 gas from anammox. */
    anammoxN2: number;
    /** N kept by the fish as growth (Timmons & Ebeling: 0.8 × 0.2 of eaten N). */
    fishGrowth: number;
    /** Uneaten food taken out. */
    leftoversRemoved: number;
    /** Sludge and bacteria removed when cleaning the filter. */
    filterCleaning: number;
    /** Detritus siphoned from the gravel at water changes. */
    gravelCleaning: number;
    total: number;
  };
  stockStart: Stocks;
  stockEnd: Stocks;
  /** Where the eaten and uneaten feed N went (mg N); sums to inputs.feed minus the food still in the fish. */
  feedFate: {
    excretedAsTan: number;
    excretedAsUrea: number;
    faeces: number;
    fishGrowth: number;
    uneatenToDetritus: number;
    uneatenRemoved: number;
    stillInFish: number;
  };
  /** inputs − outputs − (stock end − stock start), mg N. */
  imbalance: number;
  /** |imbalance| relative to (stock at start + inputs). */
  imbalanceRelative: number;
}

export function buildBudget(
  c: TankConstants,
  tEnd: number,
  yEnd: readonly number[],
  start: Stocks,
  end: Stocks,
  flows: EventFlows,
  /** Continuous feed N over the run when the rate changed during it (a replayed journal). */
  feedContinuousMgN?: number,
): NitrogenBudget {
  // Continuous feeding is a constant rate (or constant between changes): its totals are exact products.
  const feedContinuous = c.pulsedFeeding ? 0 : (feedContinuousMgN ?? c.feedN * tEnd);
  const eatenContinuous = feedContinuous * c.eatenShare;
  const uneatenContinuous = feedContinuous - eatenContinuous;
  const fishGrowth = flows.fishGrowth + eatenContinuous * EATEN_N_SPLIT.fishGrowth;
  const leftoversRemoved = flows.leftoversRemoved + (c.leftoversRemoved ? uneatenContinuous : 0);
  const dripIn = c.dripLPerDay * (c.changeTan + c.changeNo3) * tEnd;

  const inputs = {
    feed: flows.feed + feedContinuous,
    tapWater: flows.tapWaterByChanges + dripIn,
    dosing: flows.dosing,
    plantsAdded: flows.plantsAdded,
    total: 0,
  };
  inputs.total = inputs.feed + inputs.tapWater + inputs.dosing + inputs.plantsAdded;
  const outputs = {
    waterChanges: flows.waterChanges,
    drip: yEnd[IX.dripOut],
    trims: flows.trims,
    denitrificationN2: yEnd[IX.n2Denit],
    anammoxN2: yEnd[IX.n2Anammox],
    fishGrowth,
    leftoversRemoved,
    filterCleaning: flows.filterCleaning,
    gravelCleaning: flows.gravelCleaning,
    total: 0,
  };
  outputs.total =
    outputs.waterChanges +
    outputs.drip +
    outputs.trims +
    outputs.denitrificationN2 +
    outputs.anammoxN2 +
    outputs.fishGrowth +
    outputs.leftoversRemoved +
    outputs.filterCleaning +
    outputs.gravelCleaning;

  // Food released by the fish = what went in minus the change in what is still inside.
  const intoGut = flows.eatenIntoGut + eatenContinuous * (1 - EATEN_N_SPLIT.fishGrowth);
  const released = intoGut - (end.fishGut - start.fishGut);
  const kept = 1 - EATEN_N_SPLIT.fishGrowth;
  const uneatenTotal = inputs.feed * (1 - c.eatenShare);
  const feedFate = {
    excretedAsTan: (released * EATEN_N_SPLIT.tan) / kept,
    excretedAsUrea: (released * EATEN_N_SPLIT.urea) / kept,
    faeces: (released * EATEN_N_SPLIT.faeces) / kept,
    fishGrowth,
    uneatenToDetritus: uneatenTotal - leftoversRemoved,
    uneatenRemoved: leftoversRemoved,
    stillInFish: end.fishGut,
  };

  const imbalance = inputs.total - outputs.total - (end.total - start.total);
  const scale = Math.max(start.total + inputs.total, 1e-9);
  return {
    inputs,
    outputs,
    stockStart: start,
    stockEnd: end,
    feedFate,
    imbalance,
    imbalanceRelative: Math.abs(imbalance) / scale,
  };
}
