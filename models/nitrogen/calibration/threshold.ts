/**
 * The likelihood-ratio threshold of a 95 % range when the noise level is estimated from the
 * same readings.
 *
 * With a known noise level the range of one multiplier is where 2(ln L̂ − ln L) ≤ 3.84 (χ² with
 * one degree of freedom). Calibration estimates τ from the readings as well, and profiles it
 * out at every point; the exact small-sample form of that test for normal errors is the
 * profile-t interval of Bates & Watts (Nonlinear Regression Analysis and Its Applications,
 * 1988, §6.1; docs/sources.md §17): S(θ̃)/S(θ̂) ≤ 1 + t²(n − p)/(n − p), i.e.
 * 2(ln L̂ − ln L) ≤ n·ln(1 + t²(n − p; 0.975)/(n − p)). It is 4.19 for 30 readings and two
 * multipliers, and tends to 3.84 as readings grow.
 */

/** Student's t, two-sided 95 % point, for 1–4 degrees of freedom (Abramowitz & Stegun, Table 26.10). */
const T975_SMALL = [12.706, 4.303, 3.182, 2.776];

/**
 * Student's t 97.5 % point for ν degrees of freedom: the table for ν ≤ 4, else the
 * Cornish–Fisher expansion about the normal point (Abramowitz & Stegun 26.7.5; docs/sources.md
 * §17), within 0.001 of the table from ν = 5 on.
 */
export function studentT975(nu: number): number {
  if (nu < 1) return Infinity;
  if (nu <= 4) return T975_SMALL[Math.round(nu) - 1];
  const z = 1.959964;
  const g1 = (z ** 3 + z) / 4;
  const g2 = (5 * z ** 5 + 16 * z ** 3 + 3 * z) / 96;
  const g3 = (3 * z ** 7 + 19 * z ** 5 + 17 * z ** 3 - 15 * z) / 384;
  const g4 = (79 * z ** 9 + 776 * z ** 7 + 1482 * z ** 5 - 1920 * z ** 3 - 945 * z) / 92160;
  return z + g1 / nu + g2 / nu ** 2 + g3 / nu ** 3 + g4 / nu ** 4;
}

/** The likelihood-ratio threshold of a 95 % range of one multiplier, n measured values, p fitted multipliers. */
export function rangeThreshold(n: number, p: number): number {
  const nu = n - p;
  if (nu < 1) return Infinity;
  const t = studentT975(nu);
  return n * Math.log1p((t * t) / nu);
}
