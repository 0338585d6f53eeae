/**
 * The tank as an ODE: state layout, constants derived from a scenario, and the right-hand side.
 *
 * State (units):
 *   TAN, NO2, NO3       dissolved, mg N/L (TAN = NH3-N + NH4-N; the NH3 share is algebraic)
 *   orgW, orgF          organic N (uneaten food, faeces, dead cells) in the tank and in the filter, mg N
 *   aob, nob            ammonia- and nitrite-oxidiser biomass, mg N (biomass N = VSS × 0.1238)
 *   kh                  carbonate hardness, dKH
 *   gut                 nitrogen of eaten food not yet released by the fish, mg N
 *   n2Denit, n2Anammox  cumulative N2-N lost to the air, mg N (budget states)
 *   dripOut             cumulative N carried out by a continuous drip, mg N (budget state)
 *   plant[i]            dry mass of plant group i, g (N = mass × content × 1000 mg)
 *
 * Every process is written as a flux (mg N/day) taken from one pool and given to another, so
 * total nitrogen  V·(TAN+NO2+NO3) + pools + Σ plant N + cumulative losses  changes only by the
 * constant inputs (feed, drip-in water). That sum is a linear invariant, which the extrapolation
 * solver keeps to round-off. Each outflow vanishes as its pool empties (Monod or first order),
 * and turns into a small refill if the solver overshoots below zero, so pools stay non-negative
 * up to the solver tolerance.
 *
 * Time scales are kept moderate (fastest ~ hours) so odex, a non-stiff method, stays efficient:
 * the NH3/NH4⁺ split is algebraic, and an "established" filter starts at the biomass its load
 * supports rather than at full capacity.
 */
import {
  ANAMMOX,
  DKH_PER_MG_N_DENITRIFIED,
  DKH_PER_MG_N_NITRIFIED,
  EATEN_N_SPLIT,
  FEED_N,
  freeAmmoniaFraction,
  phFromKh,
} from "./chemistry";
import { AOB, BACTERIA, LOW_OXYGEN, NOB, ORGANICS, PLANT_UPTAKE } from "./parameters";
import type { Scenario } from "./scenario";

/** Indices of the fixed state components; plant groups follow from `PLANT0`. */
export const IX = {
  tan: 0,
  no2: 1,
  no3: 2,
  orgW: 3,
  orgF: 4,
  aob: 5,
  nob: 6,
  kh: 7,
  gut: 8,
  n2Denit: 9,
  n2Anammox: 10,
  dripOut: 11,
} as const;
export const PLANT0 = 12;

export const STATE_NAMES = [
  "TAN (mg N/L)",
  "nitrite-N (mg N/L)",
  "nitrate-N (mg N/L)",
  "detritus in tank (mg N)",
  "detritus in filter (mg N)",
  "ammonia oxidisers (mg N)",
  "nitrite oxidisers (mg N)",
  "KH (dKH)",
  "food in fish (mg N)",
  "N2 from denitrification (mg N)",
  "N2 from anammox (mg N)",
  "N out by drip (mg N)",
] as const;

/** Everything the right-hand side needs, computed once per run from the scenario. */
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
  readonly nobQ: number;
  readonly nobK: number;
  readonly nobYield: number;
  readonly nobDecay: number;
  readonly nobMax: number;
  readonly khHalf2: number;
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
  readonly plantRate: Float64Array; // 1/day, after multiplier
  readonly plantMax: Float64Array; // g
  readonly plantNmg: Float64Array; // mg N per g dry mass
  readonly plantKa: number;
  readonly plantKn: number;
  readonly plantKi: number;
  // Low-oxygen zones
  readonly denitCap: number;
  readonly denitK: number;
  readonly anammoxCap: number;
  readonly anammoxKa: number;
  readonly anammoxKn: number;
}

const arrhenius = (theta: number, t: number) => Math.pow(theta, t - 20);

/**
 * Carrying capacity (mg biomass N) such that a fully grown biofilm oxidises `capacity`
 * mg N/day at the reference concentration and temperature. With crowding loss
 * g·B/Bmax and decay b·B, the full biomass at substrate factor f satisfies
 * μ f (1 − B/Bmax) = b, and oxidation q f B = capacity.
 */
function carryingCapacity(
  capacity: number,
  p: {
    muMax: { value: number };
    halfSaturation: { value: number };
    yield: { value: number };
    decay: { value: number };
    thetaGrowth: { value: number };
    thetaDecay: { value: number };
  },
  sRef: number,
): number {
  const tRef = BACTERIA.capacityReferenceTemperature.value;
  const mu = p.muMax.value * arrhenius(p.thetaGrowth.value, tRef);
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
  const aobMu = AOB.muMax.value * arrhenius(AOB.thetaGrowth.value, T);
  const nobMu = NOB.muMax.value * arrhenius(NOB.thetaGrowth.value, T);
  const feedN = s.fish.feedGPerDay * s.fish.proteinFraction * FEED_N.nitrogenInProtein * 1000 * s.multipliers.feedLoad;
  const eaten = s.fish.fractionEaten;
  const kept = 1 - EATEN_N_SPLIT.fishGrowth;
  const pulsed = s.fish.pulsedFeeding;
  const blend = 1 - s.tapWater.roShare;
  const lo = s.lowOxygen;
  return {
    volumeL: s.water.volumeL,
    temperatureC: T,
    ph0: s.water.pH,
    kh0: s.water.khDkh,
    phFollowsKh: s.water.phFollowsKh,
    fnh3Fixed: freeAmmoniaFraction(T, s.water.pH),
    aobQ: aobMu / (AOB.yield.value * fN),
    aobK: AOB.halfSaturation.value,
    aobYield: AOB.yield.value * fN,
    aobDecay: AOB.decay.value * arrhenius(AOB.thetaDecay.value, T),
    aobMax: carryingCapacity(capacity, AOB, BACTERIA.capacityReferenceTan.value),
    nobQ: nobMu / (NOB.yield.value * fN),
    nobK: NOB.halfSaturation.value,
    nobYield: NOB.yield.value * fN,
    nobDecay: NOB.decay.value * arrhenius(NOB.thetaDecay.value, T),
    nobMax: carryingCapacity(capacity * BACTERIA.nobCapacityRatio.value, NOB, BACTERIA.capacityReferenceTan.value),
    khHalf2: BACTERIA.khHalfSaturation.value ** 2,
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
    plantRate: Float64Array.from(s.plants, (g) => g.growthRatePerDay * s.multipliers.plantUptake),
    plantMax: Float64Array.from(s.plants, (g) => g.maxMassG),
    plantNmg: Float64Array.from(s.plants, (g) => g.nitrogenContent * 1000),
    plantKa: PLANT_UPTAKE.ammoniumHalfSaturation.value,
    plantKn: PLANT_UPTAKE.nitrateHalfSaturation.value,
    plantKi: PLANT_UPTAKE.nitrateInhibitionByAmmonium.value,
    denitCap: lo.enabled ? lo.denitrificationCapacityMgNPerDay : 0,
    denitK: LOW_OXYGEN.denitrificationNitrateHalfSaturation.value,
    anammoxCap: lo.enabled && lo.anammoxEnabled ? lo.anammoxCapacityMgNPerDay : 0,
    anammoxKa: LOW_OXYGEN.anammoxAmmoniumHalfSaturation.value,
    anammoxKn: LOW_OXYGEN.anammoxNitriteHalfSaturation.value,
  };
}

/** pH at a given KH (constant unless the scenario says pH follows KH). */
export function phAt(c: TankConstants, khDkh: number): number {
  return c.phFollowsKh ? phFromKh(c.ph0, c.kh0, khDkh) : c.ph0;
}

/** Free-ammonia fraction of TAN at a given KH. */
export function fnh3At(c: TankConstants, khDkh: number): number {
  return c.phFollowsKh ? freeAmmoniaFraction(c.temperatureC, phAt(c, khDkh)) : c.fnh3Fixed;
}

/** Build the right-hand side dy/dt (units per day) for the given constants. */
export function makeRhs(c: TankConstants): (t: number, y: readonly number[]) => number[] {
  const V = c.volumeL;
  const invV = 1 / V;
  const np = c.plantCount;
  const dim = PLANT0 + np;
  const annN2 = ANAMMOX.n2NPerAmmonium;
  const annNo2 = ANAMMOX.nitritePerAmmonium;
  const annNo3 = ANAMMOX.nitratePerAmmonium;
  const annBio = ANAMMOX.biomassNPerAmmonium;
  return (_t, y) => {
    // Dissolved pools enter through the odd Monod factor m(X, K) = X / (K + |X|): a flux that
    // consumes X vanishes at X = 0 and turns into a small refill if the solver overshoots below
    // zero, so pools come back to 0 instead of drifting negative, and N is still conserved.
    // First-order pools (detritus, food in fish) enter linearly for the same reason.
    const S = y[0];
    const N2 = y[1];
    const N3 = y[2];
    const oW = y[3];
    const oF = y[4];
    // Biomass grows on itself: B = 0 is invariant, so it is clamped rather than restored.
    const BA = y[5] > 0 ? y[5] : 0;
    const BN = y[6] > 0 ? y[6] : 0;
    const KH = y[7] > 0 ? y[7] : 0;
    const G = y[8];
    const Sp = S > 0 ? S : 0;
    const absS = S < 0 ? -S : S;
    const absN2 = N2 < 0 ? -N2 : N2;
    const absN3 = N3 < 0 ? -N3 : N3;

    const kh2 = KH * KH;
    const fKH = kh2 / (kh2 + c.khHalf2);
    // Nitrification, step 1 (AOB): TAN → nitrite, with assimilation into biomass.
    const R1 = c.aobQ * fKH * (S / (c.aobK + absS)) * BA;
    const gA = c.aobYield * R1;
    const lossA = c.aobDecay * BA + (gA > 0 ? (gA * BA) / c.aobMax : 0);
    // Step 2 (NOB): nitrite → nitrate.
    const R2 = c.nobQ * fKH * (N2 / (c.nobK + absN2)) * BN;
    const gN = c.nobYield * R2;
    const lossN = c.nobDecay * BN + (gN > 0 ? (gN * BN) / c.nobMax : 0);
    // Organic matter: trapping and mineralisation; food leaving the fish.
    const trap = c.trapRate * oW;
    const minW = c.mineralisation * oW;
    const minF = c.mineralisation * oF;
    const rel = c.gutRelease * G;
    // Plants: ammonium first; nitrate uptake inhibited by ammonium.
    const fA = S / (c.plantKa + absS);
    const fNit = (1 - fA) * (N3 / (c.plantKn + absN3)) * (c.plantKi / (c.plantKi + Sp));
    const dy = new Array<number>(dim);
    let upA = 0;
    let upN = 0;
    for (let i = 0; i < np; i++) {
      const P = y[PLANT0 + i] > 0 ? y[PLANT0 + i] : 0;
      const room = 1 - P / c.plantMax[i];
      const pot = room > 0 ? c.plantRate[i] * P * room : 0;
      const nmg = c.plantNmg[i] * pot;
      upA += nmg * fA;
      upN += nmg * fNit;
      dy[PLANT0 + i] = pot * (fA + fNit);
    }
    // Low-oxygen zones.
    const D = c.denitCap > 0 ? (c.denitCap * N3) / (c.denitK + absN3) : 0;
    let A = 0;
    if (c.anammoxCap > 0) {
      const nh4Share = 1 - fnh3At(c, KH);
      const a = (S * nh4Share) / (c.anammoxKa + absS * nh4Share);
      const b = N2 / (c.anammoxKn + absN2);
      // Two consumed pools: the product while both are positive, else the smaller factor
      // (negative), which refills whichever pool overshot.
      A = c.anammoxCap * (a >= 0 && b >= 0 ? a * b : Math.min(a, b));
    }
    const q = c.dripLPerDay;

    dy[0] = (rel * c.gutToTan + minW + minF - R1 - gA - upA - A + q * (c.changeTan - S)) * invV;
    dy[1] = (R1 - R2 - gN - annNo2 * A - q * N2) * invV;
    dy[2] = (R2 - upN - D + annNo3 * A + q * (c.changeNo3 - N3)) * invV;
    dy[3] = c.uneatenToDetritus + rel * c.gutToFaeces - trap - minW;
    dy[4] = trap - minF + lossA + lossN + annBio * A;
    dy[5] = gA - lossA;
    dy[6] = gN - lossN;
    dy[7] = (-DKH_PER_MG_N_NITRIFIED * R1 + DKH_PER_MG_N_DENITRIFIED * D + q * (c.changeKh - KH)) * invV;
    dy[8] = c.gutIn - rel;
    dy[9] = D;
    dy[10] = annN2 * A;
    dy[11] = q * (S + N2 + N3);
    return dy;
  };
}

/** Per-component absolute tolerances (in each component's unit). */
export function absoluteTolerances(c: TankConstants): number[] {
  const atol = [1e-7, 1e-7, 1e-7, 1e-4, 1e-4, 1e-9, 1e-9, 1e-6, 1e-5, 1e9, 1e9, 1e9];
  for (let i = 0; i < c.plantCount; i++) atol.push(1e-6);
  return atol;
}

/** Nitrogen (mg N) held in each stock for a state vector. */
export function stocks(c: TankConstants, y: readonly number[]) {
  const V = c.volumeL;
  const plantsByGroup: number[] = [];
  let plants = 0;
  for (let i = 0; i < c.plantCount; i++) {
    const n = c.plantNmg[i] * y[PLANT0 + i];
    plantsByGroup.push(n);
    plants += n;
  }
  const water = { tan: V * y[IX.tan], nitrite: V * y[IX.no2], nitrate: V * y[IX.no3], total: 0 };
  water.total = water.tan + water.nitrite + water.nitrate;
  const bacteria = { ammoniaOxidisers: y[IX.aob], nitriteOxidisers: y[IX.nob], total: y[IX.aob] + y[IX.nob] };
  const detritus = { tank: y[IX.orgW], filter: y[IX.orgF], total: y[IX.orgW] + y[IX.orgF] };
  const fishGut = y[IX.gut];
  return {
    water,
    plants,
    plantsByGroup,
    bacteria,
    detritus,
    fishGut,
    total: water.total + plants + bacteria.total + detritus.total + fishGut,
  };
}
export type Stocks = ReturnType<typeof stocks>;

/**
 * The initial state. A filter "established at start" holds the biomass its expected TAN load
 * supports (capped by its carrying capacity) and detritus at its steady level; a new filter holds
 * only a seed of bacteria and no detritus.
 */
export function initialState(s: Scenario, c: TankConstants): number[] {
  const y = new Array<number>(PLANT0 + c.plantCount).fill(0);
  y[IX.tan] = s.water.startTan;
  y[IX.no2] = s.water.startNitrite;
  y[IX.no3] = s.water.startNitrate;
  y[IX.kh] = s.water.khDkh;
  const eatenKept = c.feedN * c.eatenShare * (1 - EATEN_N_SPLIT.fishGrowth);
  if (c.pulsedFeeding) {
    // Periodic steady state just before a meal: M·e^(−kτ) / (1 − e^(−kτ)), τ = 1/feeds per day.
    const decay = Math.exp(-c.gutRelease / c.feedsPerDay);
    y[IX.gut] = ((eatenKept / c.feedsPerDay) * decay) / (1 - decay);
  } else {
    y[IX.gut] = eatenKept / c.gutRelease;
  }
  const toDetritus = eatenKept * c.gutToFaeces + (c.leftoversRemoved ? 0 : c.feedN * (1 - c.eatenShare));
  if (s.filter.establishedAtStart) {
    // Steady detritus without cleanings: tank pool drains by trapping and mineralisation.
    y[IX.orgW] = toDetritus / (c.trapRate + c.mineralisation);
    y[IX.orgF] = (y[IX.orgW] * c.trapRate) / c.mineralisation;
    const dosing = s.fishlessCycling.enabled
      ? (s.fishlessCycling.doseMgNPerL * c.volumeL) / s.fishlessCycling.doseIntervalDays
      : 0;
    const load = eatenKept + c.feedN * (c.leftoversRemoved ? 0 : 1 - c.eatenShare) + dosing;
    const floor = BACTERIA.establishedFloorFraction.value;
    // Steady biomass for an oxidation rate L: yield·L·(1 − B/Bmax) = b·B.
    const steady = (yieldN: number, decay: number, max: number) => {
      const g = yieldN * load;
      return Math.max((g * max) / (decay * max + g), floor * max);
    };
    y[IX.aob] = steady(c.aobYield, c.aobDecay, c.aobMax);
    y[IX.nob] = steady(c.nobYield, c.nobDecay, c.nobMax);
  } else {
    const seed = BACTERIA.seedFraction.value;
    y[IX.aob] = seed * c.aobMax;
    y[IX.nob] = seed * c.nobMax;
  }
  for (let i = 0; i < c.plantCount; i++) y[PLANT0 + i] = s.plants[i].startMassG;
  return y;
}
