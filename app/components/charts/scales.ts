/**
 * Plot geometry, domains and ticks (pure; d3-scale does the arithmetic).
 *
 * One linear axis on the left for the four dissolved species. They share a unit family (mg/L),
 * so one axis lets a keeper compare them honestly; its domain follows the series that are
 * switched on, so hiding nitrate (tens of mg/L) zooms in on ammonia and nitrite (tenths). A log
 * axis would show all at once but reads badly for a keeper and breaks at zero, which is where a
 * cycled tank's ammonia sits. Plant dry mass (g) has its own axis on the right.
 */
import { scaleLinear, type ScaleLinear } from "d3-scale";
import type { FramePanel } from "~/components/charts/chart-frame-types";

type Margins = { top: number; right: number; bottom: number; left: number };

export type PlotBox = {
  width: number;
  height: number;
  margin: Margins;
  /** Inner plot size in px. */
  innerWidth: number;
  innerHeight: number;
  /** Font size for axis text, px: grows on wide screens so a projector stays readable. */
  fontSize: number;
};

/** Axis text size for a chart `width` px wide: 11 px on a phone, up to 15 px on a projector. */
export function fontSizeFor(width: number, minFontSize = 11): number {
  return Math.max(minFontSize, Math.round(Math.min(15, Math.max(11, width / 90))));
}

/** Height of one row of event glyphs under the plot, px. */
export const EVENT_ROW = 11;

/**
 * Margins that fit tick labels, the unit labels above the axes and the event strip below
 * (one row per kind of event shown).
 */
export function plotBox(
  width: number,
  height: number,
  opts: { rightAxis: boolean; eventRows?: number; minFontSize?: number },
): PlotBox {
  const fontSize = fontSizeFor(width, opts.minFontSize);
  const charW = fontSize * 0.62;
  const margin: Margins = {
    top: Math.round(fontSize * 2),
    left: Math.round(charW * 6 + 10),
    right: opts.rightAxis ? Math.round(charW * 5 + 10) : Math.round(fontSize),
    // Event strip, tick labels, and the "day" label.
    bottom: Math.round(6 + (opts.eventRows ?? 0) * EVENT_ROW + fontSize * 2.9),
  };
  const innerWidth = Math.max(40, width - margin.left - margin.right);
  const innerHeight = Math.max(40, height - margin.top - margin.bottom);
  return { width, height, margin, innerWidth, innerHeight, fontSize };
}

const maxCache = new WeakMap<object, number>();

/** Largest finite value of an array (−Infinity if none), cached per array identity. */
export function maxFinite(a: ArrayLike<number>): number {
  const hit = maxCache.get(a as object);
  if (hit !== undefined) return hit;
  let m = -Infinity;
  for (let i = 0; i < a.length; i++) {
    const v = a[i];
    if (v > m && Number.isFinite(v)) m = v;
  }
  maxCache.set(a as object, m);
  return m;
}

/**
 * A value domain from 0 to a round number above the largest value (and any guide values that
 * must stay in view), with 5 % headroom. [0, 1] when there is nothing positive to show.
 */
export function valueDomain(maxima: readonly number[], tickCount: number): [number, number] {
  let m = 0;
  for (const v of maxima) if (Number.isFinite(v) && v > m) m = v;
  if (!(m > 0)) return [0, 1];
  const d = scaleLinear()
    .domain([0, m * 1.05])
    .nice(tickCount)
    .domain();
  return [d[0], d[1]];
}

/**
 * How far a line that may leave the scale can stretch it and still count: 1.5, so the data keep
 * at least two thirds of the panel's height (our own choice, no source).
 */
const MAX_STRETCH = 1.5;

/**
 * The values a panel's scale must show: its data, guides, band and readings, and a line that
 * may leave the scale (a caution line far above the data) only when it is near them.
 */
export function panelMaxima(p: Pick<FramePanel, "lines" | "guides" | "bands" | "points">): number[] {
  const firm = [
    ...p.lines.filter((l) => !l.mayLeaveScale).map((l) => maxFinite(l.y)),
    ...(p.guides ?? []).map((g) => g.value),
    ...(p.bands ?? []).map((b) => b.high),
    ...(p.points ?? []).map((q) => q.value),
  ];
  const top = Math.max(0, ...firm.filter(Number.isFinite));
  const near = p.lines
    .filter((l) => l.mayLeaveScale)
    .map((l) => maxFinite(l.y))
    .filter((v) => top > 0 && v <= top * MAX_STRETCH);
  return [...firm, ...near];
}

/** Day domain of a run: its first and last sample (a zero-length run widens to one day). */
export function dayDomain(t: ArrayLike<number>): [number, number] {
  if (t.length === 0) return [0, 1];
  const a = t[0];
  const b = t[t.length - 1];
  return b > a ? [a, b] : [a, a + 1];
}

/** Tick counts that keep labels apart: one per ~80 px across, one per ~45 px up. */
export function tickCounts(box: PlotBox): { x: number; y: number } {
  return {
    x: Math.max(2, Math.floor(box.innerWidth / (box.fontSize * 6.5))),
    y: Math.max(2, Math.floor(box.innerHeight / (box.fontSize * 3.5))),
  };
}

export type Ticks = { value: number; label: string; pos: number }[];

export function ticksOf(scale: ScaleLinear<number, number>, count: number): Ticks {
  const fmt = scale.tickFormat(count);
  return scale.ticks(count).map((value) => ({ value, label: fmt(value), pos: scale(value) }));
}

/**
 * Spread direct labels vertically so none overlap: each label wants to sit at `y`; labels are
 * pushed apart to at least `gap` px and kept within [lo, hi]. Returns the placed y per input.
 */
export function spreadLabels(wanted: readonly number[], gap: number, lo: number, hi: number): number[] {
  const order = wanted.map((y, i) => ({ y: Math.min(Math.max(y, lo), hi), i })).sort((a, b) => a.y - b.y);
  for (let k = 1; k < order.length; k++) {
    if (order[k].y < order[k - 1].y + gap) order[k].y = order[k - 1].y + gap;
  }
  // If the stack ran past the bottom, shift it back up (and clamp at the top).
  const overflow = order.length ? order[order.length - 1].y - hi : 0;
  if (overflow > 0) {
    for (let k = order.length - 1; k >= 0; k--) {
      order[k].y -= overflow;
      if (k < order.length - 1 && order[k].y > order[k + 1].y - gap) order[k].y = order[k + 1].y - gap;
    }
  }
  const out = new Array<number>(wanted.length);
  for (const o of order) out[o.i] = Math.max(o.y, lo);
  return out;
}
