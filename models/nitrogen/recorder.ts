/**
 * Records what a run reports: the chart series (rounded, clamped at zero for display), running
 * peaks and lows over every solver step and sample, and — on request — the raw, unclamped
 * samples the series were made from (for checks that must see what the solver produced).
 */
import { phFromKhUnclamped } from "./chemistry";
import { OXYGEN } from "./parameters";
import type { Peak, Series } from "./result";
import { nonNeg, round6, roundDay } from "./result";
import { fnh3At, phAt } from "./rhs";
import type { Scenario } from "./scenario";
import { IX, PLANT0, STATE_NAMES } from "./state";
import type { TankConstants } from "./tank-constants";

/** Unrounded, unclamped samples: one row per sample, columns named in `names`. */
export interface RawSeries {
  /** State names, then "pH (unclamped)". */
  names: string[];
  t: number[];
  rows: number[][];
}

export interface Extremes {
  nh3: Peak;
  tan: Peak;
  no2: Peak;
  no3: Peak;
  /** Lowest oxygen and KH (value, day). */
  o2Low: Peak;
  khLow: Peak;
  /** First day KH was below the line where nitrifiers stall, and oxygen below the fish's caution; null: never. */
  khExhaustedFrom: number | null;
  o2LowFrom: number | null;
}

/** KH (dKH) below which nitrification stalls for want of carbonate buffer. */
export const KH_EXHAUSTED_DKH = 0.5; // model choice, no source (the switch's half-saturation)

/**
 * TAN and pH at every solver step and sample, in time order: what the ammonia criteria are
 * checked against, so a warning does not depend on the chart spacing (a peak between two
 * samples still counts).
 */
export interface Trace {
  t: number[];
  tan: number[];
  ph: number[];
}

export interface Recorder {
  readonly series: Series;
  readonly extremes: Extremes;
  readonly raw: RawSeries | null;
  readonly trace: Trace;
  /** Track peaks and lows at a solver step. */
  track(t: number, y: readonly number[]): void;
  /** Record a chart sample (and track it). */
  sample(t: number, y: readonly number[]): void;
}

export function createRecorder(s: Scenario, c: TankConstants, keepRaw: boolean): Recorder {
  const np = c.plantCount;
  const series: Series = {
    t: [],
    tan: [],
    nh3: [],
    no2: [],
    no3: [],
    kh: [],
    ph: [],
    plants: s.plants.map((g) => ({ id: g.id, name: g.name, massG: [] })),
    aob: [],
    nob: [],
    organicWater: [],
    organicFilter: [],
    o2: [],
  };
  const extremes: Extremes = {
    nh3: { value: 0, day: 0 },
    tan: { value: 0, day: 0 },
    no2: { value: 0, day: 0 },
    no3: { value: 0, day: 0 },
    o2Low: { value: Infinity, day: 0 },
    khLow: { value: Infinity, day: 0 },
    khExhaustedFrom: null,
    o2LowFrom: null,
  };
  const o2Caution = OXYGEN.cautionMgPerL.value;
  const raw: RawSeries | null = keepRaw
    ? { names: [...STATE_NAMES, ...s.plants.map((g) => `plants "${g.name}" (g)`), "pH (unclamped)"], t: [], rows: [] }
    : null;

  const trace: Trace = { t: [], tan: [], ph: [] };

  const track = (t: number, y: readonly number[]) => {
    const tan = y[IX.tan];
    const n = trace.t.length;
    if (n === 0 || t >= trace.t[n - 1]) {
      trace.t.push(t);
      trace.tan.push(tan > 0 ? tan : 0);
      trace.ph.push(phAt(c, y[IX.kh]));
    }
    const nh3 = tan * fnh3At(c, y[IX.kh]);
    if (nh3 > extremes.nh3.value) extremes.nh3 = { value: nh3, day: t };
    if (tan > extremes.tan.value) extremes.tan = { value: tan, day: t };
    if (y[IX.no2] > extremes.no2.value) extremes.no2 = { value: y[IX.no2], day: t };
    if (y[IX.no3] > extremes.no3.value) extremes.no3 = { value: y[IX.no3], day: t };
    if (y[IX.o2] < extremes.o2Low.value) extremes.o2Low = { value: y[IX.o2], day: t };
    if (y[IX.kh] < extremes.khLow.value) extremes.khLow = { value: y[IX.kh], day: t };
    if (extremes.khExhaustedFrom === null && y[IX.kh] < KH_EXHAUSTED_DKH) extremes.khExhaustedFrom = t;
    if (extremes.o2LowFrom === null && y[IX.o2] < o2Caution) extremes.o2LowFrom = t;
  };

  const sample = (t: number, y: readonly number[]) => {
    track(t, y);
    const kh = y[IX.kh];
    series.t.push(roundDay(t));
    series.tan.push(nonNeg(y[IX.tan]));
    series.nh3.push(nonNeg(y[IX.tan] * fnh3At(c, kh)));
    series.no2.push(nonNeg(y[IX.no2]));
    series.no3.push(nonNeg(y[IX.no3]));
    series.kh.push(nonNeg(kh));
    series.ph.push(round6(phAt(c, kh)));
    for (let i = 0; i < np; i++) series.plants[i].massG.push(nonNeg(y[PLANT0 + i]));
    series.aob.push(nonNeg(y[IX.aob]));
    series.nob.push(nonNeg(y[IX.nob]));
    series.organicWater.push(nonNeg(y[IX.orgW]));
    series.organicFilter.push(nonNeg(y[IX.orgF]));
    series.o2.push(nonNeg(y[IX.o2]));
    if (raw) {
      raw.t.push(t);
      raw.rows.push([...y, c.phFollowsKh ? phFromKhUnclamped(c.ph0, c.kh0, kh) : c.ph0]);
    }
  };

  return { series, extremes, raw, trace, track, sample };
}
