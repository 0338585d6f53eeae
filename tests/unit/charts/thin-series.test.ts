// Our own worked examples: no science here, only what thinning a run for a page must keep.
import { describe, expect, it } from "vitest";
import { thinEvents, thinSeries } from "~/features/runs/thin-series";
import type { ChartEvent, ChartSeries } from "~/utils/chart-data";

/** A two-year journal logged every 50 minutes: each entry a pair of samples (before and after). */
function denseRun(days = 700, perDay = 29): ChartSeries {
  const t: number[] = [];
  const cols = {
    tan: [] as number[],
    nh3: [] as number[],
    no2: [] as number[],
    no3: [] as number[],
    mass: [] as number[],
  };
  const push = (d: number, k: number) => {
    t.push(d);
    cols.tan.push(0.1 + 0.05 * Math.sin(d) + (k === 9_001 ? 3 : 0)); // one spike of ammonia
    cols.nh3.push(0.001 * (1 + Math.sin(d / 3)));
    cols.no2.push(d > 400 && d < 401 ? 0.9 : 0.05); // a short nitrite rise
    cols.no3.push(20 + 10 * Math.sin(d / 30) - (k % 2) * 0.5); // the jump of each event
    cols.mass.push(10 + d / 100);
  };
  let k = 0;
  for (let i = 0; i < days * perDay; i++) {
    const d = i / perDay;
    push(d, k++);
    push(d, k++);
  }
  return {
    t,
    tan: cols.tan,
    nh3: cols.nh3,
    no2: cols.no2,
    no3: cols.no3,
    plants: [{ id: "s", name: "Stems", massG: cols.mass }],
    tanLongTerm: cols.tan.map(() => 1.9),
  };
}

const max = (y: number[]) => Math.max(...y);
const min = (y: number[]) => Math.min(...y);

describe("thinning a long run for a page", () => {
  const full = denseRun();
  const sent = thinSeries(full, 600);

  it("sends far fewer samples: at most the extremes of each column per stretch", () => {
    expect(full.t.length).toBe(40_600);
    // Seven columns, two extremes each per stretch, plus the first and last sample.
    expect(sent.t.length).toBeLessThanOrEqual(600 * 2 * 7 + 2);
    expect(sent.t.length).toBeLessThan(full.t.length / 4);
    for (const col of [sent.tan, sent.nh3, sent.no2, sent.no3, sent.plants[0].massG, sent.tanLongTerm!])
      expect(col).toHaveLength(sent.t.length);
  });

  it("keeps every column's peak and trough exactly, the short spike and rise included", () => {
    for (const key of ["tan", "nh3", "no2", "no3"] as const) {
      expect(max(sent[key])).toBe(max(full[key]));
      expect(min(sent[key])).toBe(min(full[key]));
    }
    expect(max(sent.tan)).toBeGreaterThan(3);
    expect(max(sent.no2)).toBe(0.9);
    expect(sent.t[0]).toBe(full.t[0]);
    expect(sent.t.at(-1)).toBe(full.t.at(-1));
  });

  it("keeps the samples in time order, each with its own values", () => {
    for (let i = 1; i < sent.t.length; i++) expect(sent.t[i]).toBeGreaterThanOrEqual(sent.t[i - 1]);
    const at = full.t.indexOf(sent.t[100]);
    expect(at).toBeGreaterThanOrEqual(0);
  });

  it("leaves a short run as it is", () => {
    const short = denseRun(30, 4);
    expect(thinSeries(short, 600)).toBe(short);
  });
});

describe("thinning the event markers", () => {
  const events: ChartEvent[] = Array.from({ length: 3_000 }, (_, i) => ({
    day: i / 5,
    kind: i % 3 === 0 ? "filterCleaning" : "waterChange",
    detail: `entry ${i}`,
  }));

  it("marks the first of each kind per stretch and says how many there were", () => {
    const { events: kept, total } = thinEvents(events, 0, 600, 200);
    expect(total).toBe(3_000);
    expect(kept.length).toBeLessThanOrEqual(2 * 200);
    expect(kept[0]).toBe(events[0]);
    expect(new Set(kept.map((e) => e.kind))).toEqual(new Set(["filterCleaning", "waterChange"]));
  });

  it("keeps every marker when there are few", () => {
    expect(thinEvents(events.slice(0, 50), 0, 10, 200).events).toEqual(events.slice(0, 50));
  });
});
