/**
 * Oxygen, inhibition, temperature and low-oxygen media, each with its source
 * (docs/sources.md §11–§16).
 */
import { p } from "./sourced";

/** Dissolved oxygen: saturation, exchange with the air, and who uses or makes it. */
export const OXYGEN = {
  /**
   * Oxygen used by ammonia oxidisers (NH4⁺ → NO2⁻) and nitrite oxidisers (NO2⁻ → NO3⁻).
   * 3.43 + 1.14 = 4.57 g O2 per g N.
   */
  perAmmoniumOxidised: p(3.43, "mg O2 per mg N", "US EPA (1993) Nitrogen Control; Metcalf & Eddy"),
  perNitriteOxidised: p(1.14, "mg O2 per mg N", "US EPA (1993) Nitrogen Control; Metcalf & Eddy"),
  /** Half-saturation of ammonia oxidisers in oxygen. */
  aobHalfSaturation: p(0.5, "mg O2/L", "Metcalf & Eddy Table 8-14"),
  /** Half-saturation of nitrite oxidisers in oxygen. */
  nobHalfSaturation: p(0.9, "mg O2/L", "Metcalf & Eddy Table 8-14 (from memory)"),
  /** Oxygen fish use per gram of food eaten (respiration of the feed they burn). */
  fishPerFeed: p(250, "mg O2 per g feed eaten", "Timmons & Ebeling (2010) (from memory: 0.25 kg per kg)"),
  /** Oxygen at which fish respiration is halved (fish cannot breathe what is not there). */
  fishHalfSaturation: p(1, "mg O2/L", "model choice, no source"),
  /**
   * Oxygen used when organic matter is mineralised, per mg of its nitrogen: Redfield
   * C:N 106:16, one O2 per C, 106 × 32 / (16 × 14.007) = 15.14.
   */
  perOrganicNMineralised: p(15.14, "mg O2 per mg N", "Redfield, Ketchum & Richards 1963 (computed)"),
  /** Oxygen at which bacterial use of oxygen for decay is halved (ASM1's K_OH). */
  heterotrophHalfSaturation: p(0.2, "mg O2/L", "Henze et al. ASM1 (from memory)"),
  /**
   * Oxygen plants release per gram of dry mass grown (CH2O-like tissue, photosynthetic
   * quotient 1: 32 / 30 g O2 per g).
   */
  plantsPerDryMass: p(1067, "mg O2 per g dry mass", "computed (photosynthetic quotient 1, from memory)"),
  /** Oxygen set free when plants reduce nitrate they take up (2 O2 per N, 64 / 14.007). */
  plantsPerNitrateN: p(4.57, "mg O2 per mg N", "computed"),
  /**
   * Surface exchange coefficient K_L·a (per day) of a 40 cm deep tank for each kind of surface
   * movement. Lake surfaces without wind exchange about 1 m/day (K_L); a rippled or bubbled
   * surface many times that.
   */
  exchangeStill: p(1.5, "1/day", "model choice, no source (from memory: K_L ≈ 0.6 m/day over 0.4 m)"),
  exchangeGentle: p(4, "1/day", "model choice, no source"),
  exchangeRippling: p(10, "1/day", "model choice, no source"),
  exchangeStrong: p(30, "1/day", "model choice, no source (an air stone or spray bar)"),
  /** Share of the oxygen deficit one pass through the filter and its return makes up. */
  filterPassEfficiency: p(0.02, "fraction per tank volume pumped", "model choice, no source"),
  /** Oxygen below which the results show a caution (1-day minimum, warm-water fish). */
  cautionMgPerL: p(3, "mg O2/L", "US EPA (1986) oxygen criteria (from memory)"),
} as const;

/**
 * Inhibition of nitrifiers by free ammonia (FA) and free nitrous acid (FNA), as a factor
 * K/(K + X). Anthonisen et al. (1976): FA inhibits nitrite oxidisers from 0.1–1.0 mg NH3/L and
 * ammonia oxidisers from 10–150 mg NH3/L; FNA inhibits both from 0.22–2.8 mg HNO2/L. The
 * constants are the geometric middles of those ranges, converted to mg N/L.
 */
export const INHIBITION = {
  freeAmmoniaOnNob: p(0.26, "mg NH3-N/L", "Anthonisen et al. 1976 (0.1–1.0 mg NH3/L; geometric middle × 0.822)"),
  freeAmmoniaOnAob: p(32, "mg NH3-N/L", "Anthonisen et al. 1976 (10–150 mg NH3/L; geometric middle × 0.822)"),
  freeNitrousAcid: p(0.23, "mg HNO2-N/L", "Anthonisen et al. 1976 (0.22–2.8 mg HNO2/L; geometric middle × 0.298)"),
  /** Ka of nitrous acid, Ka = exp(−2300 / T(K)) (Anthonisen et al. 1976); this is the 2300. */
  nitrousAcidKaKelvin: p(2300, "K", "Anthonisen et al. 1976"),
} as const;

/**
 * Cardinal temperatures (minimum, optimum, maximum) of growth, for the cardinal temperature
 * model with inflection of Rosso et al. (1993). Nitrifiers: optimum about 35 °C for ammonia
 * oxidisers and 35–42 °C for nitrite oxidisers (US EPA 1993); growth stops above about 40–45 °C.
 */
export const CARDINAL_TEMPERATURES = {
  aobMin: p(0, "°C", "from memory (nitrification measured down to 2–5 °C)"),
  aobOpt: p(35, "°C", "US EPA (1993) Nitrogen Control"),
  aobMax: p(45, "°C", "from memory"),
  nobMin: p(0, "°C", "from memory"),
  nobOpt: p(35, "°C", "US EPA (1993) Nitrogen Control (35–42 °C; low end for Nitrospira)"),
  nobMax: p(42, "°C", "from memory (nitrite oxidisers drop out first above 35–40 °C)"),
  plantMin: p(5, "°C", "from memory"),
  plantOpt: p(28, "°C", "from memory"),
  plantMax: p(38, "°C", "from memory"),
  /** Temperature at which the plant growth rates a keeper enters hold. */
  plantReference: p(25, "°C", "model choice, no source"),
} as const;

/**
 * Denitrification capacity of low-oxygen zones described as keepers know them, as a low, a
 * typical and a high value (mg NO3-N per day with plenty of nitrate, carbon and no oxygen).
 * Porous rock: a hundredth to a tenth of a dedicated aquarium denitrification reactor, which
 * reaches 18–36 mg N per litre per day (Grommen et al. 2006). Sand beds: freshwater sediments
 * denitrify roughly 5–80 mg N per m² per day; a bed needs more than about 1 cm of depth
 * before its lower layer goes without oxygen, and the full rate from about 3 cm.
 */
export const LOW_OXYGEN_MEDIA = {
  rockLow: p(0.18, "mg N/day per L of rock", "model choice, no source (0.01 × 18, Grommen et al. 2006)"),
  rockTypical: p(0.7, "mg N/day per L of rock", "model choice, no source"),
  rockHigh: p(3.6, "mg N/day per L of rock", "model choice, no source (0.1 × 36, Grommen et al. 2006)"),
  sandLow: p(5, "mg N/day per m²", "from memory (freshwater sediments)"),
  sandTypical: p(20, "mg N/day per m²", "from memory (freshwater sediments)"),
  sandHigh: p(80, "mg N/day per m²", "from memory (freshwater sediments)"),
  sandOxicDepth: p(1, "cm", "from memory (oxygen reaches millimetres to a few cm into sediment)"),
  sandFullDepth: p(3, "cm", "model choice, no source"),
} as const;
