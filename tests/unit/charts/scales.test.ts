// Our own worked examples of domains, sizes and label spreading.
import { describe, expect, it } from "vitest";
import {
  dayDomain,
  fontSizeFor,
  maxFinite,
  panelMaxima,
  plotBox,
  spreadLabels,
  valueDomain,
} from "~/components/charts/scales";

describe("valueDomain", () => {
  it("starts at zero and ends on a round number above the largest value", () => {
    expect(valueDomain([12.74, 0.12], 5)).toEqual([0, 14]);
    expect(valueDomain([0.0024, 0.0165], 5)).toEqual([0, 0.02]);
  });

  it("falls back to [0, 1] with nothing positive", () => {
    expect(valueDomain([], 5)).toEqual([0, 1]);
    expect(valueDomain([0, -Infinity, NaN], 5)).toEqual([0, 1]);
  });
});

describe("maxFinite", () => {
  it("skips non-finite values", () => {
    expect(maxFinite([1, NaN, 3, Infinity, 2])).toBe(3);
    expect(maxFinite([])).toBe(-Infinity);
  });
});

describe("dayDomain", () => {
  it("spans the first and last sample, one day for a single sample", () => {
    expect(dayDomain([0, 0.5, 365])).toEqual([0, 365]);
    expect(dayDomain([3])).toEqual([3, 4]);
    expect(dayDomain([])).toEqual([0, 1]);
  });
});

describe("sizes", () => {
  it("keeps 11 px text on a phone and grows it up to 15 px on a projector", () => {
    expect(fontSizeFor(375)).toBe(11);
    expect(fontSizeFor(1200)).toBe(13);
    expect(fontSizeFor(1920)).toBe(15);
  });

  it("leaves a plot at least 240 px wide on a 375 px phone with both axes", () => {
    const box = plotBox(343, 300, { rightAxis: true });
    expect(box.innerWidth).toBeGreaterThanOrEqual(240);
    expect(box.margin.left + box.innerWidth + box.margin.right).toBe(343);
  });
});

describe("spreadLabels", () => {
  it("pushes overlapping labels apart by the gap and keeps their order", () => {
    expect(spreadLabels([50, 52, 100], 12, 0, 200)).toEqual([50, 62, 100]);
  });

  it("keeps labels inside the bounds, shifting the stack up at the bottom", () => {
    const placed = spreadLabels([195, 196, 197], 10, 0, 200);
    expect(Math.max(...placed)).toBeLessThanOrEqual(200);
    const sorted = [...placed].sort((a, b) => a - b);
    expect(sorted[1] - sorted[0]).toBeGreaterThanOrEqual(10);
    expect(sorted[2] - sorted[1]).toBeGreaterThanOrEqual(10);
  });
});

describe("panelMaxima", () => {
  const line = (key: string, y: number[], mayLeaveScale?: boolean) => ({
    key,
    t: y.map((_v, i) => i),
    y,
    color: "#000",
    width: 1,
    ...(mayLeaveScale ? { mayLeaveScale } : {}),
  });
  // US EPA 2013 (docs/sources.md §2) at pH 7 and 26 °C: long-term limit 1.3, short-term
  // criterion 10 mg TAN-N/L, over a cycling peak of 5.
  it("leaves out a line that may leave the scale when it sits far above the data", () => {
    const p = { lines: [line("tan", [0, 5, 1]), line("long", [1.3, 1.3, 1.3]), line("short", [10, 10, 10], true)] };
    expect(Math.max(...panelMaxima(p))).toBe(5);
    expect(valueDomain(panelMaxima(p), 5)[1]).toBeLessThan(10);
  });

  it("keeps it when it is near the data (pH 8 and 28 °C: short-term criterion 2.0 over a peak of 5)", () => {
    const p = { lines: [line("tan", [0, 5, 1]), line("short", [2, 2, 6], true)] };
    expect(Math.max(...panelMaxima(p))).toBe(6);
  });

  it("never lets it set the scale alone", () => {
    expect(panelMaxima({ lines: [line("tan", [0, 0]), line("short", [10, 10], true)] })).toEqual([0]);
  });
});
