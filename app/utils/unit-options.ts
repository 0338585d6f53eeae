/** Choices on the account page; the values are the columns' enums in app/db/schema.ts. */
export const VOLUME_UNIT_OPTIONS = [
  { value: "L", label: "litres (L)" },
  { value: "usgal", label: "US gallons" },
  { value: "impgal", label: "imperial gallons" },
] as const;

export const TEMPERATURE_UNIT_OPTIONS = [
  { value: "C", label: "degrees Celsius (°C)" },
  { value: "F", label: "degrees Fahrenheit (°F)" },
] as const;

export const NITRATE_UNIT_OPTIONS = [
  { value: "NO3", label: "as nitrate, mg/L NO3 (most test kits)" },
  { value: "N", label: "as nitrogen, mg/L NO3-N" },
] as const;

export const KH_UNIT_OPTIONS = [
  { value: "dKH", label: "degrees of carbonate hardness (dKH)" },
  { value: "CaCO3", label: "mg/L as CaCO3" },
] as const;
