/**
 * The tank's state vector. Units:
 *   TAN, NO2, NO3       dissolved, mg N/L (TAN = NH3-N + NH4-N; the NH3 share is algebraic)
 *   orgW, orgF          organic N (uneaten food, faeces, dead cells) in the tank and in the filter, mg N
 *   aob, nob            ammonia- and nitrite-oxidiser biomass, mg N (biomass N = VSS × 0.1238)
 *   kh                  carbonate hardness, dKH
 *   gut                 nitrogen of eaten food not yet released by the fish, mg N
 *   o2                  dissolved oxygen, mg O2/L
 *   n2Denit, n2Anammox  cumulative N2-N lost to the air, mg N (budget states)
 *   dripOut             cumulative N carried out by a continuous drip, mg N (budget state)
 *   plant[i]            dry mass of plant group i, g (N = mass × content × 1000 mg)
 */
export const IX = {
  tan: 0,
  no2: 1,
  no3: 2,
  orgW: 3,
  orgF: 4,
  aob: 5,
  nob: 6,
  kh: 7,
  gut: 8,
  o2: 9,
  n2Denit: 10,
  n2Anammox: 11,
  dripOut: 12,
} as const;

/** Index of the first plant group's dry mass. */
export const PLANT0 = 13;

export const STATE_NAMES = [
  "TAN (mg N/L)",
  "nitrite-N (mg N/L)",
  "nitrate-N (mg N/L)",
  "detritus in tank (mg N)",
  "detritus in filter (mg N)",
  "ammonia oxidisers (mg N)",
  "nitrite oxidisers (mg N)",
  "KH (dKH)",
  "food in fish (mg N)",
  "dissolved oxygen (mg/L)",
  "N2 from denitrification (mg N)",
  "N2 from anammox (mg N)",
  "N out by drip (mg N)",
] as const;
