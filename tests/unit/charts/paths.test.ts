// Our own worked examples of path building.
import { scaleLinear } from "d3-scale";
import { describe, expect, it } from "vitest";
import { PATH_SCALE, linePath, scaledDash } from "~/components/charts/paths";

describe("linePath", () => {
  const t = [0, 1, 2, 2, 3];
  const y = [0, 10, 20, 5, 5];
  const x = scaleLinear().domain([0, 3]).range([0, 300]);
  const yScale = scaleLinear().domain([0, 20]).range([200, 0]);

  it("writes whole numbers in tenths of a pixel", () => {
    const d = linePath(t, y, x, yScale, 300);
    expect(d).toBe(`M0,${200 * PATH_SCALE}L1000,1000L2000,0L2000,1500L3000,1500`);
  });

  it("reuses the string while data and scales are unchanged, and rebuilds when a domain changes", () => {
    const a = linePath(t, y, x, yScale, 300);
    expect(linePath(t, y, x.copy(), yScale.copy(), 300)).toBe(a);
    const taller = scaleLinear().domain([0, 40]).range([200, 0]);
    expect(linePath(t, y, x, taller, 300)).not.toBe(a);
    expect(linePath(t, y, x, taller, 300)).toContain("L1000,1500");
  });

  it("breaks the path at a gap", () => {
    const d = linePath([0, 1, 2], [1, NaN, 1], x, yScale, 300);
    expect(d.match(/M/g)).toHaveLength(2);
  });
});

describe("scaledDash", () => {
  it("scales dash patterns into path units", () => {
    expect(scaledDash("6 4")).toBe("60 40");
    expect(scaledDash("12,3 3 3")).toBe("120 30 30 30");
    expect(scaledDash(undefined)).toBeUndefined();
  });
});
