import { describe, expect, it } from "vitest";
import type { OdeProblem } from "../../models/core/problem";
import { runLoop } from "../../models/core/simulate";
import { integrateSegment } from "../../models/core/solver";
import { simulate } from "../../models/index";
import { bareTank, din, feedForLoad, lastIndex, rel } from "./helpers";

// First-order chain A → B → C with k1 = 0.5, k2 = 0.2 /day, A0 = 10.
const chain: OdeProblem = {
  dim: 3,
  names: ["A", "B", "C"],
  rhs: (_t, y) => [-0.5 * y[0], 0.5 * y[0] - 0.2 * y[1], 0.2 * y[1]],
  absoluteTolerance: [1e-9, 1e-9, 1e-9],
  relativeTolerance: 1e-8,
};

describe("Bateman chain through the solver adapter", () => {
  it("matches A(2) and B(2)", () => {
    const samples: [number, number[]][] = [];
    const seg = integrateSegment({
      problem: chain,
      t0: 0,
      y0: [10, 0, 0],
      t1: 5,
      sampleTimes: [2],
      onSample: (t, y) => samples.push([t, y]),
      maxSteps: 10000,
      deadline: Infinity,
      initialStepSize: 0.01,
    });
    expect(seg.status).toBe("done");
    expect(samples).toHaveLength(1);
    const [, y2] = samples[0];
    expect(rel(y2[0], 3.678794)).toBeLessThan(0.005); // Bateman, docs/sources.md §10 (computed)
    expect(rel(y2[1], 5.040677)).toBeLessThan(0.005); // Bateman, docs/sources.md §10 (computed)
    // A + B + C is a linear invariant: kept to round-off
    expect(seg.y[0] + seg.y[1] + seg.y[2]).toBeCloseTo(10, 12);
  });

  it("finds the peak of B: 5.428835 at 3.054302 d", () => {
    // Bateman, docs/sources.md §10 (computed)
    let best = { t: 0, b: 0 };
    runLoop({
      problem: chain,
      y0: [10, 0, 0],
      tEnd: 10,
      outputInterval: 0.001,
      schedule: [],
      watches: [],
      onCrossing: (_w, _t, y) => ({ y, records: [] }),
      sample: (t, y) => {
        if (y[1] > best.b) best = { t, b: y[1] };
      },
      limits: { maxSteps: 100000, maxStepsPerSegment: 100000, maxWallMs: 10000 },
      describeFailure: () => "failed",
    });
    expect(rel(best.b, 5.428835)).toBeLessThan(0.005);
    expect(rel(best.t, 3.054302)).toBeLessThan(0.005);
  });

  it("detects an upward crossing by bisection on the dense output", () => {
    // our own worked example: C(t) = 10 − A − B reaches 5 where the Bateman sum equals 5
    const seg = integrateSegment({
      problem: chain,
      t0: 0,
      y0: [10, 0, 0],
      t1: 50,
      sampleTimes: [],
      onSample: () => {},
      watches: [{ index: 2, threshold: 5 }],
      maxSteps: 10000,
      deadline: Infinity,
      initialStepSize: 0.01,
    });
    expect(seg.status).toBe("crossed");
    const t = seg.t;
    const a = 10 * Math.exp(-0.5 * t);
    const b = ((10 * 0.5) / (0.2 - 0.5)) * (Math.exp(-0.5 * t) - Math.exp(-0.2 * t));
    expect(10 - a - b).toBeCloseTo(5, 6);
    expect(seg.y[2]).toBeCloseTo(5, 6);
  });
});

describe("tank against analytic water-exchange solutions", () => {
  // Example of docs/sources.md §10: V 100 L, L 20 mg N/day, r 0.05 /day, C_in 10 mg N/L.
  const load = 20;
  const feed = feedForLoad(load);

  it("continuous exchange reaches C_ss = C_in + L/(rV) = 14 mg N/L", () => {
    const s = bareTank({
      fish: { feedGPerDay: feed, proteinFraction: 0.45 },
      maintenance: { dripLPerDay: 5 },
      tapWater: { nitrate: 10, khDkh: 6 },
      run: { lengthDays: 400 },
    });
    const r = simulate(s);
    const k = lastIndex(r);
    // Continuous exchange, docs/sources.md §10 (computed); total dissolved inorganic N
    expect(rel(din(r, k), 14)).toBeLessThan(0.005);
    // The transient from an empty start, C(10) = 5.508571 and C(100) = 13.905669
    // (docs/sources.md §10), holds because an established tank starts with its pools at their
    // steady levels so the load is constant from day 0.
    expect(rel(din(r, 10), 5.508571)).toBeLessThan(0.005);
    expect(rel(din(r, 100), 13.905669)).toBeLessThan(0.005);
  });

  it("periodic changes: nitrogen just before a change → C_in + Lτ/(Vf) = 15.6", () => {
    const s = bareTank({
      fish: { feedGPerDay: feed, proteinFraction: 0.45 },
      maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.25, gravelCleaningFraction: 0 },
      tapWater: { nitrate: 10, khDkh: 6 },
      run: { lengthDays: 400, outputIntervalDays: 0.25 },
    });
    const r = simulate(s);
    const changes = r.events.filter((e) => e.kind === "waterChange");
    const lastDay = changes[changes.length - 1].day;
    // the two samples at the last change: just before, just after
    const at = r.series.t.flatMap((t, k) => (t === lastDay ? [k] : []));
    expect(at).toHaveLength(2);
    // Periodic water changes, docs/sources.md §10 (computed)
    expect(rel(din(r, at[0]), 15.6)).toBeLessThan(0.005);
    expect(rel(din(r, at[1]), 14.2)).toBeLessThan(0.005);
    // cycle average C_in + (Lτ/V)(1/f − 1/2) = 14.9 over the last full cycle (trapezoid)
    const prev = lastDay - 7;
    const from = r.series.t.findIndex((t) => t === prev) + 1; // the "just after" sample
    let area = 0;
    for (let k = from + 1; k <= at[0]; k++)
      area += ((din(r, k) + din(r, k - 1)) / 2) * (r.series.t[k] - r.series.t[k - 1]);
    expect(rel(area / 7, 14.9)).toBeLessThan(0.005);
    expect(r.keyFigures.nitrateBeforeLastWaterChange).not.toBeNull();
  });
});
