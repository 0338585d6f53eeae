/**
 * The one units vocabulary of Fernwater: for every quantity a keeper may see in more than one
 * unit, the unit ids, their labels and the exact conversion to the engine's canonical unit
 * (litres, °C, mg N/L, dKH). Every conversion is linear — canonical = value × factor + offset —
 * so it is a table, not a units library: it runs in the browser as well as on the server, and
 * forms, charts, readings, CSV files and the API all convert through it.
 *
 * Factors: volume and temperature by definition (docs/sources.md §3), the chemistry factors
 * ("as NO3" vs "as N" …) from atomic weights (nitrogen/chemistry.ts, docs/sources.md §0).
 */
import { MG_CACO3_PER_DKH, N_FRACTION } from "./nitrogen/chemistry";
import type { Quantity } from "./nitrogen/scenario/field-kit";

type UnitDef = {
  /** Words for a chooser, e.g. "US gallons". */
  label: string;
  /** What stands beside a number, e.g. "US gal", "mg/L NO3". */
  symbol: string;
  /** canonical = value × factor + offset. */
  factor: number;
  offset?: number;
};

/** Units a keeper may choose, per quantity. Ids are stable (stored with accounts, forms and readings). */
export const UNITS = {
  volume: {
    L: { label: "litres", symbol: "L", factor: 1 },
    // NIST SP 811: both gallons are exact by definition (docs/sources.md §3).
    usgal: { label: "US gallons", symbol: "US gal", factor: 3.785411784 },
    impgal: { label: "imperial gallons", symbol: "imp gal", factor: 4.54609 },
  },
  temperature: {
    C: { label: "degrees Celsius", symbol: "°C", factor: 1 },
    // °C = (°F − 32) × 5/9, by definition of the Fahrenheit scale.
    F: { label: "degrees Fahrenheit", symbol: "°F", factor: 5 / 9, offset: (-32 * 5) / 9 },
  },
  nitrate: {
    asN: { label: "mg/L as N (NO3-N)", symbol: "mg/L NO3-N", factor: 1 },
    asNO3: { label: "mg/L as nitrate (NO3)", symbol: "mg/L NO3", factor: N_FRACTION.NO3 },
  },
  nitrite: {
    asN: { label: "mg/L as N (NO2-N)", symbol: "mg/L NO2-N", factor: 1 },
    asNO2: { label: "mg/L as nitrite (NO2)", symbol: "mg/L NO2", factor: N_FRACTION.NO2 },
  },
  // Kits report total ammonia "as NH4" or "as NH3": either way it is the total expressed as that
  // species, so only the molar-mass factor applies (NH3-N is total ammonia nitrogen).
  ammonia: {
    asN: { label: "mg/L as N (NH3-N)", symbol: "mg/L NH3-N", factor: 1 },
    asNH4: { label: "mg/L as ammonium (NH4)", symbol: "mg/L NH4", factor: N_FRACTION.NH4 },
    asNH3: { label: "mg/L as ammonia (NH3)", symbol: "mg/L NH3", factor: N_FRACTION.NH3 },
  },
  kh: {
    dKH: { label: "degrees KH", symbol: "dKH", factor: 1 },
    mgCaCO3: { label: "mg/L as CaCO3", symbol: "mg/L CaCO3", factor: 1 / MG_CACO3_PER_DKH },
  },
} as const satisfies Record<string, Record<string, UnitDef>>;

export type ConvertibleQuantity = keyof typeof UNITS;
type VolumeUnit = keyof typeof UNITS.volume;
export type TemperatureUnit = keyof typeof UNITS.temperature;
export type NitrateUnit = keyof typeof UNITS.nitrate;
export type NitriteUnit = keyof typeof UNITS.nitrite;
export type AmmoniaUnit = keyof typeof UNITS.ammonia;
export type KhUnit = keyof typeof UNITS.kh;

/** The unit a person sees each convertible quantity in. */
export type DisplayUnits = {
  volume: VolumeUnit;
  temperature: TemperatureUnit;
  nitrate: NitrateUnit;
  nitrite: NitriteUnit;
  ammonia: AmmoniaUnit;
  kh: KhUnit;
};

/** The engine's own units: what the API speaks. */
export const CANONICAL_UNITS: DisplayUnits = {
  volume: "L",
  temperature: "C",
  nitrate: "asN",
  nitrite: "asN",
  ammonia: "asN",
  kh: "dKH",
};

function isConvertible(quantity: string): quantity is ConvertibleQuantity {
  return Object.hasOwn(UNITS, quantity);
}

function unitDef(quantity: ConvertibleQuantity, unit: string): UnitDef {
  const table = UNITS[quantity] as Record<string, UnitDef>;
  if (!Object.hasOwn(table, unit)) throw new RangeError(`Unknown unit "${unit}" for ${quantity}`);
  return table[unit];
}

/** A value typed in `unit` → the engine's canonical unit for `quantity`. Throws on an unknown unit id. */
export function toCanonical(quantity: ConvertibleQuantity, value: number, unit: string): number {
  const u = unitDef(quantity, unit);
  return value * u.factor + (u.offset ?? 0);
}

/** A canonical value of `quantity` → `unit`. Throws on an unknown unit id. */
export function fromCanonical(quantity: ConvertibleQuantity, value: number, unit: string): number {
  const u = unitDef(quantity, unit);
  return (value - (u.offset ?? 0)) / u.factor;
}

/** Label for a unit id of a quantity, e.g. ("nitrate", "asNO3") → "mg/L NO3". */
export function unitSymbol(quantity: ConvertibleQuantity, unit: string): string {
  return unitDef(quantity, unit).symbol;
}

/**
 * Canonical → what a person sees, for any quantity: the convertible ones in `units`, a fraction
 * as a percentage, everything else as it is.
 */
export function toDisplay(quantity: Quantity, value: number, units: DisplayUnits): number {
  if (quantity === "fraction") return value * 100;
  return isConvertible(quantity) ? fromCanonical(quantity, value, units[quantity]) : value;
}

/** What a person typed → canonical (the inverse of toDisplay). */
export function fromDisplay(quantity: Quantity, value: number, units: DisplayUnits): number {
  if (quantity === "fraction") return value / 100;
  return isConvertible(quantity) ? toCanonical(quantity, value, units[quantity]) : value;
}

/** Multiplier from mg N/L to the display unit of a species (species conversions have no offset). */
export function speciesFactor(quantity: "nitrate" | "nitrite" | "ammonia", units: DisplayUnits): number {
  return fromCanonical(quantity, 1, units[quantity]);
}

/**
 * The one place that names the unit a quantity is shown in: the person's unit for a convertible
 * quantity (keeping a rate's "/day": "US gal/day"), "%" for a fraction, else the field's own
 * canonical unit ("g/day", "days", "" for none).
 */
export function unitLabel(quantity: Quantity, units: DisplayUnits, canonicalUnit = ""): string {
  if (quantity === "fraction") return "%";
  if (!isConvertible(quantity)) return canonicalUnit;
  const perDay = canonicalUnit.endsWith("/day") ? "/day" : "";
  return unitSymbol(quantity, units[quantity]) + perDay;
}
