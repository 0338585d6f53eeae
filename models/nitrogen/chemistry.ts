/**
 * Chemistry of the tank: ammonia equilibrium, molar-mass factors, alkalinity and
 * reaction stoichiometry. Pure functions and constants, no imports, safe for the browser.
 *
 * Units: concentrations in mg N/L unless a name says otherwise; temperature in °C.
 */

/** Atomic weights used for every "as N" factor (g/mol). Values as listed in docs/sources.md §0. */
const ATOMIC_WEIGHT = { N: 14.007, O: 15.999, H: 1.008, C: 12.011, Ca: 40.078 } as const;

/** Molar masses (g/mol) of the ions and molecules a test kit may report. */
const MOLAR_MASS = {
  NO3: ATOMIC_WEIGHT.N + 3 * ATOMIC_WEIGHT.O,
  NO2: ATOMIC_WEIGHT.N + 2 * ATOMIC_WEIGHT.O,
  NH4: ATOMIC_WEIGHT.N + 4 * ATOMIC_WEIGHT.H,
  NH3: ATOMIC_WEIGHT.N + 3 * ATOMIC_WEIGHT.H,
  /** CaCO3: 100.086 g/mol (Ca 40.078 + C 12.011 + 3 O). */
  CaCO3: ATOMIC_WEIGHT.Ca + ATOMIC_WEIGHT.C + 3 * ATOMIC_WEIGHT.O,
  CaO: ATOMIC_WEIGHT.Ca + ATOMIC_WEIGHT.O,
} as const;

/**
 * Mass of nitrogen per mass of the named species (dimensionless), e.g. mg N per mg NO3⁻.
 * NO3⁻→N 0.22590, NO2⁻→N 0.30447, NH4⁺→N 0.77648, NH3→N 0.82244 (computed from atomic weights).
 */
export const N_FRACTION = {
  NO3: ATOMIC_WEIGHT.N / MOLAR_MASS.NO3,
  NO2: ATOMIC_WEIGHT.N / MOLAR_MASS.NO2,
  NH4: ATOMIC_WEIGHT.N / MOLAR_MASS.NH4,
  NH3: ATOMIC_WEIGHT.N / MOLAR_MASS.NH3,
} as const;

/**
 * One German degree of carbonate hardness (dKH) in mg/L as CaCO3. The definition is
 * 10 mg CaO per litre; expressed as CaCO3 that is 10 × 100.086 / 56.077 = 17.848 mg/L.
 */
export const MG_CACO3_PER_DKH = (10 * MOLAR_MASS.CaCO3) / MOLAR_MASS.CaO;

/**
 * Alkalinity consumed by nitrification: 7.14 mg CaCO3 per mg NH4-N oxidised
 * (US EPA 1993 Nitrogen Control Manual; Metcalf & Eddy). Two equivalents of alkalinity
 * (2 × 50.043 mg CaCO3) per mol N, i.e. 100.086 / 14.007.
 */
export const ALK_MG_CACO3_PER_MG_N_NITRIFIED = MOLAR_MASS.CaCO3 / ATOMIC_WEIGHT.N;

/** Alkalinity returned by denitrification: 3.57 mg CaCO3 per mg NO3-N reduced (half the above). */
export const ALK_MG_CACO3_PER_MG_N_DENITRIFIED = ALK_MG_CACO3_PER_MG_N_NITRIFIED / 2;

/** dKH lost per mg N/L nitrified (≈ 0.400). */
export const DKH_PER_MG_N_NITRIFIED = ALK_MG_CACO3_PER_MG_N_NITRIFIED / MG_CACO3_PER_DKH;

/** dKH regained per mg N/L denitrified (≈ 0.200). */
export const DKH_PER_MG_N_DENITRIFIED = ALK_MG_CACO3_PER_MG_N_DENITRIFIED / MG_CACO3_PER_DKH;

/**
 * dKH per mg N/L per equivalent of alkalinity per mole of N (≈ 0.200). Counting NH4⁺ as a
 * cation and NO2⁻, NO3⁻ as anions of strong acids (US EPA 1993; Metcalf & Eddy), each process
 * moves alkalinity by a whole number of equivalents per N:
 *   organic N → NH4⁺ (fish excretion, urea, mineralisation)  +1
 *   NH4⁺ → NO2⁻ (ammonia oxidisers)                           −2
 *   NO2⁻ → NO3⁻ (nitrite oxidisers)                            0
 *   NH4⁺ taken into plants or bacteria                        −1
 *   NO3⁻ or NO2⁻ taken into plants or bacteria                +1
 *   NO3⁻ → N2 (denitrification)                                +1
 *   NH4⁺ + 1.32 NO2⁻ → 1.02 N2 + 0.26 NO3⁻ (anammox)           +0.06 per NH4⁺
 */
export const DKH_PER_EQUIVALENT_N = DKH_PER_MG_N_DENITRIFIED;

/** Alkalinity equivalents per mol NH4⁺ used by anammox: −1 + 1.32 − 0.26 (Strous et al. 1998). */
export const ANAMMOX_ALKALINITY_EQ = -1 + 1.32 - 0.26;

/**
 * Anammox, Strous et al. 1998: NH4⁺ + 1.32 NO2⁻ → 1.02 N2 + 0.26 NO3⁻ (+ a small biomass term).
 * Per mg of NH4-N consumed: 1.32 mg NO2-N consumed, 2.04 mg N leaves as N2, 0.26 mg NO3-N made.
 * The published coefficients leave 0.02 mg N unaccounted (the biomass term plus rounding);
 * the engine books that share into the filter's organic pool so nitrogen is conserved exactly.
 */
export const ANAMMOX = {
  nitritePerAmmonium: 1.32,
  n2NPerAmmonium: 2 * 1.02,
  nitratePerAmmonium: 0.26,
  biomassNPerAmmonium: 1 + 1.32 - 2 * 1.02 - 0.26,
} as const;

/**
 * pKa of NH4⁺ ⇌ NH3 + H⁺ in fresh water, Emerson et al. 1975: pKa = 0.09018 + 2729.92 / T,
 * T in kelvin (= °C + 273.15). Valid 0–50 °C.
 */
export function ammoniumPKa(temperatureC: number): number {
  return 0.09018 + 2729.92 / (temperatureC + 273.15);
}

/**
 * Fraction (0–1) of total ammonia nitrogen present as free (un-ionised) NH3,
 * Emerson et al. 1975: 1 / (1 + 10^(pKa − pH)).
 */
export function freeAmmoniaFraction(temperatureC: number, pH: number): number {
  return 1 / (1 + Math.pow(10, ammoniumPKa(temperatureC) - pH));
}

/**
 * Fish feed to nitrogen, Timmons & Ebeling: TAN produced = feed × protein fraction × 0.092,
 * where 0.092 = 0.16 (N in protein) × 0.80 (assimilated) × 0.80 (excreted) × 0.90 (as TAN).
 * The shares below split every mg of eaten feed N; they sum to exactly 1.
 */
export const FEED_N = {
  /** g N per g protein (protein is 16 % N, factor 6.25). */
  nitrogenInProtein: 0.16,
  assimilated: 0.8,
  excretedOfAssimilated: 0.8,
  tanOfExcreted: 0.9,
} as const;

/** How eaten feed nitrogen divides (fractions of eaten N, sum 1). */
export const EATEN_N_SPLIT = (() => {
  const a = FEED_N.assimilated;
  const e = FEED_N.excretedOfAssimilated;
  const t = FEED_N.tanOfExcreted;
  return {
    /** excreted as TAN through gills and urine: 0.8 × 0.8 × 0.9 = 0.576 */
    tan: a * e * t,
    /** excreted as urea, hydrolysed to TAN in the tank: 0.8 × 0.8 × 0.1 = 0.064 */
    urea: a * e * (1 - t),
    /** not assimilated, leaves as faeces to the organic pool: 0.2 */
    faeces: 1 - a,
    /** assimilated and kept: fish growth, leaves the water budget: 0.8 × 0.2 = 0.16 */
    fishGrowth: a * (1 - e),
  } as const;
})();

/**
 * TAN excreted by fish (g N/day) for a feed rate (g/day) and protein fraction (0–1),
 * assuming all feed is eaten: feed × protein × 0.092 (Timmons & Ebeling).
 */
export function tanFromFeed(feedGPerDay: number, proteinFraction: number): number {
  return feedGPerDay * proteinFraction * FEED_N.nitrogenInProtein * EATEN_N_SPLIT.tan;
}

/**
 * Oxygen saturation of fresh water at 1 atm (mg/L), Benson & Krause (1984) as used by APHA
 * Standard Methods 4500-O and the USGS: ln C = −139.34411 + 1.575701e5/T − 6.642308e7/T² +
 * 1.243800e10/T³ − 8.621949e11/T⁴, T in kelvin. 0–40 °C.
 */
export function oxygenSaturation(temperatureC: number): number {
  const T = temperatureC + 273.15;
  return Math.exp(-139.34411 + 1.575701e5 / T - 6.642308e7 / T ** 2 + 1.2438e10 / T ** 3 - 8.621949e11 / T ** 4);
}

/**
 * Share of nitrite-N present as free nitrous acid, Anthonisen et al. (1976):
 * HNO2-N / NO2-N = 1 / (1 + Ka·10^pH) with Ka = exp(−2300 / T(K)).
 */
export function freeNitrousAcidFraction(temperatureC: number, pH: number): number {
  const ka = Math.exp(-2300 / (temperatureC + 273.15));
  return 1 / (1 + ka * Math.pow(10, pH));
}

/** pH bounds the engine will report; outside them the carbonate relation no longer describes a tank. */
const PH_FLOOR = 4;
const PH_CEILING = 10;

/**
 * pH when "pH follows KH": at constant dissolved CO2 the carbonate relation
 * pH = pKa1 + log10([HCO3⁻]/[CO2]) gives pH = pH0 + log10(KH / KH0). Assumes CO2 is held
 * steady (aeration or steady injection) and that KH is all bicarbonate. Clamped to 4–10.
 */
export function phFromKh(ph0: number, kh0Dkh: number, khDkh: number): number {
  const ph = phFromKhUnclamped(ph0, kh0Dkh, khDkh);
  return ph < PH_FLOOR ? PH_FLOOR : ph > PH_CEILING ? PH_CEILING : ph;
}

/** The same carbonate relation without the 4–10 clamp (for checks on what the model computed). */
export function phFromKhUnclamped(ph0: number, kh0Dkh: number, khDkh: number): number {
  return ph0 + Math.log10(Math.max(khDkh, 1e-3) / Math.max(kh0Dkh, 1e-3));
}
