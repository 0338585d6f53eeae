/**
 * Warnings, not errors: a run that finished but whose settings are far beyond what a tank of
 * that size can carry, or whose water would harm fish. Each has a code for the app, a sentence
 * for people, the value behind it, its unit, the limit it crossed and the day (null when it is
 * about the settings rather than a moment).
 */
import { EATEN_N_SPLIT, tanFromFeed } from "./chemistry";
import { worstChronicWindow } from "./chronic-exposure";
import { ammoniaCriteria } from "./criteria";
import { OXYGEN } from "./parameters";
import { KH_EXHAUSTED_DKH, type Extremes, type Trace } from "./recorder";
import type { ModelWarning } from "./result";
import { round6, roundDay } from "./result";
import type { Scenario } from "./scenario";
import { deriveConstants, type TankConstants } from "./tank-constants";
import type { TankEvent } from "./tank-events";

/** Feed per litre per day above which stocking is far beyond usual aquarium practice (g/L/day). */
const HEAVY_FEEDING_G_PER_L_DAY = 0.03; // common practice, no source (a crowded tank is ~0.01)
/** Dissolved nitrogen above which the numbers are outside anything a tank with life could hold (mg N/L). */
const OUTSIDE_RANGE_MG_N_PER_L = 500; // model choice, no source

/**
 * Oxygen the feed needs once fully processed (mg O2/day): the fish's respiration, nitrifying
 * the TAN they excrete (Timmons & Ebeling's 0.092 factor, then 4.57 g O2 per g N) and
 * mineralising and nitrifying the faeces and leftovers.
 */
function feedOxygenDemand(s: Scenario, c: TankConstants): number {
  const feedG = s.fish.feedGPerDay * s.multipliers.feedLoad;
  const excretedTan = tanFromFeed(feedG * c.eatenShare, s.fish.proteinFraction) * 1000;
  const toDetritus = c.feedN * (c.eatenShare * EATEN_N_SPLIT.faeces + (c.leftoversRemoved ? 0 : 1 - c.eatenShare));
  const nitrify = c.o2PerAmmonium + c.o2PerNitrite;
  return c.fishO2 + excretedTan * nitrify + toDetritus * (c.o2PerOrganicN + nitrify);
}

/** Most oxygen the air can bring in per day (mg O2/day): exchange at full deficit. */
function oxygenSupplyCeiling(c: TankConstants): number {
  return (c.kla * c.volumeL + c.dripLPerDay) * c.o2Sat;
}

/**
 * The heaviest feeding of the run: the scenario's own, or a logged feeding change (a journal's
 * replay) above it, with the day it starts (null for the scenario's own, which holds throughout).
 */
function heaviestFeeding(s: Scenario, c: TankConstants, events: readonly TankEvent[], tEnd: number) {
  let heaviest = { feedGPerDay: s.fish.feedGPerDay, day: null as number | null, s, c };
  for (const e of events) {
    if (e.kind !== "feeding" || e.day >= tEnd || e.feedGPerDay <= heaviest.feedGPerDay) continue;
    const fed = { ...s, fish: { ...s.fish, feedGPerDay: e.feedGPerDay } };
    heaviest = { feedGPerDay: e.feedGPerDay, day: e.day, s: fed, c: deriveConstants(fed) };
  }
  return heaviest;
}

export function findWarnings(
  s: Scenario,
  c: TankConstants,
  trace: Trace,
  extremes: Extremes,
  events: readonly TankEvent[] = [],
): ModelWarning[] {
  const out: ModelWarning[] = [];
  const V = c.volumeL;
  // Both feeding warnings judge the heaviest feeding of the run, so a logged change to far more
  // food is flagged as the scenario's own feeding would be, dated the day it began.
  const fed = heaviestFeeding(s, c, events, s.run.lengthDays);
  const from = fed.day === null ? "" : `From day ${roundDay(fed.day)}, when the feeding was changed, `;
  const feedPerL = (fed.feedGPerDay * s.multipliers.feedLoad) / V;
  const demand = feedOxygenDemand(fed.s, fed.c);
  const supply = oxygenSupplyCeiling(c);
  if (demand > supply) {
    const said = `the food needs about ${Math.round(demand)} mg of oxygen a day, more than the water's surface and filter can take up (${Math.round(supply)} mg a day at most): no tank of ${round6(V)} L could carry this feeding.`;
    out.push({
      code: "feedBeyondOxygenSupply",
      severity: "implausible",
      message: from ? from + said : said[0].toUpperCase() + said.slice(1),
      value: round6(demand / supply),
      unit: "× the oxygen supply",
      limit: 1,
      day: fed.day === null ? null : roundDay(fed.day),
    });
  }
  if (feedPerL > HEAVY_FEEDING_G_PER_L_DAY) {
    out.push({
      code: "heavyFeedingForVolume",
      severity: "implausible",
      message: `${from}${round6(feedPerL)} g of food per litre a day is far beyond what aquaria are stocked for; check the food per day and the water volume.`,
      value: round6(feedPerL),
      unit: "g/L/day",
      limit: HEAVY_FEEDING_G_PER_L_DAY,
      day: fed.day === null ? null : roundDay(fed.day),
    });
  }
  const caution = OXYGEN.cautionMgPerL.value;
  if (extremes.o2Low.value < caution) {
    out.push({
      code: "lowOxygen",
      severity: "caution",
      message: `Dissolved oxygen falls to ${round6(Math.max(extremes.o2Low.value, 0))} mg/L, below the ${caution} mg/L fish need: more surface movement or less food.`,
      value: round6(Math.max(extremes.o2Low.value, 0)),
      unit: "mg O2/L",
      limit: caution,
      // The day it first falls below (when to act), the value its lowest.
      day: roundDay(extremes.o2LowFrom ?? extremes.o2Low.day),
    });
  }
  // Ammonia against the US EPA (2013) criteria at each step's pH (every solver step and sample,
  // so a peak between chart samples counts). A tank cycled without fish
  // is meant to carry ammonia: the advice is then to wait before adding fish.
  const fishless = s.fish.feedGPerDay === 0 && s.fishlessCycling.enabled;
  const advice = fishless
    ? " Add fish only once the tank has cycled and ammonia and nitrite read zero."
    : " Test the water and change some of it now.";
  let acute = { ratio: 0, value: 0, limit: 0, day: 0 };
  for (let k = 0; k < trace.t.length; k++) {
    const limit = ammoniaCriteria(trace.ph[k], c.temperatureC).acuteTanMgNPerL;
    const ratio = trace.tan[k] / limit;
    if (ratio > acute.ratio) acute = { ratio, value: trace.tan[k], limit, day: trace.t[k] };
  }
  if (acute.ratio > 1) {
    out.push({
      code: "ammoniaAboveAcuteCriterion",
      severity: "caution",
      message: `Total ammonia reaches ${round6(acute.value)} mg N/L, above the acute criterion of ${round6(acute.limit)} at this pH and temperature (US EPA 2013): deadly to many fish within hours.${advice}`,
      value: round6(acute.value),
      unit: "mg N/L",
      limit: round6(acute.limit),
      day: roundDay(acute.day),
    });
  }
  // Each window against the criterion at its own average pH (chronic-exposure.ts).
  const month = worstChronicWindow(trace, c.temperatureC, 30);
  const fourDays = worstChronicWindow(trace, c.temperatureC, 4, 2.5);
  if (month.value > month.limit || fourDays.value > fourDays.limit) {
    const byMonth = month.value > month.limit;
    const crossed = byMonth ? month : fourDays;
    out.push({
      code: "ammoniaAboveChronicCriterion",
      severity: "caution",
      message: byMonth
        ? `Total ammonia averages ${round6(month.value)} mg N/L over 30 days, above the chronic criterion of ${round6(month.limit)} at the pH of those days (US EPA 2013).${advice}`
        : `Total ammonia averages ${round6(fourDays.value)} mg N/L over 4 days, above 2.5 times the chronic criterion (${round6(fourDays.limit)}) at the pH of those days (US EPA 2013).${advice}`,
      value: round6(crossed.value),
      unit: "mg N/L",
      limit: round6(crossed.limit),
      day: roundDay(crossed.day),
    });
  }
  // Also when the tank starts below the line: the bacteria stall from day 0 and nothing buffers pH.
  if (extremes.khLow.value < KH_EXHAUSTED_DKH) {
    out.push({
      code: "khExhausted",
      severity: "caution",
      message: `KH is used up (down to ${round6(Math.max(extremes.khLow.value, 0))} dKH): the filter bacteria stall and pH can crash. Change water or add buffer.`,
      value: round6(Math.max(extremes.khLow.value, 0)),
      unit: "dKH",
      limit: KH_EXHAUSTED_DKH,
      // The day it first runs out (when to act), the value its lowest.
      day: roundDay(extremes.khExhaustedFrom ?? extremes.khLow.day),
    });
  }
  const highest = [extremes.tan, extremes.no2, extremes.no3].reduce((a, b) => (b.value > a.value ? b : a));
  if (highest.value > OUTSIDE_RANGE_MG_N_PER_L) {
    out.push({
      code: "outsideModelRange",
      severity: "implausible",
      message: `Dissolved nitrogen reaches ${round6(highest.value)} mg N/L, far outside anything a tank with living fish or plants could hold; the model's numbers mean little here.`,
      value: round6(highest.value),
      unit: "mg N/L",
      limit: OUTSIDE_RANGE_MG_N_PER_L,
      day: roundDay(highest.day),
    });
  }
  return out;
}
