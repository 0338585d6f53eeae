/**
 * Converts the engine's canonical numbers (mg N/L, L, °C, dKH) to and from what a person sees.
 * Server-only: it uses models/units.ts, which needs mathjs.
 */
import type { Quantity } from "~models";
import { fromCanonical, toCanonical } from "~models/units";
import type { DisplayUnits } from "~/utils/display-units";

type Convertible = "volume" | "temperature" | "nitrate" | "nitrite" | "ammonia" | "kh";

function isConvertible(q: Quantity): q is Convertible {
  return q === "volume" || q === "temperature" || q === "nitrate" || q === "nitrite" || q === "ammonia" || q === "kh";
}

/** Canonical → display for a scenario field's quantity ("fraction" becomes a percentage). */
export function toDisplay(quantity: Quantity, value: number, units: DisplayUnits): number {
  if (quantity === "fraction") return value * 100;
  if (!isConvertible(quantity)) return value;
  return fromCanonical(quantity, value, units[quantity]);
}

/** Display → canonical for a scenario field's quantity (percentages back to fractions). */
export function fromDisplay(quantity: Quantity, value: number, units: DisplayUnits): number {
  if (quantity === "fraction") return value / 100;
  if (!isConvertible(quantity)) return value;
  return toCanonical(quantity, value, units[quantity]);
}

/** Multiplier from mg N/L to the display unit of a species (every species conversion is linear). */
export function speciesFactor(quantity: "nitrate" | "nitrite" | "ammonia", units: DisplayUnits): number {
  return fromCanonical(quantity, 1, units[quantity]);
}
