/**
 * The tank's right-hand side dy/dt (units per day). Processes and sources: docs/engine.md.
 *
 * Every nitrogen process is a flux (mg N/day) taken from one pool and given to another, so
 * total nitrogen  V·(TAN+NO2+NO3) + pools + Σ plant N + cumulative losses  changes only by the
 * constant inputs (feed, drip-in water): a linear invariant, which both solvers keep to
 * round-off. Each outflow vanishes as its pool empties (Monod or first order), and turns into a
 * small refill if the solver overshoots below zero, so pools stay non-negative up to the solver
 * tolerance.
 */
import {
  ANAMMOX,
  ANAMMOX_ALKALINITY_EQ,
  DKH_PER_EQUIVALENT_N,
  freeAmmoniaFraction,
  freeNitrousAcidFraction,
  phFromKh,
} from "./chemistry";
import { PLANT0 } from "./state";
import type { TankConstants } from "./tank-constants";

/** pH at a given KH (constant unless the scenario says pH follows KH). */
export function phAt(c: TankConstants, khDkh: number): number {
  return c.phFollowsKh ? phFromKh(c.ph0, c.kh0, khDkh) : c.ph0;
}

/** Free-ammonia fraction of TAN at a given KH. */
export function fnh3At(c: TankConstants, khDkh: number): number {
  return c.phFollowsKh ? freeAmmoniaFraction(c.temperatureC, phAt(c, khDkh)) : c.fnh3Fixed;
}

/**
 * Product of two consumption factors that may each be slightly negative after a solver
 * overshoot: the product while both are positive, else the smaller (negative) one, which
 * refills whichever pool overshot.
 */
const both = (a: number, b: number) => (a >= 0 && b >= 0 ? a * b : Math.min(a, b));
/** Monod factor X/(K + |X|), odd in X so an overshoot below zero refills itself. */
const monod = (x: number, k: number) => x / (k + (x < 0 ? -x : x));

/** Build the right-hand side dy/dt (units per day) for the given constants. */
export function makeRhs(c: TankConstants): (t: number, y: readonly number[]) => number[] {
  const V = c.volumeL;
  const invV = 1 / V;
  const np = c.plantCount;
  const dim = PLANT0 + np;
  const { nitritePerAmmonium: annNo2, n2NPerAmmonium: annN2, nitratePerAmmonium: annNo3 } = ANAMMOX;
  const annBio = ANAMMOX.biomassNPerAmmonium;
  const EQ = DKH_PER_EQUIVALENT_N;
  const fnaFixed = freeNitrousAcidFraction(c.temperatureC, c.ph0);
  const fnaAt = (kh: number) => (c.phFollowsKh ? freeNitrousAcidFraction(c.temperatureC, phAt(c, kh)) : fnaFixed);
  return (_t, y) => {
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
    const O = y[9];
    const Sp = S > 0 ? S : 0;
    const Op = O > 0 ? O : 0;

    const kh2 = KH * KH;
    const fKH = kh2 / (kh2 + c.khHalf2);
    // Inhibition by free ammonia and free nitrous acid (Anthonisen et al. 1976).
    const FA = Sp * fnh3At(c, KH);
    const FNA = (N2 > 0 ? N2 : 0) * fnaAt(KH);
    const fna = c.fnaOnBoth / (c.fnaOnBoth + FNA);
    // Nitrification, step 1 (AOB): TAN → nitrite, limited by TAN and oxygen, with assimilation.
    const R1 = c.aobQ * fKH * (c.faOnAob / (c.faOnAob + FA)) * fna * both(monod(S, c.aobK), monod(O, c.aobKo)) * BA;
    const gA = c.aobYield * R1;
    const lossA = c.aobDecay * (BA > c.aobFloor ? BA - c.aobFloor : 0) + (gA > 0 ? (gA * BA) / c.aobMax : 0);
    // Step 2 (NOB): nitrite → nitrate.
    const R2 = c.nobQ * fKH * (c.faOnNob / (c.faOnNob + FA)) * fna * both(monod(N2, c.nobK), monod(O, c.nobKo)) * BN;
    const gN = c.nobYield * R2;
    const lossN = c.nobDecay * (BN > c.nobFloor ? BN - c.nobFloor : 0) + (gN > 0 ? (gN * BN) / c.nobMax : 0);
    // Organic matter: trapping and mineralisation; food leaving the fish.
    const trap = c.trapRate * oW;
    const minW = c.mineralisation * oW;
    const minF = c.mineralisation * oF;
    const rel = c.gutRelease * G;
    // Plants: ammonium first; nitrate uptake inhibited by ammonium.
    const fA = monod(S, c.plantKa);
    const fNit = (1 - fA) * monod(N3, c.plantKn) * (c.plantKi / (c.plantKi + Sp));
    const dy = new Array<number>(dim);
    let upA = 0;
    let upN = 0;
    let grownG = 0;
    for (let i = 0; i < np; i++) {
      const P = y[PLANT0 + i] > 0 ? y[PLANT0 + i] : 0;
      const room = 1 - P / c.plantMax[i];
      const pot = room > 0 ? c.plantRate[i] * P * room : 0;
      const nmg = c.plantNmg[i] * pot;
      upA += nmg * fA;
      upN += nmg * fNit;
      const grow = pot * (fA + fNit);
      grownG += grow;
      dy[PLANT0 + i] = grow;
    }
    // Low-oxygen zones: the zone's inside holds a small share of the water's oxygen.
    const zoneO = Op * c.zoneO2Share;
    let D = 0;
    let denMin = 0;
    let denMinW = 0;
    if (c.denitCap > 0) {
      const org = oW + oF;
      D = c.denitCap * both(monod(N3, c.denitK), monod(org, c.denitOrgK)) * (c.denitKi / (c.denitKi + zoneO));
      // The organic matter burnt as the electron donor releases its nitrogen as TAN.
      denMin = c.denitOrgPerN * D;
      const aW = oW < 0 ? -oW : oW;
      const aF = oF < 0 ? -oF : oF;
      denMinW = aW + aF > 0 ? (denMin * aW) / (aW + aF) : denMin / 2;
    }
    let A = 0;
    if (c.anammoxCap > 0) {
      const nh4 = S * (1 - fnh3At(c, KH));
      A = c.anammoxCap * both(monod(nh4, c.anammoxKa), monod(N2, c.anammoxKn)) * (c.anammoxKi / (c.anammoxKi + zoneO));
    }
    const q = c.dripLPerDay;
    const tanFromOrganics = rel * c.gutToTan + minW + minF + denMin;

    dy[0] = (tanFromOrganics - R1 - gA - upA - A + q * (c.changeTan - S)) * invV;
    dy[1] = (R1 - R2 - gN - annNo2 * A - q * N2) * invV;
    dy[2] = (R2 - upN - D + annNo3 * A + q * (c.changeNo3 - N3)) * invV;
    dy[3] = c.uneatenToDetritus + rel * c.gutToFaeces - trap - minW - denMinW;
    dy[4] = trap - minF + lossA + lossN + annBio * A - (denMin - denMinW);
    dy[5] = gA - lossA;
    dy[6] = gN - lossN;
    // Alkalinity in equivalents per N (chemistry.ts, DKH_PER_EQUIVALENT_N).
    const eq = tanFromOrganics - 2 * R1 - gA + gN - upA + upN + D + ANAMMOX_ALKALINITY_EQ * A;
    dy[7] = (EQ * eq + q * (c.changeKh - KH)) * invV;
    dy[8] = c.gutIn - rel;
    // Oxygen: exchange with the air (and drip water at saturation), use and production.
    const used =
      c.o2PerAmmonium * R1 +
      c.o2PerNitrite * R2 +
      c.fishO2 * monod(O, c.fishKo) +
      c.o2PerOrganicN * (minW + minF) * monod(O, c.hetKo);
    const made = c.plantO2PerG * grownG + c.plantO2PerNitrateN * upN;
    dy[9] = (c.kla + q * invV) * (c.o2Sat - O) + (made - used) * invV;
    dy[10] = D;
    dy[11] = annN2 * A;
    dy[12] = q * (S + N2 + N3);
    return dy;
  };
}

/** Per-component absolute tolerances (in each component's unit). */
export function absoluteTolerances(c: TankConstants): number[] {
  const atol = [1e-7, 1e-7, 1e-7, 1e-4, 1e-4, 1e-9, 1e-9, 1e-6, 1e-5, 1e-5, 1e9, 1e9, 1e9];
  for (let i = 0; i < c.plantCount; i++) atol.push(1e-6);
  return atol;
}
