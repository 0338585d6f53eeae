/**
 * Biology of the tank with sources: nitrifying bacteria, feed and organic matter, plants and
 * low-oxygen zones (docs/sources.md §4–§8).
 */
import { p } from "./sourced";
import type { Sourced } from "./sourced";

// ---------------------------------------------------------------------------------------------
// Nitrifying bacteria
// ---------------------------------------------------------------------------------------------

/**
 * Ammonia oxidisers (AOB): Monod growth on TAN at 20 °C. Growth follows the cardinal
 * temperature model (parameters/environment.ts), which near 20–25 °C rises about as fast as
 * Metcalf & Eddy's θ = 1.072 per °C but has an optimum; decay keeps its θ.
 */
export const AOB = {
  muMax: p(0.9, "1/day at 20 °C", "Metcalf & Eddy Table 8-14"),
  halfSaturation: p(0.5, "mg N/L", "Metcalf & Eddy Table 8-14"),
  yield: p(0.15, "g VSS per g N oxidised", "Metcalf & Eddy Table 8-14"),
  decay: p(0.17, "1/day at 20 °C", "Metcalf & Eddy Table 8-14"),
  thetaDecay: p(1.029, "per °C", "Metcalf & Eddy Table 8-14"),
} as const;

/** Nitrite oxidisers (NOB): Monod growth on nitrite at 20 °C. */
export const NOB = {
  muMax: p(1.0, "1/day at 20 °C", "Metcalf & Eddy Table 8-14 (from memory)"),
  halfSaturation: p(0.25, "mg N/L", "Metcalf & Eddy Table 8-14 (from memory; middle of 0.2–0.3)"),
  yield: p(0.05, "g VSS per g N oxidised", "Metcalf & Eddy Table 8-14 (from memory)"),
  decay: p(0.17, "1/day at 20 °C", "model choice, no source (taken equal to the AOB value)"),
  thetaDecay: p(1.029, "per °C", "Metcalf & Eddy Table 8-14"),
} as const;

export const BACTERIA = {
  /** N in bacterial dry organic mass, from the textbook formula C5H7NO2: 14.007 / 113.12. */
  nitrogenPerVss: p(0.1238, "g N per g VSS", "computed from C5H7NO2 (formula from memory)"),
  /**
   * Temperature at which the user's filter capacity is stated. Aquaria run near 25 °C.
   */
  capacityReferenceTemperature: p(25, "°C", "common practice, no source"),
  /** TAN concentration at which the user's filter capacity is stated (as Zhu & Chen 1999 report rates). */
  capacityReferenceTan: p(1.0, "mg N/L", "Zhu & Chen (1999)"),
  /** Nitrite-oxidiser capacity relative to the ammonia-oxidiser capacity of the same media. */
  nobCapacityRatio: p(1.0, "mg NO2-N per mg TAN", "model choice, no source"),
  /**
   * Share of the full biomass present in a brand-new filter (traces from tap water, air, plants).
   * Tuned so a fishless cycle at 25 °C takes about three to five weeks.
   */
  seedFraction: p(
    1e-5,
    "fraction of full biomass",
    "model choice, no source (tuned to a 3–5 week cycle, common practice, no source)",
  ),
  /** Floor for "established" bacteria when the tank has no load at the start. */
  establishedFloorFraction: p(1e-3, "fraction of full biomass", "model choice, no source"),
  /**
   * Resident population below which bacteria no longer decay: what a brand-new filter starts
   * with (the seed). Biofilm on every surface keeps at least this much, so a load after months
   * of plants taking all the ammonia meets bacteria that can grow back.
   */
  residentFloorFraction: p(1e-5, "fraction of full biomass", "model choice, no source (equal to the seed)"),
  /** Share of nitrifiers that live in the filter media (the rest on gravel, glass, plants). */
  shareInFilter: p(0.85, "fraction", "common practice, no source"),
  /** Share of filter nitrifiers killed by rinsing media in chlorinated tap water. */
  killedByTapWaterRinse: p(0.6, "fraction", "common practice, no source"),
  /** Share of filter nitrifiers lost by rinsing media in old tank water. */
  lostByTankWaterRinse: p(0.1, "fraction", "common practice, no source"),
  /** Half-saturation (dKH) of a steep switch that stops nitrification as the carbonate buffer runs out. */
  khHalfSaturation: p(0.5, "dKH", "model choice, no source"),
} as const;

// ---------------------------------------------------------------------------------------------
// Fish, feed and organic matter
// ---------------------------------------------------------------------------------------------

export const ORGANICS = {
  /** First-order release of a meal's nitrogen from the fish (most within a day). */
  gutRelease: p(4, "1/day", "from memory"),
  /** Detritus in the tank carried into the filter by the flow. */
  trapRate: p(0.2, "1/day", "model choice, no source"),
  /** Mineralisation (ammonification) of detritus to TAN at 20 °C, tank and filter alike. */
  mineralisation: p(0.05, "1/day at 20 °C", "from memory"),
  mineralisationTheta: p(1.07, "per °C", "from memory"),
} as const;

// ---------------------------------------------------------------------------------------------
// Plants
// ---------------------------------------------------------------------------------------------

export const PLANT_UPTAKE = {
  /** Michaelis–Menten half-saturation for ammonium uptake (plausible range 0.07–0.7). */
  ammoniumHalfSaturation: p(0.1, "mg N/L", "from memory"),
  /** Michaelis–Menten half-saturation for nitrate uptake. */
  nitrateHalfSaturation: p(0.3, "mg N/L", "from memory"),
  /** Ammonium level at which nitrate uptake is halved (ammonium preference). */
  nitrateInhibitionByAmmonium: p(0.5, "mg N/L", "model choice, no source"),
} as const;

/** The plant growth forms the form offers. */
export const GROWTH_FORMS = ["stem", "floating", "rosette", "moss", "custom"] as const;
export type GrowthForm = (typeof GROWTH_FORMS)[number];

/** Typical values per growth form, offered by the form when a keeper picks a form. */
export interface GrowthFormDefaults {
  readonly label: string;
  readonly growthRatePerDay: Sourced;
  readonly nitrogenContent: Sourced;
  readonly startMassG: Sourced;
  readonly maxMassG: Sourced;
}

export const GROWTH_FORM_DEFAULTS: Readonly<Record<GrowthForm, GrowthFormDefaults>> = {
  stem: {
    label: "Stem plants",
    growthRatePerDay: p(0.05, "1/day", "common practice, no source (doubling in about two weeks)"),
    nitrogenContent: p(0.03, "g N per g dry mass", "Duarte 1992 (from memory; 2–4 %)"),
    startMassG: p(20, "g dry", "common practice, no source"),
    maxMassG: p(60, "g dry", "common practice, no source"),
  },
  floating: {
    label: "Floating plants",
    growthRatePerDay: p(0.2, "1/day", "Ziegler et al. 2015 (0.153–0.519 /d; low end for aquarium light)"),
    nitrogenContent: p(0.04, "g N per g dry mass", "Duarte 1992 (from memory; 2–4 %)"),
    startMassG: p(2, "g dry", "common practice, no source"),
    maxMassG: p(10, "g dry", "common practice, no source"),
  },
  rosette: {
    label: "Rosette plants",
    growthRatePerDay: p(0.02, "1/day", "common practice, no source"),
    nitrogenContent: p(0.025, "g N per g dry mass", "Duarte 1992 (from memory; 2–4 %)"),
    startMassG: p(15, "g dry", "common practice, no source"),
    maxMassG: p(40, "g dry", "common practice, no source"),
  },
  moss: {
    label: "Mosses",
    growthRatePerDay: p(0.01, "1/day", "common practice, no source"),
    nitrogenContent: p(0.02, "g N per g dry mass", "Duarte 1992 (from memory; 2–4 %)"),
    startMassG: p(5, "g dry", "common practice, no source"),
    maxMassG: p(20, "g dry", "common practice, no source"),
  },
  custom: {
    label: "Other plants",
    growthRatePerDay: p(0.03, "1/day", "common practice, no source"),
    nitrogenContent: p(0.03, "g N per g dry mass", "Duarte 1992 (from memory; 2–4 %)"),
    startMassG: p(10, "g dry", "common practice, no source"),
    maxMassG: p(30, "g dry", "common practice, no source"),
  },
};

// ---------------------------------------------------------------------------------------------
// Low-oxygen zones
// ---------------------------------------------------------------------------------------------

export const LOW_OXYGEN = {
  denitrificationNitrateHalfSaturation: p(0.5, "mg N/L", "from memory"),
  anammoxAmmoniumHalfSaturation: p(0.07, "mg N/L", "from memory"),
  anammoxNitriteHalfSaturation: p(0.05, "mg N/L", "from memory"),
  /**
   * Organic carbon burnt per mg of nitrate-N reduced to N2, as chemical oxygen demand:
   * 5 electrons per N against 4 per O2, 5/4 × 32/14.007 = 2.857 (computed; Metcalf & Eddy
   * give 2.86 g COD per g NO3-N without cell growth).
   */
  codPerNitrateN: p(2.857, "mg O2-equivalent per mg NO3-N", "computed (Metcalf & Eddy: 2.86)"),
  /**
   * Half-saturation of denitrification in the organic matter of the tank (tank and filter
   * detritus per litre of water, as organic N).
   */
  organicHalfSaturation: p(1, "mg organic N/L", "model choice, no source"),
  /**
   * Share of the water's oxygen that reaches the inside of a low-oxygen zone: the zone is
   * low in oxygen because diffusion cannot keep up, not because the water is.
   */
  oxygenReachingZone: p(0.02, "fraction", "model choice, no source"),
  /** Oxygen (inside the zone) that halves denitrification: ASM1's K_OH. */
  denitrificationOxygenInhibition: p(0.2, "mg O2/L", "Henze et al. ASM1 (from memory)"),
  /** Oxygen (inside the zone) that halves anammox: inhibited above about 0.5 % of air saturation. */
  anammoxOxygenInhibition: p(0.02, "mg O2/L", "Strous et al. 1997 (from memory)"),
} as const;
