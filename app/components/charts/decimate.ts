/**
 * Thinning a long series before it becomes an SVG path (pure). A one-year run at hourly output
 * has 8 761 samples per species, far more than the few hundred pixel columns of a chart; drawing
 * them all costs time and changes nothing that can be seen.
 *
 * For each pixel column the smallest and the largest value are kept, in the order they occur,
 * so peaks and troughs survive exactly. Some samples are always kept as they are: the first and
 * the last, both samples of an event's pair (same day, before and after the jump, so a water
 * change stays a vertical step), and the samples on either side of a gap (a non-finite value).
 */

export type Decimated = {
  /** Indices into the original arrays, increasing. */
  index: number[];
};

/**
 * @param t days, non-decreasing
 * @param y values (non-finite = gap)
 * @param x0 day at the left edge of the plot
 * @param x1 day at the right edge
 * @param columns pixel columns of the plot (one bucket each)
 * @param keepEventPairs keep both samples of every event pair (the default, for drawing); off
 *   where events are so dense that their pairs alone would outnumber the columns
 */
export function decimateMinMax(
  t: ArrayLike<number>,
  y: ArrayLike<number>,
  x0: number,
  x1: number,
  columns: number,
  keepEventPairs = true,
): Decimated {
  const n = Math.min(t.length, y.length);
  const cols = Math.max(1, Math.floor(columns));
  // Already thin enough: keep everything.
  if (n <= 2 * cols + 2 || !(x1 > x0)) return { index: range(n) };

  // One pass, no closures (this runs on every new series at every width): `minI`/`maxI` hold the
  // current column's extremes, flushed in time order when the column ends or a kept sample comes.
  const out: number[] = [];
  const scale = cols / (x1 - x0);
  let bucket = -1;
  let minI = -1;
  let maxI = -1;
  let prevFinite = Number.isFinite(y[0]);
  for (let i = 0; i < n; i++) {
    const v = y[i];
    const finite = Number.isFinite(v);
    const nextFinite = i + 1 < n ? Number.isFinite(y[i + 1]) : true;
    const ti = t[i];
    const exact =
      i === 0 ||
      i === n - 1 ||
      !finite ||
      // Both samples of an event pair (same day, before and after the jump).
      (keepEventPairs && (t[i + 1] === ti || t[i - 1] === ti)) ||
      // The neighbours of a gap bound the line segment that ends there.
      !prevFinite ||
      !nextFinite;
    prevFinite = finite;
    let b = -1;
    if (!exact) {
      b = Math.floor((ti - x0) * scale);
      if (b < 0) b = 0;
      else if (b >= cols) b = cols - 1;
      if (b === bucket) {
        if (v < y[minI]) minI = i;
        if (v > y[maxI]) maxI = i;
        continue;
      }
    }
    // The column ends here: write its extremes in time order.
    if (minI >= 0) {
      if (minI === maxI) out.push(minI);
      else if (minI < maxI) out.push(minI, maxI);
      else out.push(maxI, minI);
    }
    if (exact) {
      out.push(i);
      bucket = -1;
      minI = maxI = -1;
    } else {
      bucket = b;
      minI = maxI = i;
    }
  }
  if (minI >= 0) {
    if (minI === maxI) out.push(minI);
    else if (minI < maxI) out.push(minI, maxI);
    else out.push(maxI, minI);
  }
  return { index: out };
}

function range(n: number): number[] {
  const a = new Array<number>(n);
  for (let i = 0; i < n; i++) a[i] = i;
  return a;
}

type CacheEntry = { t: ArrayLike<number>; x0: number; x1: number; columns: number; result: Decimated };
const cache = new WeakMap<object, CacheEntry>();

/**
 * decimateMinMax memoised on the value array (by identity) together with t, the x domain and
 * the column count: the same run redrawn at the same width costs nothing, whichever chart asks.
 */
export function decimateCached(
  t: ArrayLike<number>,
  y: ArrayLike<number>,
  x0: number,
  x1: number,
  columns: number,
): Decimated {
  const hit = cache.get(y as object);
  if (hit && hit.t === t && hit.x0 === x0 && hit.x1 === x1 && hit.columns === columns) return hit.result;
  const result = decimateMinMax(t, y, x0, x1, columns);
  cache.set(y as object, { t, x0, x1, columns, result });
  return result;
}
