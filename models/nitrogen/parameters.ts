/**
 * Every default number the engine uses, each with its source. This is the one place to look
 * up where a value comes from; the scenario schema, the presets and the processes read here.
 *
 * Source words follow docs/sources.md:
 * - a named publication (e.g. "Metcalf & Eddy Table 8-14") when the value is published there;
 * - "computed" when worked from a stated formula;
 * - "from memory" when recalled but not checked against the publication;
 * - "common practice, no source" for a hobby rule of thumb;
 * - "model choice, no source" for a knob of this model that has no measured counterpart
 *   (for example how fast detritus drifts into the filter). These are the first to calibrate.
 */

/** A number with its unit and where it comes from. */
export interface Sourced {
  readonly value: number;
  readonly unit: string;
  readonly source: string;
}

const p = (value: number, unit: string, source: string): Sourced => ({ value, unit, source });

// ---------------------------------------------------------------------------------------------
// Nitrifying bacteria
// ---------------------------------------------------------------------------------------------

/** Ammonia oxidisers (AOB): Monod growth on TAN at 20 °C. */
export const AOB = {
  muMax: p(0.9, "1/day at 20 °C", "Metcalf & Eddy Table 8-14"),
  halfSaturation: p(0.5, "mg N/L", "Metcalf & Eddy Table 8-14"),
  yield: p(0.15, "g VSS per g N oxidised", "Metcalf & Eddy Table 8-14"),
  decay: p(0.17, "1/day at 20 °C", "Metcalf & Eddy Table 8-14"),
  thetaGrowth: p(1.072, "per °C", "Metcalf & Eddy Table 8-14"),
  thetaDecay: p(1.029, "per °C", "Metcalf & Eddy Table 8-14"),
} as const;

/** Nitrite oxidisers (NOB): Monod growth on nitrite at 20 °C. */
export const NOB = {
  muMax: p(1.0, "1/day at 20 °C", "Metcalf & Eddy Table 8-14 (from memory)"),
  halfSaturation: p(0.25, "mg N/L", "Metcalf & Eddy Table 8-14 (from memory; middle of 0.2–0.3)"),
  yield: p(0.05, "g VSS per g N oxidised", "Metcalf & Eddy Table 8-14 (from memory)"),
  decay: p(0.17, "1/day at 20 °C", "model choice, no source (taken equal to the AOB value)"),
  thetaGrowth: p(1.06, "per °C", "Metcalf & Eddy Table 8-14 (from memory)"),
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
} as const;

// ---------------------------------------------------------------------------------------------
// Scenario defaults: what a keeper gets before changing anything (a 100 L planted community tank)
// ---------------------------------------------------------------------------------------------

/** 5 and 20 mg/L as NO3⁻ expressed as N (× 0.22590, computed). */
const NO3_AS_N = 0.2259;

export const SCENARIO_DEFAULTS = {
  water: {
    volumeL: p(100, "L", "common practice, no source"),
    temperatureC: p(25, "°C", "common practice, no source"),
    pH: p(7.2, "pH", "common practice, no source"),
    khDkh: p(4, "dKH", "common practice, no source"),
    startTan: p(0, "mg N/L", "common practice, no source"),
    startNitrite: p(0, "mg N/L", "common practice, no source"),
    startNitrate: p(10 * NO3_AS_N, "mg N/L", "common practice, no source (10 mg/L as NO3)"),
  },
  fish: {
    feedGPerDay: p(0.4, "g/day", "common practice, no source (a modestly stocked 100 L tank)"),
    proteinFraction: p(0.45, "fraction", "common practice, no source (flake food label)"),
    feedsPerDay: p(2, "count", "common practice, no source"),
    fractionEaten: p(0.9, "fraction", "common practice, no source"),
  },
  filter: {
    /** About 0.5 m² of colonised media at the Zhu & Chen rate of 0.59 g TAN/m²/day at 1 mg/L. */
    capacityMgTanPerDay: p(300, "mg TAN-N/day", "Zhu & Chen (1999), 0.5 m² of media"),
    cleaningIntervalDays: p(30, "days", "common practice, no source"),
    organicsRemovedFraction: p(0.5, "fraction", "common practice, no source"),
  },
  maintenance: {
    waterChangeIntervalDays: p(7, "days", "common practice, no source"),
    waterChangeFraction: p(0.25, "fraction", "common practice, no source"),
    gravelCleaningFraction: p(0.2, "fraction", "common practice, no source"),
    dripLPerDay: p(0, "L/day", "common practice, no source"),
  },
  tapWater: {
    nitrate: p(5 * NO3_AS_N, "mg N/L", "common practice, no source (5 mg/L as NO3)"),
    tan: p(0, "mg N/L", "common practice, no source"),
    khDkh: p(5, "dKH", "common practice, no source"),
    roShare: p(0, "fraction", "common practice, no source"),
  },
  lowOxygen: {
    denitrificationCapacityMgNPerDay: p(
      20,
      "mg N/day",
      "model choice, no source (no published rate for porous media; docs/sources.md §8)",
    ),
    anammoxCapacityMgNPerDay: p(5, "mg NH4-N/day", "model choice, no source"),
  },
  run: {
    lengthDays: p(180, "days", "common practice, no source"),
    outputIntervalDays: p(1, "days", "common practice, no source"),
  },
  fishlessCycling: {
    /** 2 mg/L of "ammonia" on a kit reading as NH4⁺ is about 1.5 mg N/L. */
    doseMgNPerL: p(1.5, "mg N/L per dose", "common practice, no source"),
    doseIntervalDays: p(1, "days", "common practice, no source"),
    stopAfterDays: p(42, "days", "common practice, no source"),
  },
  targets: {
    nitrateLow: p(5 * NO3_AS_N, "mg N/L", "common practice, no source (5 mg/L as NO3, docs/sources.md §9)"),
    nitrateHigh: p(20 * NO3_AS_N, "mg N/L", "common practice, no source (20 mg/L as NO3, docs/sources.md §9)"),
  },
  cycling: {
    /** TAN and nitrite-N both below this count as "processed". */
    clearThreshold: p(0.1, "mg N/L", "common practice, no source"),
    /** TAN or nitrite-N at or above this means the tank went through a cycle. */
    cycleSeenThreshold: p(0.5, "mg N/L", "common practice, no source"),
  },
} as const;

/**
 * Every sourced parameter, flattened to "group.name" → Sourced, for documentation and the
 * parameters table the web app may show.
 */
export function listParameters(): { key: string; value: number; unit: string; source: string }[] {
  const out: { key: string; value: number; unit: string; source: string }[] = [];
  const walk = (prefix: string, node: unknown): void => {
    if (node && typeof node === "object" && "value" in node && "source" in node) {
      const s = node as Sourced;
      out.push({ key: prefix, value: s.value, unit: s.unit, source: s.source });
      return;
    }
    if (node && typeof node === "object") {
      for (const [k, v] of Object.entries(node)) {
        if (k === "label") continue;
        walk(prefix ? `${prefix}.${k}` : k, v);
      }
    }
  };
  walk("", { AOB, NOB, BACTERIA, ORGANICS, PLANT_UPTAKE, GROWTH_FORM_DEFAULTS, LOW_OXYGEN, SCENARIO_DEFAULTS });
  return out;
}
