// Our own worked examples: no science here, only what the thinning must keep.
import { describe, expect, it } from "vitest";
import { decimateCached, decimateMinMax } from "~/components/charts/decimate";

/** Days 0..days at `perDay` samples a day, with an event pair (before, after) at each `eventDays`. */
function makeRun(days: number, perDay: number, f: (t: number) => number, eventDays: number[] = []) {
  const t: number[] = [];
  const y: number[] = [];
  for (let k = 0; k <= days * perDay; k++) {
    const d = k / perDay;
    t.push(d);
    y.push(f(d));
    if (eventDays.includes(d)) {
      t.push(d);
      y.push(f(d) * 0.6); // a water change: the value drops at the same instant
    }
  }
  return { t, y };
}

describe("decimateMinMax", () => {
  it("keeps everything when the series is already thin", () => {
    const t = [0, 1, 2, 3];
    expect(decimateMinMax(t, [1, 2, 3, 4], 0, 3, 100).index).toEqual([0, 1, 2, 3]);
  });

  it("keeps the smallest and the largest sample of each column, in time order", () => {
    // 2 columns over days [0, 10): column 0 holds samples 1–4, column 1 samples 5–8.
    const t = [0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10];
    const y = [5, 1, 9, 3, 4, 8, 2, 6, 7, 0, 5];
    const { index } = decimateMinMax(t, y, 0, 10, 2);
    // First and last exact; col 0 → min at 1 (y=1), max at 2 (y=9); col 1 → max at 5, min at 9.
    expect(index).toEqual([0, 1, 2, 5, 9, 10]);
  });

  it("thins a year of hourly output to about two points per column and keeps its extremes", () => {
    const { t, y } = makeRun(365, 24, (d) => 10 + 5 * Math.sin(d * 2 * Math.PI) + d / 50);
    expect(t.length).toBe(8761);
    const cols = 600;
    const { index } = decimateMinMax(t, y, 0, 365, cols);
    expect(index.length).toBeLessThanOrEqual(2 * cols + 2);
    expect(index.length).toBeGreaterThan(cols);
    // Indices increase strictly.
    for (let k = 1; k < index.length; k++) expect(index[k]).toBeGreaterThan(index[k - 1]);
    // Every column's min and max survive exactly.
    const perCol = (idx: number[]) => {
      const m = new Map<number, [number, number]>();
      for (const i of idx) {
        // The same bucket arithmetic as the code: (t − x0) × (columns / span).
        const c = Math.min(cols - 1, Math.floor(t[i] * (cols / 365)));
        const cur = m.get(c) ?? [Infinity, -Infinity];
        m.set(c, [Math.min(cur[0], y[i]), Math.max(cur[1], y[i])]);
      }
      return m;
    };
    const all = perCol(t.map((_v, i) => i));
    const kept = perCol(index);
    expect(kept).toEqual(all);
  });

  it("keeps both samples of every event pair so a water change stays a vertical step", () => {
    const events = [7, 14, 21, 28];
    const { t, y } = makeRun(30, 24, (d) => 5 + d, events);
    const { index } = decimateMinMax(t, y, 0, 30, 50);
    for (const day of events) {
      const pair = t.flatMap((d, i) => (d === day ? [i] : []));
      expect(pair).toHaveLength(2);
      expect(index).toEqual(expect.arrayContaining(pair));
    }
  });

  it("breaks the line at a gap and keeps the samples on either side of it", () => {
    const t = Array.from({ length: 100 }, (_v, i) => i);
    const y = t.map((d) => (d === 50 ? NaN : d));
    const { index } = decimateMinMax(t, y, 0, 99, 10);
    expect(index).toEqual(expect.arrayContaining([49, 50, 51]));
  });
});

describe("decimateCached", () => {
  it("returns the same result object for the same arrays, domain and width, and a new one otherwise", () => {
    const { t, y } = makeRun(10, 24, (d) => d);
    const a = decimateCached(t, y, 0, 10, 40);
    expect(decimateCached(t, y, 0, 10, 40)).toBe(a);
    expect(decimateCached(t, y, 0, 10, 41)).not.toBe(a);
    expect(decimateCached(t, y.slice(), 0, 10, 40)).toEqual(decimateCached(t, y, 0, 10, 40));
  });
});
