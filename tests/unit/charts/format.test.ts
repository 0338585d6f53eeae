// Our own worked examples of number formatting.
import { describe, expect, it } from "vitest";
import { formatDay, formatMgN, formatNumber, formatPercent, formatSigned, splitMgN } from "~/components/charts/format";

describe("formatNumber", () => {
  it("gives three significant figures without exponents", () => {
    expect(formatNumber(12.7424)).toBe("12.7");
    expect(formatNumber(0.0023577)).toBe("0.00236");
    expect(formatNumber(56.4)).toBe("56.4");
    expect(formatNumber(1234.5)).toBe("1235");
    expect(formatNumber(-0.31)).toBe("-0.31");
    expect(formatNumber(0)).toBe("0");
    expect(formatNumber(7.6e-7)).toBe("<0.0001");
    expect(formatNumber(-3e-9)).toBe("<0.0001");
    expect(formatNumber(NaN)).toBe("–");
    expect(formatNumber(undefined)).toBe("–");
  });

  it("signs differences", () => {
    expect(formatSigned(1.94)).toBe("+1.94");
    expect(formatSigned(-2)).toBe("-2");
    expect(formatSigned(0)).toBe("0");
  });
});

describe("formatDay", () => {
  it("prints whole days and hours within a day", () => {
    expect(formatDay(14)).toBe("day 14");
    expect(formatDay(14.25)).toBe("day 14 + 6 h");
    expect(formatDay(1 / 24)).toBe("day 0 + 1 h");
    expect(formatDay(13.9999999999)).toBe("day 14");
  });
});

describe("nitrogen amounts", () => {
  it("switches from mg N to g N at 10 g", () => {
    expect(splitMgN(783.4)).toEqual({ value: "783", unit: "mg N" });
    expect(formatMgN(52502.6)).toBe("52.5 g N");
    expect(formatMgN(150000)).toBe("150 g N");
    expect(formatMgN(12.345)).toBe("12.3 mg N");
    expect(formatMgN(-2000)).toBe("-2000 mg N");
  });

  it("prints shares", () => {
    expect(formatPercent(0.623)).toBe("62 %");
    expect(formatPercent(0.0456)).toBe("4.6 %");
    expect(formatPercent(0.0000001)).toBe("<0.1 %");
    expect(formatPercent(0)).toBe("0 %");
  });
});
