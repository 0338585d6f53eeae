/**
 * A long run thinned before it is sent to a page (pure). A journal may hold 20,000 entries over
 * its two years of replay, each a pair of samples: some 33,000 samples and 15,000 event markers,
 * megabytes of page data for a chart a few hundred pixels wide. Per stretch of time, every
 * column keeps its lowest and highest sample (decimate.ts), so peaks and crossings survive
 * exactly; and one event of each kind is marked per stretch.
 */
import { decimateMinMax } from "~/components/charts/decimate";
import type { ChartEvent, ChartSeries } from "~/utils/chart-data";

/** Stretches of time a long run is cut into: about one per pixel column of a wide chart. */
const SENT_STRETCHES = 600;
/** Stretches for event markers: a marker is a few pixels wide, and each carries its words. */
const EVENT_STRETCHES = 200;

/** `s` with only the samples some column needs to draw its extremes per stretch; `s` itself when short. */
export function thinSeries(s: ChartSeries, stretches = SENT_STRETCHES): ChartSeries {
  const n = s.t.length;
  if (n <= 4 * stretches) return s;
  const x0 = s.t[0];
  const x1 = s.t[n - 1];
  const columns = [s.tan, s.nh3, s.no2, s.no3, ...s.plants.map((p) => p.massG), s.o2, s.tanLongTerm, s.tanShortTerm];
  const keep = new Uint8Array(n);
  for (const y of columns) {
    if (!y || y.length !== n) continue;
    for (const i of decimateMinMax(s.t, y, x0, x1, stretches, false).index) keep[i] = 1;
  }
  const index: number[] = [];
  keep.forEach((k, i) => k && index.push(i));
  const pick = (y: number[]) => index.map((i) => y[i]);
  const pickOptional = (y: number[] | undefined) => (y && y.length === n ? pick(y) : y);
  return {
    t: pick(s.t),
    tan: pick(s.tan),
    nh3: pick(s.nh3),
    no2: pick(s.no2),
    no3: pick(s.no3),
    plants: s.plants.map((p) => ({ ...p, massG: pick(p.massG) })),
    ...(s.o2 ? { o2: pickOptional(s.o2) } : {}),
    ...(s.tanLongTerm ? { tanLongTerm: pickOptional(s.tanLongTerm) } : {}),
    ...(s.tanShortTerm ? { tanShortTerm: pickOptional(s.tanShortTerm) } : {}),
  };
}

/** At most one event of each kind per stretch (the first), and how many there were. */
export function thinEvents(
  events: readonly ChartEvent[],
  x0: number,
  x1: number,
  stretches = EVENT_STRETCHES,
): { events: ChartEvent[]; total: number } {
  if (events.length <= stretches) return { events: [...events], total: events.length };
  const seen = new Set<string>();
  const scale = x1 > x0 ? stretches / (x1 - x0) : 0;
  const kept = events.filter((e) => {
    const key = `${e.kind}:${Math.min(stretches - 1, Math.max(0, Math.floor((e.day - x0) * scale)))}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
  return { events: kept, total: events.length };
}
