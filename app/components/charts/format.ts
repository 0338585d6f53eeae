/** Number and day formatting for the charts' readouts, tables and labels (pure). */

import { formatSignificant as formatNumber } from "~/utils/format";

/**
 * A value with `sig` significant figures, plain decimal (no exponent). Magnitudes below 0.0001
 * print as "<0.0001" whatever their sign (below any test kit's resolution); non-finite values as "–".
 * One rule for charts and pages: app/utils/format.ts.
 */
export { formatNumber };

/** A signed difference, e.g. "+1.9" or "-0.31". */
export function formatSigned(x: number, sig = 3): string {
  const s = formatNumber(x, sig);
  return x > 0 ? `+${s}` : s;
}

/**
 * Elapsed time since the start: "day 14" on whole days, "day 14 + 6 h" within a day
 * (hours to 0.1 h, so hourly output prints whole hours).
 */
export function formatDay(day: number): string {
  const whole = Math.floor(day + 1e-9);
  const hours = Math.round((day - whole) * 240) / 10;
  if (hours === 0) return `day ${whole}`;
  if (hours >= 24) return `day ${whole + 1}`;
  return `day ${whole} + ${hours} h`;
}

/**
 * Nitrogen amounts for the budget: mg N below 10 g, g N from there (one decimal below 100 g).
 * Returns the number and its unit separately so tables can align them.
 */
export function splitMgN(mg: number): { value: string; unit: "mg N" | "g N" } {
  const a = Math.abs(mg);
  if (a >= 10_000) return { value: (mg / 1000).toFixed(a >= 100_000 ? 0 : 1), unit: "g N" };
  if (a >= 100) return { value: String(Math.round(mg)), unit: "mg N" };
  return { value: formatNumber(mg, 3), unit: "mg N" };
}

export type NitrogenUnit = "mg N" | "g N";

/**
 * One unit for a whole column of budget amounts: g N when its largest amount is 10 g or more,
 * else mg N, so a column never mixes the two (the unit is said once, in its header).
 */
export function columnUnit(amountsMg: readonly number[]): NitrogenUnit {
  const biggest = Math.max(0, ...amountsMg.filter(Number.isFinite).map(Math.abs));
  return biggest >= 10_000 ? "g N" : "mg N";
}

/** An amount in a column's unit, without the unit: "12.3" (g N) or "850" (mg N). */
export function formatInUnit(mg: number, unit: NitrogenUnit): string {
  if (unit === "mg N") return Math.abs(mg) >= 100 ? String(Math.round(mg)) : formatNumber(mg, 3);
  const g = mg / 1000;
  return Math.abs(g) >= 100 ? String(Math.round(g)) : formatNumber(g, 3);
}

export function formatMgN(mg: number): string {
  const { value, unit } = splitMgN(mg);
  return `${value} ${unit}`;
}

export function formatPercent(fraction: number): string {
  const p = fraction * 100;
  if (p === 0) return "0 %";
  if (Math.abs(p) < 0.1) return "<0.1 %";
  return `${Math.abs(p) < 10 ? p.toFixed(1) : Math.round(p)} %`;
}
