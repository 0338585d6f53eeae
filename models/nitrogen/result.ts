/**
 * What simulate() returns, and the rounding applied to what it reports.
 */
import type { EventRecord } from "../core/events";
import type { NitrogenBudget } from "./budget";
import type { AmmoniaCriteria } from "./criteria";
import type { ZoneCapacity } from "./low-oxygen-zones";
import type { TankEventInput } from "./tank-events";

/** Version of the engine's numbers: bump when a change alters results for the same scenario. */
/** What the warnings of a run (warnings.ts) say. */
type WarningCode =
  | "feedBeyondOxygenSupply"
  | "heavyFeedingForVolume"
  | "lowOxygen"
  | "ammoniaAboveAcuteCriterion"
  | "ammoniaAboveChronicCriterion"
  | "khExhausted"
  | "outsideModelRange";

export interface ModelWarning {
  code: WarningCode;
  /** "implausible": the settings are beyond what a real tank could be; "caution": the water would harm fish. */
  severity: "caution" | "implausible";
  message: string;
  value: number;
  unit: string;
  limit: number;
  day: number | null;
}

export const ENGINE_VERSION = "fernwater-engine 2.0.2";

export interface SimulateOptions {
  /** Abort with ModelError("WALL_TIME") after this many milliseconds (default 2000). */
  maxWallMs?: number;
  /** Abort with ModelError("MAX_STEPS") after this many solver steps in total (default 200 000). */
  maxSteps?: number;
  /** Steps allowed between two events (default 50 000). */
  maxStepsPerSegment?: number;
  /** Override the scenario's chart spacing (days). */
  outputIntervalDays?: number;
  /**
   * Also return `rawSeries`: every sample unrounded and unclamped (and pH without its 4–10
   * clamp), for checks on what the solver produced rather than what the chart shows.
   */
  rawSeries?: boolean;
  /**
   * Calibration only: trim each listed "when full" plant group (by index in `plants`) on these
   * days instead of when it fills up. Pinning the trims while multipliers change keeps the
   * readings' model values smooth in the multipliers (a trim crossing a reading's time would
   * otherwise kink them); models/nitrogen/calibration/ re-pins them from a free run until the
   * pinned and the free trim days agree.
   */
  pinnedTrimDays?: readonly (readonly number[] | null | undefined)[];
  /**
   * An explicit event schedule ("these events on these days"): replaces the scenario's periodic
   * water changes, filter cleanings, timed trims and doses (a tank replayed as it happened).
   */
  events?: readonly TankEventInput[];
}

/**
 * Columnar time series. Values are rounded to 6 significant figures (budget values are not).
 * At every event the series holds two samples with the same `t`: just before and just after.
 */
export interface Series {
  /** Days from the start. */
  t: number[];
  /** Total ammonia nitrogen, mg N/L. */
  tan: number[];
  /** Free (un-ionised) ammonia, mg N/L (Emerson et al. 1975 split). */
  nh3: number[];
  /** Nitrite-N, mg N/L. */
  no2: number[];
  /** Nitrate-N, mg N/L. */
  no3: number[];
  /** Carbonate hardness, dKH. */
  kh: number[];
  ph: number[];
  /** Dry mass per plant group, g. */
  plants: { id: string; name: string; massG: number[] }[];
  /** Ammonia-oxidiser biomass, mg N. */
  aob: number[];
  /** Nitrite-oxidiser biomass, mg N. */
  nob: number[];
  /** Organic N (detritus, uneaten food) in the tank, mg N. */
  organicWater: number[];
  /** Organic N trapped in the filter, mg N. */
  organicFilter: number[];
  /** Dissolved oxygen, mg O2/L. */
  o2: number[];
}

export interface Peak {
  /** Value in the unit of the quantity (mg N/L). */
  value: number;
  /** Day at which it occurred. */
  day: number;
}

export interface KeyFigures {
  /** Highest free NH3 (mg N/L) seen at any solver step or sample. */
  peakFreeNh3: Peak;
  /** Highest TAN (mg N/L). */
  peakTan: Peak;
  /** Highest nitrite-N (mg N/L). */
  peakNitrite: Peak;
  /** Nitrate-N at the end (mg N/L). */
  nitrateEnd: number;
  /** Highest nitrate-N (mg N/L). */
  peakNitrate: Peak;
  /** Nitrate-N just before the last water change (mg N/L), or null without water changes. */
  nitrateBeforeLastWaterChange: number | null;
  /** Days with nitrate-N above the target band's top (linear between samples). */
  daysAboveNitrateTarget: number;
  /** Days with nitrate-N below the target band's bottom. */
  daysBelowNitrateTarget: number;
  /**
   * Whether the run shows a cycle: TAN or nitrite-N reached 0.5 mg N/L at some sample.
   */
  cycleSeen: boolean;
  /**
   * Day cycling finished: the first sampled time, after TAN or nitrite-N has reached
   * 0.5 mg N/L, at which TAN and nitrite-N are both below 0.1 mg N/L. Null if no cycle was seen
   * or the cycle had not finished by the end. With fishless dosing the "just before a dose"
   * samples make this the first day a dose was cleared within one dosing interval.
   */
  cyclingFinishedDay: number | null;
  /** Dry mass trimmed out over the run, g (all groups). */
  plantsTrimmedG: number;
  /** Lowest dissolved oxygen (mg O2/L) seen at any solver step or sample. */
  lowestOxygen: Peak;
  /** Lowest KH (dKH) seen at any solver step or sample. */
  lowestKh: Peak;
}

export interface SimulationStats {
  /** Solver steps (accepted and rejected). */
  steps: number;
  /** Right-hand-side evaluations. */
  rhsEvals: number;
  /** Rejected steps. */
  rejected: number;
  /** Integration segments (gaps between events). */
  segments: number;
  /** Segments integrated by the stiff solver (RODAS4) after odex showed stiffness; 0 for most tanks. */
  stiffSegments: number;
  /** Wall time of the run (ms). The only field that is not deterministic. */
  wallMs: number;
}

export interface SimulationResult {
  engineVersion: string;
  series: Series;
  events: EventRecord[];
  budget: NitrogenBudget;
  keyFigures: KeyFigures;
  /** Plausibility and water-quality warnings (not errors), in the order found. */
  warnings: ModelWarning[];
  /** Denitrification capacity of the low-oxygen zones with its range; null when the zones are off. */
  lowOxygenZones: ZoneCapacity | null;
  /** US EPA (2013) ammonia criteria at the scenario's pH and temperature, mg TAN-N/L. */
  ammoniaCriteria: AmmoniaCriteria;
  stats: SimulationStats;
}

/**
 * Round to 6 significant figures (prints as a short decimal in JSON). Magnitudes below 1e-15
 * become 0: far below anything measurable, and it keeps the powers of ten exact.
 */
export function round6(x: number): number {
  if (!Number.isFinite(x)) return x;
  if (Math.abs(x) < 1e-15) return 0;
  const e = Math.floor(Math.log10(Math.abs(x)));
  const k = 5 - e;
  if (k >= 0) {
    const f = 10 ** k;
    return Math.round(x * f) / f;
  }
  const f = 10 ** -k;
  return Math.round(x / f) * f;
}

export const nonNeg = (x: number) => (x > 0 ? round6(x) : 0);
/** Days are rounded to 1e-6 day (0.09 s) rather than to significant figures. */
export const roundDay = (t: number) => Math.round(t * 1e6) / 1e6;
