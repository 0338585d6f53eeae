import { describe, expect, it } from "vitest";
import { oxygenSaturation, simulate } from "../../models/index";
import { bareTank, feedForLoad, lastIndex, rel } from "./helpers";

describe("dissolved oxygen", () => {
  it.each([
    [0, 14.621], // Benson & Krause 1984, APHA Standard Methods 4500-O table (docs/sources.md §11, from memory)
    [10, 11.288], // Benson & Krause 1984, APHA Standard Methods 4500-O table (docs/sources.md §11, from memory)
    [20, 9.092], // Benson & Krause 1984, APHA Standard Methods 4500-O table (docs/sources.md §11, from memory)
    [25, 8.263], // Benson & Krause 1984, APHA Standard Methods 4500-O table (docs/sources.md §11, from memory)
    [30, 7.559], // Benson & Krause 1984, APHA Standard Methods 4500-O table (docs/sources.md §11, from memory)
    [40, 6.412], // Benson & Krause 1984, APHA Standard Methods 4500-O table (docs/sources.md §11, from memory)
  ])("saturation at %s °C is %s mg/L within 0.05 %%", (t, mgPerL) => {
    expect(rel(oxygenSaturation(t), mgPerL)).toBeLessThan(5e-4);
  });

  it("a tank with nothing breathing sits at saturation", () => {
    // Benson & Krause 1984: equilibrium with air (docs/sources.md §11)
    const r = simulate(
      bareTank({ filter: { establishedAtStart: false, capacityMgTanPerDay: 1 }, run: { lengthDays: 10 } }),
    );
    for (const o of r.series.o2) expect(rel(o, 8.263)).toBeLessThan(1e-3);
  });

  it("nitrification uses 4.57 mg O2 per mg N taken to nitrate (3.43 + 1.14)", () => {
    // US EPA (1993) Nitrogen Control; Metcalf & Eddy (docs/sources.md §4). Oxygen used = what the
    // surface brought in minus the change in the water, integrated over hourly samples.
    const s = bareTank({
      water: { startTan: 4, khDkh: 8, surfaceAgitation: "still" },
      filter: { turnoverPerHour: 0 },
      run: { lengthDays: 15, outputIntervalDays: 1 / 24 },
    });
    const r = simulate(s);
    const { t, o2, no2, no3 } = r.series;
    const kla = 1.5; // OXYGEN.exchangeStill (model choice, docs/sources.md §11)
    const sat = oxygenSaturation(25);
    let broughtIn = 0;
    for (let k = 1; k < t.length; k++) broughtIn += kla * (sat - (o2[k] + o2[k - 1]) / 2) * (t[k] - t[k - 1]);
    const k = lastIndex(r);
    const used = (broughtIn - (o2[k] - o2[0])) * 100;
    const expected = (3.43 * (no2[k] + no3[k]) + 1.14 * no3[k]) * 100;
    expect(no3[k]).toBeGreaterThan(2);
    expect(rel(used, expected)).toBeLessThan(0.03);
  });

  it("a still surface under a heavy load runs short of oxygen and ammonia builds; strong movement prevents it", () => {
    // Metcalf & Eddy Table 8-14: ammonia oxidisers slow below about K(O2) = 0.5 mg/L (docs/sources.md §6)
    const run = (surfaceAgitation: "still" | "strong") =>
      simulate(
        bareTank({
          water: { volumeL: 50, khDkh: 10, surfaceAgitation },
          fish: { feedGPerDay: feedForLoad(150), fractionEaten: 1 },
          filter: { capacityMgTanPerDay: 2000, turnoverPerHour: 0 },
          tapWater: { khDkh: 10 },
          maintenance: { waterChangeIntervalDays: 7, waterChangeFraction: 0.5 },
          run: { lengthDays: 30 },
        }),
      );
    const still = run("still");
    const strong = run("strong");
    expect(still.keyFigures.lowestOxygen.value).toBeLessThan(3);
    expect(strong.keyFigures.lowestOxygen.value).toBeGreaterThan(5);
    expect(still.keyFigures.peakTan.value).toBeGreaterThan(2 * strong.keyFigures.peakTan.value);
    expect(still.warnings.map((w) => w.code)).toContain("lowOxygen");
    expect(strong.warnings.map((w) => w.code)).not.toContain("lowOxygen");
  });

  it("growing plants add oxygen", () => {
    // photosynthesis releases O2 (docs/sources.md §11, computed from a photosynthetic quotient of 1)
    const withPlants = simulate(
      bareTank({
        water: { startNitrate: 5 },
        plants: [{ id: "p", growthForm: "floating", startMassG: 5, maxMassG: 50, growthRatePerDay: 0.2 }],
        run: { lengthDays: 5 },
      }),
    );
    expect(withPlants.series.o2[lastIndex(withPlants)]).toBeGreaterThan(oxygenSaturation(25));
  });
});
