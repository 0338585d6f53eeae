/** Which samples the data table lists (pure). */
import { lowerBound, typicalSpacing } from "~/utils/series-lookup";

/**
 * Rows for the table: with output finer than a day, one row per whole day (the first sample of
 * that day, i.e. before any event on it); with output every day or coarser, every sample
 * (both samples of an event pair).
 */
export function tableRowIndices(t: ArrayLike<number>): { indices: number[]; daily: boolean } {
  const n = t.length;
  if (n === 0) return { indices: [], daily: false };
  const spacing = typicalSpacing(t);
  if (spacing >= 1 - 1e-9) {
    const all = new Array<number>(n);
    for (let i = 0; i < n; i++) all[i] = i;
    return { indices: all, daily: false };
  }
  const out: number[] = [];
  const first = Math.ceil(t[0] - 1e-6);
  const last = Math.floor(t[n - 1] + 1e-6);
  for (let d = first; d <= last; d++) {
    const i = lowerBound(t, d - 1e-6);
    // Skip a day with no sample near it (cannot happen with regular output, but keep honest).
    if (i < n && t[i] - d < 0.5) out.push(i);
  }
  return { indices: out, daily: true };
}
