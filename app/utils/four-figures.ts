/**
 * A number rounded to four significant figures, as `Number(v.toPrecision(4))` gives it, about
 * five times faster: a run's first view rounds every sample of its chart (issue 15, item 5).
 *
 * 10^0 … 10^22 are exact doubles, so n / 10^k and n · 10^k round once, exactly as reading the
 * decimal "n e-k" would. Only a value within a rounding error of a half-way point (a chance of
 * about one in 10^12 for a measured or simulated value) may land on the other neighbour.
 */
const POWERS_OF_TEN = Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));

export function fourFigures(v: number): number {
  if (v === 0 || !Number.isFinite(v)) return v;
  const a = Math.abs(v);
  const shift = 3 - Math.floor(Math.log10(a));
  let r: number;
  if (shift >= 0 && shift <= 22) r = Math.round(a * POWERS_OF_TEN[shift]) / POWERS_OF_TEN[shift];
  else if (shift < 0 && shift >= -22) r = Math.round(a / POWERS_OF_TEN[-shift]) * POWERS_OF_TEN[-shift];
  else return Number(v.toPrecision(4));
  return v < 0 ? -r : r;
}
