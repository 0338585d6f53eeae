import { formatSignificant } from "~/utils/format";

/**
 * The units a person sees, derived from their account preferences. Isomorphic: labels only,
 * no conversion code (conversions run on the server, app/display-units.server.ts, so mathjs
 * stays out of the browser bundle).
 */

/** Account preferences as stored on the user row. */
export type UnitPreferences = {
  volumeUnit: "L" | "usgal" | "impgal";
  temperatureUnit: "C" | "F";
  nitrateUnit: "NO3" | "N";
  khUnit: "dKH" | "CaCO3";
};

/** Unit ids of the engine's conversion module (models/units.ts) for each quantity. */
export type DisplayUnits = {
  volume: "L" | "usgal" | "impgal";
  temperature: "C" | "F";
  nitrate: "asNO3" | "asN";
  nitrite: "asNO2" | "asN";
  ammonia: "asNH3" | "asN";
  kh: "dKH" | "mgCaCO3";
};

/** Metric, nitrate as NO3: what an anonymous viewer sees. */
export const DEFAULT_PREFERENCES: UnitPreferences = { volumeUnit: "L", temperatureUnit: "C", nitrateUnit: "NO3", khUnit: "dKH" };

/**
 * "As NO3" readers see each species as its own ion or molecule (NO3, NO2, NH3 — hobby kits
 * report total ammonia as NH3); "as N" readers see everything as nitrogen.
 */
export function displayUnitsFor(p: UnitPreferences): DisplayUnits {
  const asIon = p.nitrateUnit === "NO3";
  return {
    volume: p.volumeUnit,
    temperature: p.temperatureUnit,
    nitrate: asIon ? "asNO3" : "asN",
    nitrite: asIon ? "asNO2" : "asN",
    ammonia: asIon ? "asNH3" : "asN",
    kh: p.khUnit === "dKH" ? "dKH" : "mgCaCO3",
  };
}

const SYMBOLS = {
  volume: { L: "L", usgal: "US gal", impgal: "imp gal" },
  temperature: { C: "°C", F: "°F" },
  nitrate: { asNO3: "mg/L NO3", asN: "mg/L NO3-N" },
  nitrite: { asNO2: "mg/L NO2", asN: "mg/L NO2-N" },
  ammonia: { asNH3: "mg/L NH3", asN: "mg/L NH3-N" },
  kh: { dKH: "dKH", mgCaCO3: "mg/L CaCO3" },
} as const;

export type UnitLabels = { [K in keyof DisplayUnits]: string };

export function unitLabels(u: DisplayUnits): UnitLabels {
  return {
    volume: SYMBOLS.volume[u.volume],
    temperature: SYMBOLS.temperature[u.temperature],
    nitrate: SYMBOLS.nitrate[u.nitrate],
    nitrite: SYMBOLS.nitrite[u.nitrite],
    ammonia: SYMBOLS.ammonia[u.ammonia],
    kh: SYMBOLS.kh[u.kh],
  };
}

/** Figures in tables and key figures: significant figures as on the charts, thousands grouped ("5,184"). */
export function formatNumber(x: number | null | undefined, digits = 3): string {
  if (x != null && Number.isFinite(x) && Math.abs(x) >= 1000) return Math.round(x).toLocaleString("en");
  return formatSignificant(x, digits);
}
