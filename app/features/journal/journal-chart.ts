/**
 * The "as it happened" curve's drawing: nitrate over the days since the journal's first entry,
 * the test readings as dots, the upper target as a dashed line. Client-safe (d3 only).
 */
import { scaleLinear } from "d3-scale";
import { line } from "d3-shape";

/** Nitrate (`no3`, `high`, readings) in the person's unit, NO3 or NO3-N. */
export type ReplayCurve = { t: number[]; no3: number[]; high: number; readings: { day: number; no3: number }[] };

export function replayPaths(c: ReplayCurve, width: number, height: number) {
  const maxDay = Math.max(1, ...c.t);
  const maxNo3 = Math.max(c.high * 1.2, ...c.no3, ...c.readings.map((r) => r.no3)) * 1.05;
  const x = scaleLinear()
    .domain([0, maxDay])
    .range([40, width - 10]);
  const y = scaleLinear()
    .domain([0, maxNo3])
    .range([height - 24, 8]);
  const path = line<number>()
    .x((_, k) => x(c.t[k]))
    .y((v) => y(v))(c.no3);
  return {
    path: path ?? "",
    highY: y(c.high),
    dots: c.readings.map((r) => ({ cx: x(r.day), cy: y(r.no3) })),
    xTicks: x.ticks(6).map((d) => ({ x: x(d), label: String(d) })),
    yTicks: y.ticks(4).map((v) => ({ y: y(v), label: String(v) })),
  };
}
