/**
 * How well a model run explains the readings: a likelihood with exact and interval (censored)
 * readings, and the residual form the least-squares search works on.
 *
 * A reading of species s taken as exact is the model's value plus an error ε ~ N(0, σ_s²); a
 * kit reading says the model's value plus ε lies in its interval [lo, hi], with probability
 * Φ((hi − μ)/σ) − Φ((lo − μ)/σ) (interval censoring: Lawless, Statistical Models and Methods
 * for Lifetime Data, 2nd ed., §2.2 and §3.5; docs/sources.md §17). σ_s = τ · scale_s: one
 * dimensionless noise level τ for all species, each on its own scale (see residualScales), so
 * nitrate's large numbers do not drown out ammonia's small ones. τ is estimated from the
 * readings by maximum likelihood, never below TAU_MIN.
 */
import type { ReadingInterval, Species } from "./kits";
import { SPECIES } from "./kits";
import { logPhiDifference } from "./normal";

/** A test reading on a model day, mg N/L; absent or null = not measured. */
export type CalibrationReading = { day: number; tan?: number | null; no2?: number | null; no3?: number | null };

/**
 * One measured value: which reading and species, its interval (mg N/L), its species' scale and
 * the smallest noise level it is read with (TAU_MIN, or KIT_TAU_MIN for a kit's reading).
 */
export type Observation = { reading: number; species: Species; lo: number; hi: number; scale: number; floor: number };

/**
 * Smallest noise level τ (a share of each species' scale). The model is not exact to better
 * than about 1 % of a species' usual level, nor a reading's time to the hour: without a floor,
 * readings the model can match exactly would claim certainties no tank supports. Model
 * choice, no source.
 */
const TAU_MIN = 0.01;

/**
 * Smallest noise level of a colour card's reading, beyond its rounding: a colour matched against a
 * card, in the room's light, is misjudged now and then by more than the model misses (about
 * 5 % of the species' usual level). Without it, a few readings that land on the neighbouring
 * colour would make the fit jump to multipliers that happen to fit every colour. Model choice,
 * no source.
 */
const KIT_TAU_MIN = 0.05;

/**
 * Smallest residual scale per species, mg N/L: one step of a hobby drop-test kit's colour card
 * (ammonia 0.2 mg N/L ≈ 0.25 mg/L NH3, nitrite 0.075 mg N/L ≈ 0.25 mg/L NO2, nitrate
 * 1.13 mg N/L = 5 mg/L NO3): a miss smaller than a step is within what the kit can tell.
 * Common practice, no source.
 */
const KIT_RESOLUTION_MG_N: Record<Species, number> = { tan: 0.2, no2: 0.075, no3: 1.13 };

const measured = (v: number | null | undefined): v is number => v != null && Number.isFinite(v);

/** Residual scale per species: max(kit resolution, RMS of that species' readings), mg N/L. */
export function residualScales(readings: readonly CalibrationReading[]): Record<Species, number> {
  const out = { ...KIT_RESOLUTION_MG_N };
  for (const k of SPECIES) {
    const values = readings.map((r) => r[k]).filter(measured);
    if (values.length === 0) continue;
    const rms = Math.sqrt(values.reduce((s, v) => s + v * v, 0) / values.length);
    out[k] = Math.max(out[k], rms);
  }
  return out;
}

/** The readings as observations, in reading order then species order (a colour card's with KIT_TAU_MIN). */
export function observationsOf(
  readings: readonly CalibrationReading[],
  /** The reading's interval, and whether it was read off a colour card. */
  intervalOf: (species: Species, value: number) => ReadingInterval & { colour: boolean },
): Observation[] {
  const out: Observation[] = [];
  readings.forEach((r, reading) => {
    for (const species of SPECIES) {
      const v = r[species];
      if (!measured(v)) continue;
      const { lo, hi, colour } = intervalOf(species, v);
      // Errors grow with the value read (a relative error), never below one kit step.
      const scale = Math.max(Math.abs(v), KIT_RESOLUTION_MG_N[species]);
      out.push({ reading, species, lo, hi, scale, floor: colour ? KIT_TAU_MIN : TAU_MIN });
    }
  });
  return out;
}

/** Whether an observation counts as exact at noise σ (its interval is far narrower than σ). */
const isPoint = (o: Observation, sigma: number) => o.hi - o.lo <= 1e-3 * sigma;

/** −ln likelihood of one observation at model value μ and noise σ (dropping ½ln 2π). */
function nllOne(o: Observation, mu: number, sigma: number): number {
  if (isPoint(o, sigma)) {
    const z = (mu - (o.lo + o.hi) / 2) / sigma;
    return 0.5 * z * z + Math.log(sigma);
  }
  return -logPhiDifference((o.lo - mu) / sigma, (o.hi - mu) / sigma);
}

/** −ln likelihood of all observations (`mu` in observation order) at noise level τ. */
export function negLogLikelihood(obs: readonly Observation[], mu: readonly number[], tau: number): number {
  let sum = 0;
  obs.forEach((o, i) => (sum += nllOne(o, mu[i], Math.max(tau, o.floor) * o.scale)));
  return sum;
}

/**
 * The maximum-likelihood noise level τ for model values `mu`, corrected for the `p` fitted
 * multipliers (× √(n/(n − p)), as s² divides by n − p), never below TAU_MIN.
 */
export function noiseLevel(obs: readonly Observation[], mu: readonly number[], p: number): number {
  // Golden-section search on ln τ over [ln TAU_MIN, ln 100]: −ln L is unimodal in τ here.
  let a = Math.log(TAU_MIN);
  let b = Math.log(100);
  const g = (Math.sqrt(5) - 1) / 2;
  const f = (x: number) => negLogLikelihood(obs, mu, Math.exp(x));
  let c = b - g * (b - a);
  let d = a + g * (b - a);
  let fc = f(c);
  let fd = f(d);
  for (let k = 0; k < 60 && b - a > 1e-6; k++) {
    if (fc < fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - g * (b - a);
      fc = f(c);
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + g * (b - a);
      fd = f(d);
    }
  }
  const n = obs.length;
  const tau = Math.exp((a + b) / 2) * (n > p ? Math.sqrt(n / (n - p)) : 1);
  return Math.max(TAU_MIN, tau);
}

/**
 * Residuals r with ½Σr² = −ln L(μ; τ) − (its smallest possible value), for Gauss–Newton: an
 * exact reading gives (μ − y)/σ; an interval √(2(−ln P − min)) signed by the side of the
 * interval's middle the model is on (open intervals keep one sign). Smooth in μ.
 */
export function pseudoResiduals(obs: readonly Observation[], mu: readonly number[], tau: number): number[] {
  return obs.map((o, i) => {
    const sigma = Math.max(tau, o.floor) * o.scale;
    if (isPoint(o, sigma)) return (mu[i] - (o.lo + o.hi) / 2) / sigma;
    const nll = nllOne(o, mu[i], sigma);
    if (o.lo === -Infinity) return Math.sqrt(2 * Math.max(0, nll));
    if (o.hi === Infinity) return -Math.sqrt(2 * Math.max(0, nll));
    const half = (o.hi - o.lo) / (2 * sigma);
    const least = -logPhiDifference(-half, half);
    const mid = (o.lo + o.hi) / 2;
    return Math.sign(mu[i] - mid) * Math.sqrt(2 * Math.max(0, nll - least));
  });
}

/** How far the model is outside each reading's interval, on the species' scale (0 inside). */
export function scaledMisses(obs: readonly Observation[], mu: readonly number[]): number[] {
  return obs.map((o, i) => (mu[i] < o.lo ? o.lo - mu[i] : mu[i] > o.hi ? mu[i] - o.hi : 0) / o.scale);
}
