/**
 * SVG path data for a line, from decimated samples (d3-shape), memoised per data array.
 *
 * Speed: turning numbers into text is most of the cost of a path string, and decimals cost about
 * five times as much as integers. So paths are written in tenths of a pixel as whole numbers
 * (PATH_SCALE) and drawn inside a group scaled by 1/PATH_SCALE, with stroke widths and dashes
 * multiplied to match: the same 0.1 px precision as one decimal, plain SVG 1.1 (no
 * vector-effect), so exported files look the same in any viewer.
 */
import { line as d3line } from "d3-shape";
import { decimateCached } from "~/components/charts/decimate";

export const PATH_SCALE = 10;

export type LinearScale = { (v: number): number; domain(): number[]; range(): number[] };

type Entry = { key: string; t: ArrayLike<number>; d: string };
const cache = new WeakMap<object, Entry[]>();

/**
 * Path data in PATH_SCALE units for y over t, thinned to `columns` pixel columns. The result
 * is reused while the arrays, both scales and the width are unchanged (by value).
 */
export function linePath(
  t: ArrayLike<number>,
  y: ArrayLike<number>,
  x: LinearScale,
  yScale: LinearScale,
  columns: number,
): string {
  const [x0, x1] = x.domain();
  const key = `${x0},${x1},${x.range().join(",")},${yScale.domain().join(",")},${yScale.range().join(",")},${columns}`;
  const entries = cache.get(y as object) ?? [];
  const hit = entries.find((e) => e.key === key && e.t === t);
  if (hit) return hit.d;
  const { index } = decimateCached(t, y, x0, x1, columns);
  const d =
    d3line<number>()
      .defined((i) => Number.isFinite(y[i]))
      .x((i) => x(t[i]) * PATH_SCALE)
      .y((i) => yScale(y[i]) * PATH_SCALE)
      .digits(0)(index) ?? "";
  const entry = { key, t, d };
  // Keep the last few variants (e.g. a toggle that changes the y domain and back).
  cache.set(y as object, [entry, ...entries].slice(0, 4));
  return d;
}

/** Scale a dash pattern ("6 4") into PATH_SCALE units. */
export function scaledDash(dash: string | undefined): string | undefined {
  return dash
    ?.split(/[\s,]+/)
    .filter(Boolean)
    .map((v) => Number(v) * PATH_SCALE)
    .join(" ");
}
