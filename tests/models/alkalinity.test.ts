import { describe, expect, it } from "vitest";
import { plantGroupFromForm, simulate } from "../../models/index";
import { LOW_OXYGEN, OXYGEN } from "../../models/nitrogen/parameters";
import { deriveConstants } from "../../models/nitrogen/tank-constants";
import { bareTank, lastIndex, rel } from "./helpers";

// The whole alkalinity balance, one process at a time. Counting NH4+ as a cation and nitrite and
// nitrate as anions of strong acids (US EPA 1993 Nitrogen Control; Metcalf & Eddy; docs/sources.md
// §4), each mg N/L moved shifts KH by a whole number of equivalents: 50.04/14.007 mg CaCO3 per
// mg N = 0.200 dKH per mg N/L per equivalent.

/** A filter with next to no bacteria, so nitrification does not blur the process under test. */
const NO_NITRIFIERS = { establishedAtStart: false, capacityMgTanPerDay: 1 } as const;

describe("alkalinity, each process with its sign", () => {
  it("ammonium made from food and detritus adds 0.200 dKH per mg N/L", () => {
    // +1 equivalent per N: organic N → NH4+ (US EPA 1993; Metcalf & Eddy)
    const r = simulate(
      bareTank({
        water: { khDkh: 4 },
        fish: { feedGPerDay: 1, fractionEaten: 0.5 },
        filter: NO_NITRIFIERS,
        run: { lengthDays: 5 },
      }),
    );
    const k = lastIndex(r);
    const madeTan = r.series.tan[k] + r.series.no2[k] + r.series.no3[k];
    expect(madeTan).toBeGreaterThan(1);
    expect(rel((r.series.kh[k] - 4) / madeTan, 0.2)).toBeLessThan(0.01);
  });

  it("plants taking ammonium remove 0.200 dKH per mg N/L", () => {
    // −1 equivalent per N: NH4+ uptake releases H+ (US EPA 1993; Metcalf & Eddy)
    const r = simulate(
      bareTank({
        water: { startTan: 2, khDkh: 4 },
        filter: NO_NITRIFIERS,
        plants: [plantGroupFromForm("floating", { startMassG: 10, maxMassG: 100 })],
        run: { lengthDays: 2 },
      }),
    );
    const k = lastIndex(r);
    const taken = 2 - r.series.tan[k];
    expect(taken).toBeGreaterThan(0.5);
    expect(rel((4 - r.series.kh[k]) / taken, 0.2)).toBeLessThan(0.01);
  });

  it("plants taking nitrate add 0.200 dKH per mg N/L", () => {
    // +1 equivalent per N: NO3- uptake releases OH- (US EPA 1993; Metcalf & Eddy)
    const r = simulate(
      bareTank({
        water: { startNitrate: 2, khDkh: 4 },
        filter: NO_NITRIFIERS,
        plants: [plantGroupFromForm("floating", { startMassG: 10, maxMassG: 100 })],
        run: { lengthDays: 2 },
      }),
    );
    const k = lastIndex(r);
    const taken = 2 - r.series.no3[k];
    expect(taken).toBeGreaterThan(0.5);
    expect(rel((r.series.kh[k] - 4) / taken, 0.2)).toBeLessThan(0.01);
  });

  it("denitrification adds 0.200 dKH per mg N/L, and so does the ammonium its carbon source releases", () => {
    // +1 equivalent per NO3-N reduced (US EPA 1993: 3.57 mg CaCO3 per mg N); the organic matter
    // burnt as its electron donor turns into ammonium, +1 each (docs/sources.md §12)
    const run = (enabled: boolean) =>
      simulate(
        bareTank({
          water: { startNitrate: 10, khDkh: 4 },
          fish: { feedGPerDay: 2, fractionEaten: 0.5 },
          filter: NO_NITRIFIERS,
          lowOxygen: { enabled, zoneSize: "fromCapacity", denitrificationCapacityMgNPerDay: 200 },
          run: { lengthDays: 5 },
        }),
      );
    const on = run(true);
    const off = run(false);
    const k = lastIndex(on);
    const denitrified = off.series.no3[k] - on.series.no3[k];
    const extraTan = on.series.tan[k] - off.series.tan[k];
    expect(denitrified).toBeGreaterThan(1);
    // the carbon comes out of the detritus, which turns into ammonium sooner
    expect(extraTan).toBeGreaterThan(0);
    expect(on.budget.stockEnd.detritus.total).toBeLessThan(off.budget.stockEnd.detritus.total);
    expect(rel((on.series.kh[k] - off.series.kh[k]) / (denitrified + extraTan), 0.2)).toBeLessThan(0.01);
    expect(rel(on.budget.outputs.denitrificationN2, denitrified * 100)).toBeLessThan(0.01);
  });

  it("denitrification burns 2.86 mg COD per mg N, i.e. 0.189 mg of organic N at the Redfield ratio", () => {
    // Metcalf & Eddy: 2.86 g COD per g NO3-N; Redfield et al. 1963: 15.14 g O2 per g organic N
    expect(rel(LOW_OXYGEN.codPerNitrateN.value, 2.86)).toBeLessThan(0.002);
    expect(rel(OXYGEN.perOrganicNMineralised.value, (106 * 31.998) / (16 * 14.007))).toBeLessThan(0.001);
    expect(rel(deriveConstants(bareTank()).denitOrgPerN, 2.86 / 15.14)).toBeLessThan(0.002);
  });

  it("anammox barely moves KH: +0.06 equivalents per NH4-N", () => {
    // Strous et al. 1998: NH4+ + 1.32 NO2- → 1.02 N2 + 0.26 NO3-: −1 + 1.32 − 0.26 = +0.06
    const r = simulate(
      bareTank({
        water: { startTan: 2, startNitrite: 3, khDkh: 6 },
        filter: NO_NITRIFIERS,
        lowOxygen: {
          enabled: true,
          zoneSize: "fromCapacity",
          denitrificationCapacityMgNPerDay: 0,
          anammoxEnabled: true,
          anammoxCapacityMgNPerDay: 200,
        },
        run: { lengthDays: 3 },
      }),
    );
    const k = lastIndex(r);
    const usedNh4 = 2 - r.series.tan[k];
    expect(usedNh4).toBeGreaterThan(0.3);
    expect(rel((r.series.kh[k] - 6) / usedNh4, 0.06 * 0.2)).toBeLessThan(0.05);
  });

  it("a fed tank loses half the KH the old one-sided count took", () => {
    // US EPA 1993 / Metcalf & Eddy: excretion +1 and nitrification −2 leave −1 equivalent per N
    // nitrified from food, i.e. about 0.2 dKH per mg N/L, not 0.4.
    const r = simulate(
      bareTank({ water: { khDkh: 8 }, fish: { feedGPerDay: 1, fractionEaten: 1 }, run: { lengthDays: 30 } }),
    );
    const k = lastIndex(r);
    const nitrified = r.series.no3[k];
    const drop = 8 - r.series.kh[k];
    expect(nitrified).toBeGreaterThan(5);
    expect(drop / nitrified).toBeGreaterThan(0.17);
    expect(drop / nitrified).toBeLessThan(0.23);
  });
});
