/**
 * KH consumed by nitrification: the warning shows whenever KH is (or falls) below the line where
 * the bacteria stall, and pH follows KH down when the scenario says it does.
 */
import { describe, expect, it } from "vitest";
import { simulate } from "../../models/index";
import { bareTank } from "./helpers";

const fed = (khDkh: number, phFollowsKh = false) =>
  bareTank({
    water: { khDkh, pH: 7.5, phFollowsKh },
    tapWater: { khDkh },
    fish: { feedGPerDay: 1 },
    run: { lengthDays: 120 },
  });

describe("KH running out", () => {
  it("a fed tank without water changes uses its KH up and is warned, with the day", () => {
    // Nitrification takes 7.14 mg CaCO3 per mg N (US EPA 1993 Nitrogen Control; docs/sources.md)
    const r = simulate(fed(1));
    const w = r.warnings.find((x) => x.code === "khExhausted");
    expect(w).toBeDefined();
    expect(w!.value).toBeLessThan(0.5);
    expect(w!.day).toBeGreaterThan(0);
  });

  it("a tank that starts below the line is warned too", () => {
    // KH half-saturation of the nitrifiers, 0.5 dKH (model choice, no source): below it they stall
    const r = simulate(fed(0.3));
    expect(r.warnings.map((x) => x.code)).toContain("khExhausted");
  });

  it("pH follows KH down as log10(KH/KH0) at fixed CO2", () => {
    // Henderson–Hasselbalch for the carbonate buffer: pH = pKa1 + log10([HCO3-]/[CO2])
    const r = simulate(fed(1, true));
    const k = r.series.kh.findIndex((v) => v < 0.5);
    expect(k).toBeGreaterThan(0);
    expect(r.series.ph[k]).toBeCloseTo(7.5 + Math.log10(r.series.kh[k] / 1), 3);
    expect(Math.min(...r.series.ph)).toBeLessThan(7.2);
  });
});

describe("when a warning says to act", () => {
  it("KH's warning is dated when KH first falls below the line, not at its lowest", () => {
    // our own check: the day is when to act; by the lowest point the harm is done
    const r = simulate(fed(1));
    const w = r.warnings.find((x) => x.code === "khExhausted")!;
    const first = r.series.t[r.series.kh.findIndex((v) => v < 0.5)];
    // within a chart sample (1 day) of the first sample below the line
    expect(Math.abs(w.day! - first)).toBeLessThanOrEqual(1);
    expect(w.day!).toBeLessThan(r.keyFigures.lowestKh.day);
  });

  it("oxygen's warning is dated when it first falls below 3 mg/L (US EPA 1986, from memory)", () => {
    const r = simulate(
      bareTank({
        water: { volumeL: 20, surfaceAgitation: "still" },
        filter: { turnoverPerHour: 0, establishedAtStart: false },
        fish: { feedGPerDay: 1.5 },
        run: { lengthDays: 60 },
      }),
    );
    const w = r.warnings.find((x) => x.code === "lowOxygen");
    expect(w).toBeDefined();
    const first = r.series.t[r.series.o2.findIndex((v) => v < 3)];
    expect(Math.abs(w!.day! - first)).toBeLessThanOrEqual(1);
    // a new filter's nitrification keeps taking more oxygen: the lowest comes weeks later
    expect(w!.day!).toBeLessThan(r.keyFigures.lowestOxygen.day - 7);
  });
});
