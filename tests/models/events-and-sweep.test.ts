import { describe, expect, it } from "vitest";
import { OUTCOMES, ScenarioSchema, plantGroupFromForm, setScenarioValue, simulate, sweep } from "../../models/index";
import { bareTank } from "./helpers";

describe("events", () => {
  it("ammonia rises for a few hours after each meal when meals are pulses", () => {
    // common practice, no source (fish excrete most ammonia in the hours after feeding)
    const s = bareTank({
      water: { khDkh: 8 },
      fish: { feedGPerDay: 1, feedsPerDay: 1, pulsedFeeding: true },
      run: { lengthDays: 12, outputIntervalDays: 1 / 24 },
    });
    const r = simulate(s);
    const day = r.series.t.flatMap((t, k) => (t >= 10 && t < 11 ? [k] : []));
    const tan = day.map((k) => r.series.tan[k]);
    const peakAt = r.series.t[day[tan.indexOf(Math.max(...tan))]] - 10;
    expect(peakAt).toBeGreaterThan(0.05);
    expect(peakAt).toBeLessThan(0.5);
    expect(Math.max(...tan)).toBeGreaterThan(1.1 * Math.min(...tan));
    expect(r.events.filter((e) => e.kind === "feeding")).toHaveLength(12);
    expect(r.budget.imbalanceRelative).toBeLessThan(1e-9);
  });

  it("a group trimmed when full is cut back at the threshold, and its nitrogen leaves", () => {
    // our own worked example: 2 g of floating plants growing to 10 g, trimmed at 9 g back to 5 g
    const g = plantGroupFromForm("floating", {
      startMassG: 2,
      maxMassG: 10,
      trim: { rule: "whenFull", fullAtFraction: 0.9, trimToFraction: 0.5, everyDays: 14 },
    });
    const s = bareTank({ fish: { feedGPerDay: 1 }, water: { startNitrate: 5 }, plants: [g], run: { lengthDays: 60 } });
    const r = simulate(s);
    const trims = r.events.filter((e) => e.kind === "trim");
    expect(trims.length).toBeGreaterThan(1);
    const mass = r.series.plants[0].massG;
    for (const e of trims) {
      const at = r.series.t.flatMap((t, k) => (t === e.day ? [k] : []));
      expect(at).toHaveLength(2);
      expect(mass[at[0]]).toBeCloseTo(9, 4);
      expect(mass[at[1]]).toBeCloseTo(5, 4);
    }
    expect(Math.max(...mass)).toBeLessThanOrEqual(9 + 1e-6);
    expect(r.budget.outputs.trims).toBeCloseTo(trims.length * 4 * 0.04 * 1000, 3);
    expect(r.keyFigures.plantsTrimmedG).toBeCloseTo(trims.length * 4, 3);
  });

  it("trim times do not depend on the chart spacing", () => {
    // our own check: crossings come from the solver's dense output, not from chart points
    const g = plantGroupFromForm("floating", { startMassG: 2, maxMassG: 10 });
    const days = (dt: number) =>
      simulate(
        bareTank({
          fish: { feedGPerDay: 1 },
          water: { startNitrate: 5 },
          plants: [g],
          run: { lengthDays: 60, outputIntervalDays: dt },
        }),
      )
        .events.filter((e) => e.kind === "trim")
        .map((e) => e.day);
    const daily = days(1);
    const hourly = days(1 / 24);
    expect(hourly).toHaveLength(daily.length);
    hourly.forEach((d, i) => expect(Math.abs(d - daily[i])).toBeLessThan(1e-3));
  });
});

describe("sweeps", () => {
  it("varies one setting without touching the scenario and reports outcomes", () => {
    // common practice, no source: changing more water (tap nitrate below the tank's) lowers nitrate
    const s = ScenarioSchema.parse({ run: { lengthDays: 90 } });
    const before = structuredClone(s);
    const points = sweep(s, ["maintenance", "waterChangeFraction"], [0.1, 0.3, 0.5], {
      outcomes: ["nitrateEnd", "peakFreeNh3"],
    });
    expect(s).toEqual(before);
    expect(points.map((p) => p.error)).toEqual([null, null, null]);
    const n = points.map((p) => p.outcomes.nitrateEnd as number);
    expect(n[0]).toBeGreaterThan(n[1]);
    expect(n[1]).toBeGreaterThan(n[2]);
    // outcomes come back in OUTCOMES order
    expect(Object.keys(points[0].outcomes)).toEqual(
      OUTCOMES.map((o) => o.id).filter((id) => id === "nitrateEnd" || id === "peakFreeNh3"),
    );
  });

  it("reports an invalid point instead of stopping", () => {
    const s = ScenarioSchema.parse({ run: { lengthDays: 10 } });
    const points = sweep(s, ["plants", 0, "startMassG"], [10, 500]);
    expect(points[0].error).toBeNull();
    expect(points[1].error).toMatch(/cannot be more than the most the tank holds/);
    expect(() => setScenarioValue(s, ["water", "nope"], 1)).toThrow(/No setting/);
  });
});
