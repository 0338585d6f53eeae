/**
 * Finding samples by day and moving the day cursor (pure). Series times are non-decreasing;
 * an event appears as two samples with the same day: the one before the jump, then the one after.
 */
import type { ChartReading, SpeciesKey } from "~/utils/chart-data";

export type Side = "before" | "after";

/** First index with t[i] ≥ day (t.length if none). */
export function lowerBound(t: ArrayLike<number>, day: number): number {
  let lo = 0;
  let hi = t.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (t[mid] < day) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** First index with t[i] > day (t.length if none). */
export function upperBound(t: ArrayLike<number>, day: number): number {
  let lo = 0;
  let hi = t.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (t[mid] <= day) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * The sample nearest to `day`; at an event's pair of samples, `side` picks the one before
 * (default) or after the jump. −1 for an empty series.
 */
export function nearestIndex(t: ArrayLike<number>, day: number, side: Side = "before"): number {
  const n = t.length;
  if (n === 0) return -1;
  const i = lowerBound(t, day);
  let best: number;
  if (i === 0) best = 0;
  else if (i === n) best = n - 1;
  else best = day - t[i - 1] <= t[i] - day ? i - 1 : i;
  // Among equal times, choose the requested side.
  const v = t[best];
  return side === "before" ? lowerBound(t, v) : upperBound(t, v) - 1;
}

/** Whether sample i is the "before" or "after" half of an event pair, or neither. */
export function sampleSide(t: ArrayLike<number>, i: number): Side | null {
  if (i + 1 < t.length && t[i + 1] === t[i]) return "before";
  if (i > 0 && t[i - 1] === t[i]) return "after";
  return null;
}

/** What the chart's day cursor keys do, in words (its visible help); says which way each key moves (stepCursor). */
export const CURSOR_KEYS_HELP =
  "Move the day cursor with the pointer, or focus the chart and use → or ↑ (one sample later), ← or ↓ (one sample earlier), Page Up (a week later), Page Down (a week earlier), Home (the start) and End (the end).";

/** The same, short, for the chart's accessible name. */
export const CURSOR_KEYS_SUMMARY =
  "Day cursor: right and left arrows move one sample later or earlier, Page Up a week later, Page Down a week earlier, Home and End to the start and end.";

/**
 * The cursor's next sample for a key, following the slider pattern of the WAI-ARIA Authoring
 * Practices: →/↑ one sample later, ←/↓ one earlier, Page Up/Page Down `pageDays` (7) later or
 * earlier, Home/End the first/last sample. Null for a key the cursor does not use.
 */
export function stepCursor(t: ArrayLike<number>, i: number, key: string, pageDays = 7): number | null {
  const n = t.length;
  if (n === 0) return null;
  const last = n - 1;
  const cur = Math.min(Math.max(i, 0), last);
  switch (key) {
    case "ArrowRight":
    case "ArrowUp":
      return Math.min(cur + 1, last);
    case "ArrowLeft":
    case "ArrowDown":
      return Math.max(cur - 1, 0);
    case "PageUp":
      // Land on the sample before any event at the target day, as a keeper reads a log forward.
      return cur === last ? last : Math.max(nearestIndex(t, t[cur] + pageDays, "before"), cur + 1);
    case "PageDown":
      return cur === 0 ? 0 : Math.min(nearestIndex(t, t[cur] - pageDays, "before"), cur - 1);
    case "Home":
      return 0;
    case "End":
      return last;
    default:
      return null;
  }
}

/**
 * y at `day`, linear between the samples around it; exactly on a sample it is that sample,
 * and on an event's pair `side` chooses before or after. NaN outside the series.
 */
export function valueAt(t: ArrayLike<number>, y: ArrayLike<number>, day: number, side: Side = "before"): number {
  const n = t.length;
  if (n === 0 || day < t[0] || day > t[n - 1]) return NaN;
  const i = lowerBound(t, day);
  if (t[i] === day) return side === "before" ? y[i] : y[upperBound(t, day) - 1];
  const t0 = t[i - 1];
  const t1 = t[i];
  const w = (day - t0) / (t1 - t0);
  return y[i - 1] + w * (y[i] - y[i - 1]);
}

export type ReadingResidual = {
  key: Exclude<SpeciesKey, "nh3">;
  day: number;
  measured: number;
  model: number;
  /** measured − model, in display units. */
  residual: number;
};

/**
 * Readings within `toleranceDays` of `day`, one entry per measured species, each with the model
 * value at the reading's own day and the residual (reading − model). On an event's day the model
 * value is the one before the event: a keeper tests before changing the water.
 */
export function residualsNear(
  readings: readonly ChartReading[],
  day: number,
  toleranceDays: number,
  t: ArrayLike<number>,
  model: Record<"tan" | "no2" | "no3", ArrayLike<number>>,
): ReadingResidual[] {
  const out: ReadingResidual[] = [];
  for (const r of readings) {
    if (Math.abs(r.day - day) > toleranceDays) continue;
    for (const key of ["tan", "no2", "no3"] as const) {
      const measured = r[key];
      if (measured == null || !Number.isFinite(measured)) continue;
      const m = valueAt(t, model[key], r.day, "before");
      out.push({ key, day: r.day, measured, model: m, residual: measured - m });
    }
  }
  return out;
}

/** Typical spacing between samples (days): the median gap, ignoring event pairs. */
export function typicalSpacing(t: ArrayLike<number>): number {
  const gaps: number[] = [];
  const step = Math.max(1, Math.floor(t.length / 200));
  for (let i = step; i < t.length; i += step) {
    const g = t[i] - t[i - 1];
    if (g > 0) gaps.push(g);
  }
  if (gaps.length === 0) return 1;
  gaps.sort((a, b) => a - b);
  return gaps[gaps.length >> 1];
}
