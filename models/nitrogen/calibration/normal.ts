/**
 * The normal distribution's log-CDF, accurate far into both tails (a reading many standard
 * deviations outside the model's value must still give a finite, smooth cost).
 *
 * erfc by the Chebyshev-fitted exponential of Press, Teukolsky, Vetterling & Flannery,
 * Numerical Recipes (2nd ed., §6.2, "erfcc"): fractional error below 1.2e-7 everywhere, and
 * written here in log form so it never underflows (docs/sources.md §17).
 */

const LN2 = Math.log(2);

/** ln erfc(x) for any x. */
function logErfc(x: number): number {
  const z = Math.abs(x);
  const t = 1 / (1 + 0.5 * z);
  const poly =
    -1.26551223 +
    t *
      (1.00002368 +
        t *
          (0.37409196 +
            t *
              (0.09678418 +
                t *
                  (-0.18628806 +
                    t * (0.27886807 + t * (-1.13520398 + t * (1.48851587 + t * (-0.82215223 + t * 0.17087277))))))));
  const logPositive = Math.log(t) - z * z + poly;
  return x >= 0 ? logPositive : Math.log(2 - Math.exp(logPositive));
}

/** ln Φ(z), Φ the standard normal CDF. */
export function logPhi(z: number): number {
  if (z === Infinity) return 0;
  if (z === -Infinity) return -Infinity;
  return logErfc(-z / Math.SQRT2) - LN2;
}

/** ln(Φ(b) − Φ(a)) for a < b (either may be infinite), without cancellation in the tails. */
export function logPhiDifference(a: number, b: number): number {
  if (!(b > a)) return -Infinity;
  if (b <= 0) {
    // Both in the lower tail: Φ(b)·(1 − Φ(a)/Φ(b)).
    const lb = logPhi(b);
    return lb + Math.log1p(-Math.exp(logPhi(a) - lb));
  }
  if (a >= 0) {
    // Both in the upper tail: Q(a) − Q(b) with Q(z) = Φ(−z).
    const qa = logPhi(-a);
    return qa + Math.log1p(-Math.exp(logPhi(-b) - qa));
  }
  return Math.log1p(-(Math.exp(logPhi(a)) + Math.exp(logPhi(-b))));
}
