import { describe, expect, it } from "vitest";
import {
  ALK_MG_CACO3_PER_MG_N_DENITRIFIED,
  ALK_MG_CACO3_PER_MG_N_NITRIFIED,
  ANAMMOX,
  EATEN_N_SPLIT,
  N_FRACTION,
  ammoniumPKa,
  freeAmmoniaFraction,
  tanFromFeed,
} from "../../models/index";
import { DKH_PER_MG_N_DENITRIFIED, DKH_PER_MG_N_NITRIFIED, phFromKh } from "../../models/nitrogen/chemistry";

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe("free ammonia fraction", () => {
  // [°C, pH, % NH3 of TAN]
  const computedInReferences: [number, number, number][] = [
    [20, 7.0, 0.3942], // Emerson et al. 1975 (computed, docs/sources.md §1)
    [20, 8.0, 3.807], // Emerson et al. 1975 (computed, docs/sources.md §1)
    [20, 9.0, 28.36], // Emerson et al. 1975 (computed, docs/sources.md §1)
    [25, 7.0, 0.5639], // Emerson et al. 1975 (computed, docs/sources.md §1)
    [25, 8.0, 5.366], // Emerson et al. 1975 (computed, docs/sources.md §1)
    [10, 8.0, 1.822], // Emerson et al. 1975 (computed, docs/sources.md §1)
    [30, 7.5, 2.476], // Emerson et al. 1975 (computed, docs/sources.md §1)
  ];
  // Our own worked values from the Emerson et al. 1975 formula (T = t + 273.15), by hand in Python.
  const ourWorkedValues: [number, number, number][] = [
    [0, 7.0, 0.082271], // Emerson et al. 1975 formula, our own worked example
    [5, 8.5, 3.78866], // Emerson et al. 1975 formula, our own worked example
    [15, 7.5, 0.855332], // Emerson et al. 1975 formula, our own worked example
    [22, 6.5, 0.14452], // Emerson et al. 1975 formula, our own worked example
    [28, 8.0, 6.53836], // Emerson et al. 1975 formula, our own worked example
    [35, 7.0, 1.11149], // Emerson et al. 1975 formula, our own worked example
    [40, 9.5, 83.116], // Emerson et al. 1975 formula, our own worked example
  ];

  it.each([...computedInReferences, ...ourWorkedValues])("%s °C, pH %s → %s %% within 1 %%", (t, ph, pct) => {
    expect(rel(100 * freeAmmoniaFraction(t, ph), pct)).toBeLessThan(0.01);
  });

  it("covers at least 12 points", () => {
    expect(computedInReferences.length + ourWorkedValues.length).toBeGreaterThanOrEqual(12);
  });

  it.each([
    [24, 8.0, 0.0502], // UF/IFAS EDIS FA16 "Ammonia in Aquatic Systems" (from Emerson's data), confirmed
    [20, 7.0, 0.0039], // UF/IFAS EDIS FA16 "Ammonia in Aquatic Systems" (from Emerson's data), confirmed
    [30, 7.0, 0.008], // UF/IFAS EDIS FA16 "Ammonia in Aquatic Systems" (from Emerson's data), confirmed
  ])("EDIS table: %s °C pH %s → fraction %s within 3 %%", (t, ph, frac) => {
    expect(rel(freeAmmoniaFraction(t, ph), frac)).toBeLessThan(0.03);
  });

  it.each([
    [20, 7.0, 0.4], // Trussell (1972) J. Fish. Res. Board Can. 29: 1505–1507, confirmed
    [20, 7.5, 1.24], // Trussell (1972), confirmed
    [20, 8.0, 3.83], // Trussell (1972), confirmed
    [20, 8.5, 11.18], // Trussell (1972), confirmed
    [15, 8.0, 2.65], // Trussell (1972), confirmed
  ])("Trussell table: %s °C pH %s → %s %% within 3 %%", (t, ph, pct) => {
    expect(rel(100 * freeAmmoniaFraction(t, ph), pct)).toBeLessThan(0.03);
  });

  it("uses 2729.92, not the misprinted 2727.92", () => {
    // Emerson et al. 1975: pKa = 0.09018 + 2729.92 / T
    expect(ammoniumPKa(25)).toBeCloseTo(0.09018 + 2729.92 / 298.15, 12);
  });

  it("rises with pH and with temperature", () => {
    // common practice, no source (teachers' demonstration)
    expect(freeAmmoniaFraction(25, 8)).toBeGreaterThan(freeAmmoniaFraction(25, 7));
    expect(freeAmmoniaFraction(30, 7.5)).toBeGreaterThan(freeAmmoniaFraction(20, 7.5));
  });
});

describe("stoichiometry constants", () => {
  it("nitrification uses 7.14 mg CaCO3 per mg N, i.e. 0.400 dKH per mg N/L", () => {
    // US EPA (1993) Manual: Nitrogen Control; Metcalf & Eddy
    // 100.086 / 14.007 = 7.145; the published figure is rounded to 7.14
    expect(rel(ALK_MG_CACO3_PER_MG_N_NITRIFIED, 7.14)).toBeLessThan(0.001);
    expect(DKH_PER_MG_N_NITRIFIED).toBeCloseTo(0.4, 3);
  });

  it("denitrification returns 3.57 mg CaCO3 per mg N", () => {
    // US EPA (1993) Manual: Nitrogen Control; Metcalf & Eddy
    expect(rel(ALK_MG_CACO3_PER_MG_N_DENITRIFIED, 3.57)).toBeLessThan(0.001);
    expect(DKH_PER_MG_N_DENITRIFIED).toBeCloseTo(0.2, 3);
  });

  it("anammox: NH4+ + 1.32 NO2- → 1.02 N2 + 0.26 NO3-", () => {
    // Strous et al. 1998
    expect(ANAMMOX.nitritePerAmmonium).toBe(1.32);
    expect(ANAMMOX.n2NPerAmmonium).toBeCloseTo(2.04, 12);
    expect(ANAMMOX.nitratePerAmmonium).toBe(0.26);
    // the leftover (biomass term and rounding) is small and books the rest of the N
    expect(ANAMMOX.biomassNPerAmmonium).toBeCloseTo(0.02, 12);
    expect(1 + 1.32 - (ANAMMOX.n2NPerAmmonium + ANAMMOX.nitratePerAmmonium + ANAMMOX.biomassNPerAmmonium)).toBeCloseTo(
      0,
      12,
    );
  });

  it("N mass fractions match the atomic-weight factors", () => {
    // computed from atomic weights N 14.007, O 15.999, H 1.008 (docs/sources.md §0)
    expect(N_FRACTION.NO3).toBeCloseTo(0.2259, 4);
    expect(N_FRACTION.NO2).toBeCloseTo(0.30447, 4);
    expect(N_FRACTION.NH4).toBeCloseTo(0.77648, 4);
    expect(N_FRACTION.NH3).toBeCloseTo(0.82244, 4);
  });
});

describe("feed to ammonia", () => {
  it("1 kg/day of 35 % protein feed gives 32.2 g TAN/day", () => {
    // Timmons & Ebeling worked example. The engine multiplies the four shares exactly
    // (0.09216), which the book rounds to 0.092: allow that 0.2 %.
    expect(rel(tanFromFeed(1000, 0.35), 32.2)).toBeLessThan(0.002);
  });

  it("the factor is 0.092 = 0.16 × 0.80 × 0.80 × 0.90 and every mg of eaten N is placed", () => {
    // Timmons & Ebeling
    expect(EATEN_N_SPLIT.tan * 0.16).toBeCloseTo(0.16 * 0.8 * 0.8 * 0.9, 12);
    expect(rel(EATEN_N_SPLIT.tan * 0.16, 0.092)).toBeLessThan(0.002);
    const sum = EATEN_N_SPLIT.tan + EATEN_N_SPLIT.urea + EATEN_N_SPLIT.faeces + EATEN_N_SPLIT.fishGrowth;
    expect(sum).toBeCloseTo(1, 12);
  });
});

describe("pH following KH", () => {
  it("drops by log10 of the KH ratio at constant CO2", () => {
    // carbonate relation pH = pKa1 + log10(HCO3/CO2), our own worked example
    expect(phFromKh(7.2, 4, 0.4)).toBeCloseTo(6.2, 10);
    expect(phFromKh(7.2, 4, 4)).toBe(7.2);
    expect(phFromKh(7.2, 4, 0)).toBe(4); // clamped
  });
});
