/**
 * Everything the right-hand side needs, computed once per run from a scenario: rates at the
 * tank's temperature, capacities, stoichiometric factors and the change water's make-up.
 */
import { EATEN_N_SPLIT, FEED_N, freeAmmoniaFraction, oxygenSaturation } from "./chemistry";
import { zoneCapacity } from "./low-oxygen-zones";
import {
  AOB,
  BACTERIA,
  CARDINAL_TEMPERATURES as CT,
  INHIBITION,
  LOW_OXYGEN,
  NOB,
  ORGANICS,
  OXYGEN,
  PLANT_UPTAKE,
} from "./parameters";
import type { Scenario } from "./scenario";
import { relativeGrowth } from "./temperature";

export interface TankConstants {
  readonly volumeL: number;
  readonly temperatureC: number;
  readonly ph0: number;
  readonly kh0: number;
  readonly phFollowsKh: boolean;
  /** NH3 fraction at the fixed pH (used when pH does not follow KH). */
  readonly fnh3Fixed: number;
  // Nitrifiers at the tank temperature
  readonly aobQ: number; // mg N oxidised per mg biomass N per day (max)
  readonly aobK: number;
  readonly aobYield: number; // mg biomass N per mg N oxidised
  readonly aobDecay: number;
  readonly aobMax: number; // carrying capacity, mg N
  readonly aobFloor: number; // resident population that does not decay, mg N
  readonly nobQ: number;
  readonly nobK: number;
  readonly nobYield: number;
  readonly nobDecay: number;
  readonly nobMax: number;
  readonly nobFloor: number;
  readonly khHalf2: number;
  // Inhibition (mg N/L of free ammonia or free nitrous acid)
  readonly faOnAob: number;
  readonly faOnNob: number;
  readonly fnaOnBoth: number;
  // Oxygen
  readonly o2Sat: number; // mg/L
  readonly kla: number; // 1/day, surface and filter together
  readonly aobKo: number;
  readonly nobKo: number;
  readonly o2PerAmmonium: number;
  readonly o2PerNitrite: number;
  readonly fishO2: number; // mg O2/day at plentiful oxygen
  readonly fishKo: number;
  readonly o2PerOrganicN: number;
  readonly hetKo: number;
  readonly plantO2PerG: number;
  readonly plantO2PerNitrateN: number;
  // Feed and organics
  /** Feed N offered per day (mg N/day, after the feed-load multiplier). */
  readonly feedN: number;
  readonly eatenShare: number;
  readonly leftoversRemoved: boolean;
  readonly pulsedFeeding: boolean;
  readonly feedsPerDay: number;
  /** Continuous input into the gut (mg N/day; 0 when meals are pulses). */
  readonly gutIn: number;
  /** Continuous uneaten food to tank detritus (mg N/day). */
  readonly uneatenToDetritus: number;
  readonly gutRelease: number;
  /** Share of gut release that becomes TAN (TAN + urea) and faeces (sum 1). */
  readonly gutToTan: number;
  readonly gutToFaeces: number;
  readonly trapRate: number;
  readonly mineralisation: number;
  // Water exchange
  readonly dripLPerDay: number;
  /** Change water after blending tap and RO water. */
  readonly changeTan: number;
  readonly changeNo3: number;
  readonly changeKh: number;
  // Plants
  readonly plantCount: number;
  readonly plantRate: Float64Array; // 1/day, after multiplier and temperature
  readonly plantMax: Float64Array; // g
  readonly plantNmg: Float64Array; // mg N per g dry mass
  readonly plantKa: number;
  readonly plantKn: number;
  readonly plantKi: number;
  // Low-oxygen zones
  readonly denitCap: number;
  readonly denitK: number;
  /** Organic N (tank + filter, mg) at which carbon halves denitrification. */
  readonly denitOrgK: number;
  /** Organic N mineralised per mg NO3-N denitrified (its carbon is the electron donor). */
  readonly denitOrgPerN: number;
  /** Oxygen inside the zones per mg/L in the water. */
  readonly zoneO2Share: number;
  readonly denitKi: number;
  readonly anammoxCap: number;
  readonly anammoxKa: number;
  readonly anammoxKn: number;
  readonly anammoxKi: number;
}

const arrhenius = (theta: number, t: number) => Math.pow(theta, t - 20);
const aobCardinal = { min: CT.aobMin.value, opt: CT.aobOpt.value, max: CT.aobMax.value };
const nobCardinal = { min: CT.nobMin.value, opt: CT.nobOpt.value, max: CT.nobMax.value };
const plantCardinal = { min: CT.plantMin.value, opt: CT.plantOpt.value, max: CT.plantMax.value };

/** Maximum growth rate (1/day) at `t` °C: the 20 °C value scaled by the cardinal temperature model. */
function nitrifierGrowth(p: typeof AOB | typeof NOB, t: number): number {
  return p.muMax.value * relativeGrowth(t, 20, p === AOB ? aobCardinal : nobCardinal);
}

/** Plant growth at `t` °C relative to the growth rate the keeper states (at 25 °C). */
function plantTemperatureFactor(t: number): number {
  return relativeGrowth(t, CT.plantReference.value, plantCardinal);
}

/** Surface plus filter exchange coefficient (1/day) for a scenario. */
function exchangeRate(s: Scenario): number {
  const surface = {
    still: OXYGEN.exchangeStill.value,
    gentle: OXYGEN.exchangeGentle.value,
    rippling: OXYGEN.exchangeRippling.value,
    strong: OXYGEN.exchangeStrong.value,
  }[s.water.surfaceAgitation];
  return surface + s.filter.turnoverPerHour * 24 * OXYGEN.filterPassEfficiency.value;
}

/**
 * Carrying capacity (mg biomass N) such that a fully grown biofilm oxidises `capacity`
 * mg N/day at the reference concentration and temperature. With crowding loss
 * g·B/Bmax and decay b·B, the full biomass at substrate factor f satisfies
 * μ f (1 − B/Bmax) = b, and oxidation q f B = capacity.
 */
function carryingCapacity(capacity: number, p: typeof AOB | typeof NOB, sRef: number): number {
  const tRef = BACTERIA.capacityReferenceTemperature.value;
  const mu = nitrifierGrowth(p, tRef);
  const b = p.decay.value * arrhenius(p.thetaDecay.value, tRef);
  const q = mu / (p.yield.value * BACTERIA.nitrogenPerVss.value);
  const f = sRef / (p.halfSaturation.value + sRef);
  const full = 1 - b / (mu * f);
  return capacity / (q * f * Math.max(full, 0.05));
}

export function deriveConstants(s: Scenario): TankConstants {
  const T = s.water.temperatureC;
  const fN = BACTERIA.nitrogenPerVss.value;
  const capacity = s.filter.capacityMgTanPerDay * s.multipliers.nitrifierCapacity;
  const feedN = s.fish.feedGPerDay * s.fish.proteinFraction * FEED_N.nitrogenInProtein * 1000 * s.multipliers.feedLoad;
  const eaten = s.fish.fractionEaten;
  const kept = 1 - EATEN_N_SPLIT.fishGrowth;
  const pulsed = s.fish.pulsedFeeding;
  const blend = 1 - s.tapWater.roShare;
  const lo = s.lowOxygen;
  const aobMax = carryingCapacity(capacity, AOB, BACTERIA.capacityReferenceTan.value);
  const nobMax = carryingCapacity(capacity * BACTERIA.nobCapacityRatio.value, NOB, BACTERIA.capacityReferenceTan.value);
  const floor = BACTERIA.residentFloorFraction.value;
  const plantT = plantTemperatureFactor(T);
  return {
    volumeL: s.water.volumeL,
    temperatureC: T,
    ph0: s.water.pH,
    kh0: s.water.khDkh,
    phFollowsKh: s.water.phFollowsKh,
    fnh3Fixed: freeAmmoniaFraction(T, s.water.pH),
    aobQ: nitrifierGrowth(AOB, T) / (AOB.yield.value * fN),
    aobK: AOB.halfSaturation.value,
    aobYield: AOB.yield.value * fN,
    aobDecay: AOB.decay.value * arrhenius(AOB.thetaDecay.value, T),
    aobMax,
    aobFloor: floor * aobMax,
    nobQ: nitrifierGrowth(NOB, T) / (NOB.yield.value * fN),
    nobK: NOB.halfSaturation.value,
    nobYield: NOB.yield.value * fN,
    nobDecay: NOB.decay.value * arrhenius(NOB.thetaDecay.value, T),
    nobMax,
    nobFloor: floor * nobMax,
    khHalf2: BACTERIA.khHalfSaturation.value ** 2,
    faOnAob: INHIBITION.freeAmmoniaOnAob.value,
    faOnNob: INHIBITION.freeAmmoniaOnNob.value,
    fnaOnBoth: INHIBITION.freeNitrousAcid.value,
    o2Sat: oxygenSaturation(T),
    kla: exchangeRate(s),
    aobKo: OXYGEN.aobHalfSaturation.value,
    nobKo: OXYGEN.nobHalfSaturation.value,
    o2PerAmmonium: OXYGEN.perAmmoniumOxidised.value,
    o2PerNitrite: OXYGEN.perNitriteOxidised.value,
    fishO2: s.fish.feedGPerDay * s.multipliers.feedLoad * eaten * OXYGEN.fishPerFeed.value,
    fishKo: OXYGEN.fishHalfSaturation.value,
    o2PerOrganicN: OXYGEN.perOrganicNMineralised.value,
    hetKo: OXYGEN.heterotrophHalfSaturation.value,
    plantO2PerG: OXYGEN.plantsPerDryMass.value,
    plantO2PerNitrateN: OXYGEN.plantsPerNitrateN.value,
    feedN,
    eatenShare: eaten,
    leftoversRemoved: s.fish.leftoversRemoved,
    pulsedFeeding: pulsed,
    feedsPerDay: s.fish.feedsPerDay,
    gutIn: pulsed ? 0 : feedN * eaten * kept,
    uneatenToDetritus: pulsed || s.fish.leftoversRemoved ? 0 : feedN * (1 - eaten),
    gutRelease: ORGANICS.gutRelease.value,
    gutToTan: (EATEN_N_SPLIT.tan + EATEN_N_SPLIT.urea) / kept,
    gutToFaeces: EATEN_N_SPLIT.faeces / kept,
    trapRate: ORGANICS.trapRate.value,
    mineralisation: ORGANICS.mineralisation.value * arrhenius(ORGANICS.mineralisationTheta.value, T),
    dripLPerDay: s.maintenance.dripLPerDay,
    changeTan: s.tapWater.tan * blend,
    changeNo3: s.tapWater.nitrate * blend,
    changeKh: s.tapWater.khDkh * blend,
    plantCount: s.plants.length,
    plantRate: Float64Array.from(s.plants, (g) => g.growthRatePerDay * s.multipliers.plantUptake * plantT),
    plantMax: Float64Array.from(s.plants, (g) => g.maxMassG),
    plantNmg: Float64Array.from(s.plants, (g) => g.nitrogenContent * 1000),
    plantKa: PLANT_UPTAKE.ammoniumHalfSaturation.value,
    plantKn: PLANT_UPTAKE.nitrateHalfSaturation.value,
    plantKi: PLANT_UPTAKE.nitrateInhibitionByAmmonium.value,
    denitCap: zoneCapacity(s)?.usedMgNPerDay ?? 0,
    denitK: LOW_OXYGEN.denitrificationNitrateHalfSaturation.value,
    denitOrgK: LOW_OXYGEN.organicHalfSaturation.value * s.water.volumeL,
    denitOrgPerN: LOW_OXYGEN.codPerNitrateN.value / OXYGEN.perOrganicNMineralised.value,
    zoneO2Share: LOW_OXYGEN.oxygenReachingZone.value,
    denitKi: LOW_OXYGEN.denitrificationOxygenInhibition.value,
    anammoxCap: lo.enabled && lo.anammoxEnabled ? lo.anammoxCapacityMgNPerDay : 0,
    anammoxKa: LOW_OXYGEN.anammoxAmmoniumHalfSaturation.value,
    anammoxKn: LOW_OXYGEN.anammoxNitriteHalfSaturation.value,
    anammoxKi: LOW_OXYGEN.anammoxOxygenInhibition.value,
  };
}
