/**
 * Temperature response of growth: the cardinal temperature model with inflection of Rosso,
 * Lobry & Flandrois (1993), J. Theor. Biol. 162: 447–463 (docs/sources.md §14). Zero at and
 * below the minimum and at and above the maximum, 1 at the optimum.
 */

export interface CardinalTemperatures {
  readonly min: number;
  readonly opt: number;
  readonly max: number;
}

/** Growth at temperature `t` (°C) relative to growth at the optimum (0–1). */
export function cardinalFactor(t: number, c: CardinalTemperatures): number {
  if (!(t > c.min && t < c.max)) return 0;
  const num = (t - c.max) * (t - c.min) ** 2;
  const den = (c.opt - c.min) * ((c.opt - c.min) * (t - c.opt) - (c.opt - c.max) * (c.opt + c.min - 2 * t));
  const f = num / den;
  return f > 0 ? f : 0;
}

/** Growth at `t` relative to growth at `reference` (°C); 0 when the reference itself allows no growth. */
export function relativeGrowth(t: number, reference: number, c: CardinalTemperatures): number {
  const ref = cardinalFactor(reference, c);
  return ref > 0 ? cardinalFactor(t, c) / ref : 0;
}
