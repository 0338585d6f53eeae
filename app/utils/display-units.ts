/**
 * The units a person sees, from their account preferences. Isomorphic: the conversions and the
 * unit labels are the engine's one units table (models/units.ts), which runs in the browser too.
 */
import { speciesFactor, unitSymbol, UNITS, type DisplayUnits } from "~models/units";
import { formatSignificant } from "~/utils/format";

export type { DisplayUnits } from "~models/units";

/** Account preferences as stored on the user row (the columns' enums in app/db/schema.ts). */
export const PREFERENCE_CHOICES = {
  volumeUnit: ["L", "usgal", "impgal"],
  temperatureUnit: ["C", "F"],
  nitrateUnit: ["NO3", "N"],
  khUnit: ["dKH", "CaCO3"],
} as const;

export type UnitPreferences = { [K in keyof typeof PREFERENCE_CHOICES]: (typeof PREFERENCE_CHOICES)[K][number] };

/** Metric, nitrate as NO3: what an anonymous viewer sees. */
export const DEFAULT_PREFERENCES: UnitPreferences = {
  volumeUnit: "L",
  temperatureUnit: "C",
  nitrateUnit: "NO3",
  khUnit: "dKH",
};

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

/** The choices of the account page, in the units table's words. */
export const PREFERENCE_OPTIONS = {
  volumeUnit: [
    { value: "L", label: `${UNITS.volume.L.label} (L)` },
    { value: "usgal", label: UNITS.volume.usgal.label },
    { value: "impgal", label: UNITS.volume.impgal.label },
  ],
  temperatureUnit: [
    { value: "C", label: `${UNITS.temperature.C.label} (${UNITS.temperature.C.symbol})` },
    { value: "F", label: `${UNITS.temperature.F.label} (${UNITS.temperature.F.symbol})` },
  ],
  nitrateUnit: [
    { value: "NO3", label: `as nitrate, ${UNITS.nitrate.asNO3.symbol} (most test kits)` },
    { value: "N", label: `as nitrogen, ${UNITS.nitrate.asN.symbol}` },
  ],
  khUnit: [
    { value: "dKH", label: `degrees of carbonate hardness (${UNITS.kh.dKH.symbol})` },
    { value: "CaCO3", label: UNITS.kh.mgCaCO3.label },
  ],
} as const satisfies { [K in keyof UnitPreferences]: readonly { value: UnitPreferences[K]; label: string }[] };

export type UnitLabels = { [K in keyof DisplayUnits]: string };

/** The label of each convertible quantity in `u` ("mg/L NO3", "US gal", "°F"…). */
export function unitLabels(u: DisplayUnits): UnitLabels {
  return {
    volume: unitSymbol("volume", u.volume),
    temperature: unitSymbol("temperature", u.temperature),
    nitrate: unitSymbol("nitrate", u.nitrate),
    nitrite: unitSymbol("nitrite", u.nitrite),
    ammonia: unitSymbol("ammonia", u.ammonia),
    kh: unitSymbol("kh", u.kh),
  };
}

/** Figures in tables and key figures: significant figures as on the charts, thousands grouped ("5,184"). */
export function formatNumber(x: number | null | undefined, digits = 3): string {
  if (x != null && Number.isFinite(x) && Math.abs(x) >= 1000) return Math.round(x).toLocaleString("en");
  return formatSignificant(x, digits);
}

/**
 * An amount of nitrate (mg N/L) in words, in the reader's units: "40 mg/L NO3" or "9.04 mg/L
 * NO3-N". The one way sentences (forecasts, presets, cautions) state nitrate.
 */
export function nitrateText(mgN: number, u: DisplayUnits): string {
  return `${formatNumber(mgN * speciesFactor("nitrate", u), 3)} ${unitSymbol("nitrate", u.nitrate)}`;
}
