/**
 * How numbers read on every page and chart: `sig` significant figures, no float noise, and
 * values too small to mean anything shown as "<0.0001" (their sign is solver noise).
 */
export function formatSignificant(x: number | null | undefined, sig = 3): string {
  if (x == null || !Number.isFinite(x)) return "–";
  if (x === 0) return "0";
  const a = Math.abs(x);
  if (a < 1e-4) return "<0.0001";
  if (a >= 10 ** sig) return String(Math.round(x));
  // toPrecision can give an exponent for small numbers; Number() then String() keeps it plain
  // for everything ≥ 1e-6, and we stopped at 1e-4 above.
  return String(Number(x.toPrecision(sig)));
}
