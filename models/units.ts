/**
 * Unit conversions between what keepers type and the engine's canonical units
 * (litres, °C, mg N/L, dKH). Volume and temperature go through mathjs units; the chemistry
 * factors ("as NO3" vs "as N" …) come from molar masses in nitrogen/chemistry.ts.
 *
 * This module imports mathjs, which is too large for the browser bundle: import it from server
 * code, the CLI or tests only — never from the schema, presets or simulate (models/index.ts does
 * not re-export it).
 */
import { all, create } from "mathjs";
import { MG_CACO3_PER_DKH, N_FRACTION } from "./nitrogen/chemistry";

const math = create(all, {});
// NIST SP 811: imperial gallon = 4.54609 L exactly (mathjs's "gallon" is the US gallon, 3.785411784 L).
math.createUnit("imperialGallon", "4.54609 liter");

/** Units a keeper may choose, per quantity. Ids are stable (stored with forms and readings). */
export const UNIT_OPTIONS = {
  volume: [
    { id: "L", label: "litres", symbol: "L" },
    { id: "usgal", label: "US gallons", symbol: "US gal" },
    { id: "impgal", label: "imperial gallons", symbol: "imp gal" },
  ],
  temperature: [
    { id: "C", label: "degrees Celsius", symbol: "°C" },
    { id: "F", label: "degrees Fahrenheit", symbol: "°F" },
  ],
  nitrate: [
    { id: "asN", label: "mg/L as N (NO3-N)", symbol: "mg/L NO3-N" },
    { id: "asNO3", label: "mg/L as nitrate (NO3)", symbol: "mg/L NO3" },
  ],
  nitrite: [
    { id: "asN", label: "mg/L as N (NO2-N)", symbol: "mg/L NO2-N" },
    { id: "asNO2", label: "mg/L as nitrite (NO2)", symbol: "mg/L NO2" },
  ],
  ammonia: [
    { id: "asN", label: "mg/L as N (TAN-N)", symbol: "mg/L N" },
    { id: "asNH4", label: "mg/L as ammonium (NH4)", symbol: "mg/L NH4" },
    { id: "asNH3", label: "mg/L as ammonia (NH3)", symbol: "mg/L NH3" },
  ],
  kh: [
    { id: "dKH", label: "degrees KH", symbol: "dKH" },
    { id: "mgCaCO3", label: "mg/L as CaCO3", symbol: "mg/L CaCO3" },
  ],
} as const;

export type VolumeUnit = (typeof UNIT_OPTIONS.volume)[number]["id"];
export type TemperatureUnit = (typeof UNIT_OPTIONS.temperature)[number]["id"];
export type NitrateUnit = (typeof UNIT_OPTIONS.nitrate)[number]["id"];
export type NitriteUnit = (typeof UNIT_OPTIONS.nitrite)[number]["id"];
export type AmmoniaUnit = (typeof UNIT_OPTIONS.ammonia)[number]["id"];
export type KhUnit = (typeof UNIT_OPTIONS.kh)[number]["id"];
export type ConvertibleQuantity = keyof typeof UNIT_OPTIONS;

const MATH_VOLUME: Record<VolumeUnit, string> = { L: "liter", usgal: "gallon", impgal: "imperialGallon" };
const MATH_TEMP: Record<TemperatureUnit, string> = { C: "degC", F: "degF" };

/** Volume in `unit` → litres. */
export function toLitres(value: number, unit: VolumeUnit): number {
  return unit === "L" ? value : math.unit(value, MATH_VOLUME[unit]).toNumber("liter");
}
/** Litres → volume in `unit`. */
export function fromLitres(litres: number, unit: VolumeUnit): number {
  return unit === "L" ? litres : math.unit(litres, "liter").toNumber(MATH_VOLUME[unit]);
}

/** Temperature in `unit` → °C. */
export function toCelsius(value: number, unit: TemperatureUnit): number {
  return unit === "C" ? value : math.unit(value, MATH_TEMP[unit]).toNumber("degC");
}
/** °C → temperature in `unit`. */
export function fromCelsius(celsius: number, unit: TemperatureUnit): number {
  return unit === "C" ? celsius : math.unit(celsius, "degC").toNumber(MATH_TEMP[unit]);
}

/** Nitrate reading → mg NO3-N/L. 50 mg/L as NO3 = 11.29 mg/L as N. */
export function nitrateToN(value: number, unit: NitrateUnit): number {
  return unit === "asN" ? value : value * N_FRACTION.NO3;
}
/** mg NO3-N/L → nitrate in `unit`. */
export function nitrateFromN(mgN: number, unit: NitrateUnit): number {
  return unit === "asN" ? mgN : mgN / N_FRACTION.NO3;
}

/** Nitrite reading → mg NO2-N/L. */
export function nitriteToN(value: number, unit: NitriteUnit): number {
  return unit === "asN" ? value : value * N_FRACTION.NO2;
}
/** mg NO2-N/L → nitrite in `unit`. */
export function nitriteFromN(mgN: number, unit: NitriteUnit): number {
  return unit === "asN" ? mgN : mgN / N_FRACTION.NO2;
}

/**
 * Ammonia reading → mg N/L. Kits report total ammonia "as NH4" or "as NH3"; either way the
 * reading is total ammonia expressed as that species, so only the molar-mass factor applies.
 */
export function ammoniaToN(value: number, unit: AmmoniaUnit): number {
  return unit === "asN" ? value : unit === "asNH4" ? value * N_FRACTION.NH4 : value * N_FRACTION.NH3;
}
/** mg N/L → ammonia in `unit`. */
export function ammoniaFromN(mgN: number, unit: AmmoniaUnit): number {
  return unit === "asN" ? mgN : unit === "asNH4" ? mgN / N_FRACTION.NH4 : mgN / N_FRACTION.NH3;
}

/** KH in `unit` → dKH (1 dKH = 17.848 mg/L as CaCO3). */
export function toDkh(value: number, unit: KhUnit): number {
  return unit === "dKH" ? value : value / MG_CACO3_PER_DKH;
}
/** dKH → KH in `unit`. */
export function fromDkh(dkh: number, unit: KhUnit): number {
  return unit === "dKH" ? dkh : dkh * MG_CACO3_PER_DKH;
}

/**
 * Convert a value the keeper typed in `unit` to the engine's canonical unit for `quantity`.
 * Throws on an unknown unit id.
 */
export function toCanonical(quantity: ConvertibleQuantity, value: number, unit: string): number {
  check(quantity, unit);
  switch (quantity) {
    case "volume":
      return toLitres(value, unit as VolumeUnit);
    case "temperature":
      return toCelsius(value, unit as TemperatureUnit);
    case "nitrate":
      return nitrateToN(value, unit as NitrateUnit);
    case "nitrite":
      return nitriteToN(value, unit as NitriteUnit);
    case "ammonia":
      return ammoniaToN(value, unit as AmmoniaUnit);
    case "kh":
      return toDkh(value, unit as KhUnit);
  }
}

/** Convert a canonical value for `quantity` to the keeper's chosen `unit`. */
export function fromCanonical(quantity: ConvertibleQuantity, value: number, unit: string): number {
  check(quantity, unit);
  switch (quantity) {
    case "volume":
      return fromLitres(value, unit as VolumeUnit);
    case "temperature":
      return fromCelsius(value, unit as TemperatureUnit);
    case "nitrate":
      return nitrateFromN(value, unit as NitrateUnit);
    case "nitrite":
      return nitriteFromN(value, unit as NitriteUnit);
    case "ammonia":
      return ammoniaFromN(value, unit as AmmoniaUnit);
    case "kh":
      return fromDkh(value, unit as KhUnit);
  }
}

function check(quantity: ConvertibleQuantity, unit: string): void {
  const options = UNIT_OPTIONS[quantity] as readonly { id: string }[] | undefined;
  if (!options || !options.some((o) => o.id === unit)) {
    throw new RangeError(`Unknown unit "${unit}" for ${quantity}`);
  }
}

/** Display label for a unit id of a quantity, e.g. ("nitrate", "asNO3") → "mg/L NO3". */
export function unitSymbol(quantity: ConvertibleQuantity, unit: string): string {
  check(quantity, unit);
  return (UNIT_OPTIONS[quantity] as readonly { id: string; symbol: string }[]).find((o) => o.id === unit)!.symbol;
}
