// Our own worked examples of cursor movement and lookups (no science values).
import { describe, expect, it } from "vitest";
import {
  lowerBound,
  nearestIndex,
  residualsNear,
  sampleSide,
  stepCursor,
  typicalSpacing,
  upperBound,
  valueAt,
} from "~/utils/series-lookup";

// Samples every half day with an event pair at day 2 (before: index 4, after: index 5).
const t = [0, 0.5, 1, 1.5, 2, 2, 2.5, 3];
const y = [0, 1, 2, 3, 4, 1, 2, 3];

describe("bounds and nearest sample", () => {
  it("finds first ≥ and first >", () => {
    expect(lowerBound(t, 2)).toBe(4);
    expect(upperBound(t, 2)).toBe(6);
    expect(lowerBound(t, -1)).toBe(0);
    expect(lowerBound(t, 9)).toBe(8);
  });

  it("picks the nearest sample and the requested side of an event pair", () => {
    expect(nearestIndex(t, 0.7)).toBe(1);
    expect(nearestIndex(t, 0.8)).toBe(2);
    expect(nearestIndex(t, 2.1)).toBe(4);
    expect(nearestIndex(t, 2.1, "after")).toBe(5);
    expect(nearestIndex(t, 50)).toBe(7);
    expect(nearestIndex([], 1)).toBe(-1);
  });

  it("says which half of an event pair a sample is", () => {
    expect(sampleSide(t, 4)).toBe("before");
    expect(sampleSide(t, 5)).toBe("after");
    expect(sampleSide(t, 3)).toBeNull();
  });
});

describe("stepCursor", () => {
  it("moves one sample with the arrows, through both halves of an event", () => {
    expect(stepCursor(t, 3, "ArrowRight")).toBe(4);
    expect(stepCursor(t, 4, "ArrowRight")).toBe(5);
    expect(stepCursor(t, 5, "ArrowLeft")).toBe(4);
    expect(stepCursor(t, 0, "ArrowLeft")).toBe(0);
    expect(stepCursor(t, 7, "ArrowUp")).toBe(7);
    expect(stepCursor(t, 2, "ArrowDown")).toBe(1);
  });

  it("jumps to the ends with Home and End and ignores other keys", () => {
    expect(stepCursor(t, 3, "Home")).toBe(0);
    expect(stepCursor(t, 3, "End")).toBe(7);
    expect(stepCursor(t, 3, "a")).toBeNull();
    expect(stepCursor([], 0, "End")).toBeNull();
  });

  it("moves a week with Page Up / Page Down on hourly samples", () => {
    const hourly = Array.from({ length: 30 * 24 + 1 }, (_v, i) => i / 24);
    const at10 = 10 * 24;
    expect(hourly[stepCursor(hourly, at10, "PageUp")!]).toBe(17);
    expect(hourly[stepCursor(hourly, at10, "PageDown")!]).toBe(3);
    // Near the ends it stops at the first or last sample.
    expect(stepCursor(hourly, 24, "PageDown")).toBe(0);
    expect(stepCursor(hourly, hourly.length - 30, "PageUp")).toBe(hourly.length - 1);
  });

  it("always moves at least one sample with Page keys on coarse output", () => {
    const weekly = [0, 7, 14];
    expect(stepCursor(weekly, 0, "PageUp")).toBe(1);
    expect(stepCursor(weekly, 2, "PageDown")).toBe(1);
    const fortnightly = [0, 14, 28];
    expect(stepCursor(fortnightly, 0, "PageUp")).toBe(1);
  });
});

describe("valueAt", () => {
  it("interpolates between samples and is exact on a sample", () => {
    expect(valueAt(t, y, 0.25)).toBeCloseTo(0.5, 12);
    expect(valueAt(t, y, 1.5)).toBe(3);
    expect(valueAt(t, y, 2.25)).toBeCloseTo(1.5, 12); // from the "after" sample at day 2
  });

  it("takes the requested side on an event's day and NaN outside the run", () => {
    expect(valueAt(t, y, 2, "before")).toBe(4);
    expect(valueAt(t, y, 2, "after")).toBe(1);
    expect(valueAt(t, y, -0.1)).toBeNaN();
    expect(valueAt(t, y, 3.1)).toBeNaN();
  });
});

describe("residualsNear", () => {
  it("gives reading − model for readings within the tolerance, the model taken before an event", () => {
    const model = { tan: y, no2: y, no3: y.map((v) => v * 10) };
    const readings = [
      { day: 2, no3: 38, tan: null },
      { day: 1, no2: 2.5 },
      { day: 0.4, tan: 1 },
    ];
    const near = residualsNear(readings, 1.9, 0.5, t, model);
    expect(near).toEqual([{ key: "no3", day: 2, measured: 38, model: 40, residual: -2 }]);
    const near1 = residualsNear(readings, 1, 0.5, t, model);
    expect(near1).toEqual([{ key: "no2", day: 1, measured: 2.5, model: 2, residual: 0.5 }]);
  });
});

describe("typicalSpacing", () => {
  it("is the usual gap, not fooled by event pairs", () => {
    expect(typicalSpacing(t)).toBe(0.5);
    expect(typicalSpacing([0, 1, 2, 2, 3, 4])).toBe(1);
    expect(typicalSpacing([5])).toBe(1);
  });
});
