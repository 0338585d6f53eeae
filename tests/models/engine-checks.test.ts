import { describe, expect, it } from "vitest";
import { PRESETS, ScenarioSchema, getPreset, plantGroupFromForm, simulate } from "../../models/index";
import { bareTank, feedForLoad, lastIndex, rel } from "./helpers";

describe("stoichiometry inside the running model", () => {
  it("KH falls 0.400 dKH per mg N/L oxidised", () => {
    // US EPA (1993) Manual: Nitrogen Control; Metcalf & Eddy — 7.14 mg CaCO3 per mg N
    const s = bareTank({ water: { startTan: 5, khDkh: 8 }, run: { lengthDays: 20 } });
    const r = simulate(s);
    const k = lastIndex(r);
    const oxidised = r.series.no2[k] + r.series.no3[k]; // started at 0
    const khDrop = 8 - r.series.kh[k];
    // NOB take 0.6 % of the nitrite they oxidise into biomass, so allow 1 %
    expect(rel(khDrop / oxidised, 0.4)).toBeLessThan(0.01);
  });

  it("anammox uses 1.32 nitrite per ammonium and makes 0.26 nitrate and 2.04 N2-N", () => {
    // Strous et al. 1998: NH4+ + 1.32 NO2- → 1.02 N2 + 0.26 NO3-
    const s = bareTank({
      water: { startTan: 2, startNitrite: 3, khDkh: 6 },
      filter: { establishedAtStart: false, capacityMgTanPerDay: 1 },
      lowOxygen: {
        enabled: true,
        denitrificationCapacityMgNPerDay: 0,
        anammoxEnabled: true,
        // anammox is inhibited by the little oxygen that reaches the zone (docs/sources.md §12)
        anammoxCapacityMgNPerDay: 200,
      },
      run: { lengthDays: 3 },
    });
    const r = simulate(s);
    const k = lastIndex(r);
    const V = 100;
    const usedNh4 = (2 - r.series.tan[k]) * V;
    const usedNo2 = (3 - r.series.no2[k]) * V;
    const madeNo3 = r.series.no3[k] * V;
    expect(usedNh4).toBeGreaterThan(30);
    expect(rel(usedNo2 / usedNh4, 1.32)).toBeLessThan(0.01);
    expect(rel(madeNo3 / usedNh4, 0.26)).toBeLessThan(0.01);
    expect(rel(r.budget.outputs.anammoxN2 / usedNh4, 2.04)).toBeLessThan(0.01);
  });

  it("fish excrete feed × protein × 0.092 as TAN and the budget places all feed N", () => {
    // Timmons & Ebeling: 0.092 = 0.16 × 0.80 × 0.80 × 0.90 (exact product 0.09216 in the engine)
    const s = bareTank({ fish: { feedGPerDay: 2, proteinFraction: 0.4, fractionEaten: 1 }, run: { lengthDays: 50 } });
    const r = simulate(s);
    const f = r.budget.feedFate;
    // the established tank starts with a steady meal in the fish, so excretion is steady from day 0
    expect(rel(f.excretedAsTan / 50, 2 * 0.4 * 0.16 * 0.8 * 0.8 * 0.9 * 1000)).toBeLessThan(1e-9);
    const placed =
      f.excretedAsTan + f.excretedAsUrea + f.faeces + f.fishGrowth + f.uneatenToDetritus + f.uneatenRemoved;
    // everything that went in, less what is still inside the fish, plus what was inside at the start
    expect(placed).toBeCloseTo(r.budget.inputs.feed - f.stillInFish + r.budget.stockStart.fishGut, 6);
  });
});

describe("facts of the trade", () => {
  it("a water change with tap nitrate above the tank's raises tank nitrate", () => {
    // common practice, no source
    const s = bareTank({
      water: { startNitrate: 2 },
      maintenance: { waterChangeIntervalDays: 5, waterChangeFraction: 0.3 },
      tapWater: { nitrate: 10 },
      run: { lengthDays: 6 },
    });
    const r = simulate(s);
    const at = r.series.t.flatMap((t, k) => (t === 5 ? [k] : []));
    expect(at).toHaveLength(2);
    expect(r.series.no3[at[1]]).toBeGreaterThan(r.series.no3[at[0]] + 1);
  });

  it("plants take ammonium before nitrate", () => {
    // common practice, no source (and Nelson, Smith & Best 1980; Feijoó et al. 2002 for the preference)
    const s = bareTank({
      water: { startTan: 0.5, startNitrate: 0.5 },
      filter: { establishedAtStart: false, capacityMgTanPerDay: 1 },
      plants: [plantGroupFromForm("floating", { startMassG: 5, maxMassG: 50 })],
      run: { lengthDays: 4, outputIntervalDays: 0.1 },
    });
    const r = simulate(s);
    // over the first half day ammonium falls much faster than nitrate
    const k = r.series.t.findIndex((t) => t >= 0.5);
    const dTan = 0.5 - r.series.tan[k];
    const dNo3 = 0.5 - r.series.no3[k];
    expect(dTan).toBeGreaterThan(0.05);
    expect(dTan).toBeGreaterThan(3 * dNo3);
    // once ammonium is mostly gone, nitrate goes too
    const end = lastIndex(r);
    expect(r.series.tan[end]).toBeLessThan(0.05);
    expect(r.series.no3[end]).toBeLessThan(0.4);
  });

  it("a fishless cycle shows the TAN peak before the nitrite peak before the nitrate rise", () => {
    // common practice, no source
    const r = simulate(ScenarioSchema.parse(getPreset("first-light-fishless")!.scenario));
    const k = r.keyFigures;
    const halfNitrate = k.peakNitrate.value / 2;
    const rise = r.series.t[r.series.no3.findIndex((v) => v >= halfNitrate)];
    expect(k.peakTan.day).toBeLessThan(k.peakNitrite.day);
    expect(k.peakNitrite.day).toBeLessThan(rise);
    expect(k.cycleSeen).toBe(true);
    // a fishless cycle at 25 °C takes roughly two to six weeks
    expect(k.cyclingFinishedDay).not.toBeNull();
    expect(k.cyclingFinishedDay!).toBeGreaterThan(14);
    expect(k.cyclingFinishedDay!).toBeLessThan(42);
    expect(r.events.some((e) => e.kind === "dosingStopped")).toBe(true);
  });

  it("rinsing filter media in tap water gives a bigger ammonia bump than rinsing in tank water", () => {
    // common practice, no source
    const run = (tap: boolean) =>
      simulate(
        bareTank({
          water: { khDkh: 8 },
          fish: { feedGPerDay: 1 },
          filter: { cleaningIntervalDays: 20, cleanedInTapWater: tap },
          maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.3 },
          tapWater: { khDkh: 8 },
          run: { lengthDays: 30, outputIntervalDays: 0.25 },
        }),
      );
    const tap = run(true).keyFigures.peakTan;
    const tank = run(false).keyFigures.peakTan;
    expect(tap.day).toBeGreaterThanOrEqual(20);
    expect(tap.value).toBeGreaterThan(tank.value * 1.2);
  });

  it("feeding more ends with more nitrate", () => {
    // common practice, no source
    const run = (g: number) =>
      simulate(bareTank({ fish: { feedGPerDay: g }, run: { lengthDays: 60 } })).keyFigures.nitrateEnd;
    expect(run(1)).toBeGreaterThan(run(0.5));
  });

  it("more ammonia is free NH3 at higher pH", () => {
    // Emerson et al. 1975 (teacher's demonstration)
    const run = (pH: number) =>
      simulate(bareTank({ water: { pH, startTan: 1 }, run: { lengthDays: 1 } })).keyFigures.peakFreeNh3.value;
    expect(run(8)).toBeGreaterThan(5 * run(7));
  });

  it("a load the filter cannot handle builds up ammonia", () => {
    // common practice, no source: overstocking a small filter
    const load = feedForLoad(400);
    const r = simulate(
      bareTank({ fish: { feedGPerDay: load }, filter: { capacityMgTanPerDay: 100 }, run: { lengthDays: 30 } }),
    );
    expect(r.keyFigures.peakTan.value).toBeGreaterThan(1);
  });
});

describe("presets", () => {
  it.each(PRESETS.map((p) => [p.id, p] as const))("%s parses, runs and balances", (_id, p) => {
    // our own worked examples
    const r = simulate(ScenarioSchema.parse(p.scenario));
    expect(r.budget.imbalanceRelative).toBeLessThan(1e-9);
    expect(r.series.t.length).toBeGreaterThan(10);
  });

  it("the high-nitrate tap preset keeps nitrate above the target band", () => {
    // our own worked example: tap water at 40 mg/L as NO3 alone is above a 20 mg/L target
    const r = simulate(ScenarioSchema.parse(getPreset("hard-spring")!.scenario));
    expect(r.keyFigures.nitrateBeforeLastWaterChange!).toBeGreaterThan(r.series.no3[0] * 0.9);
    expect(r.keyFigures.daysAboveNitrateTarget).toBeGreaterThan(60);
  });
});
