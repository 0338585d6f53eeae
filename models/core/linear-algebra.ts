/**
 * Dense LU factorisation with partial pivoting, for the small (≤ ~30) systems of the implicit
 * solver. Row-major Float64Array storage; no allocation after construction.
 */
export class DenseLu {
  readonly n: number;
  private readonly a: Float64Array;
  private readonly pivot: Int32Array;

  constructor(n: number) {
    this.n = n;
    this.a = new Float64Array(n * n);
    this.pivot = new Int32Array(n);
  }

  /**
   * Factorise M = diag · I − J (the Rosenbrock iteration matrix) in place.
   * @returns false when the matrix is singular to working precision.
   */
  factorShifted(diag: number, jac: Float64Array): boolean {
    const { n, a, pivot } = this;
    for (let i = 0; i < n * n; i++) a[i] = -jac[i];
    for (let i = 0; i < n; i++) a[i * n + i] += diag;
    for (let k = 0; k < n; k++) {
      let p = k;
      let best = Math.abs(a[k * n + k]);
      for (let i = k + 1; i < n; i++) {
        const v = Math.abs(a[i * n + k]);
        if (v > best) {
          best = v;
          p = i;
        }
      }
      if (!(best > 0) || !Number.isFinite(best)) return false;
      pivot[k] = p;
      if (p !== k) {
        for (let j = 0; j < n; j++) {
          const tmp = a[k * n + j];
          a[k * n + j] = a[p * n + j];
          a[p * n + j] = tmp;
        }
      }
      const inv = 1 / a[k * n + k];
      for (let i = k + 1; i < n; i++) {
        const f = a[i * n + k] * inv;
        if (f === 0) continue;
        a[i * n + k] = f;
        for (let j = k + 1; j < n; j++) a[i * n + j] -= f * a[k * n + j];
      }
    }
    return true;
  }

  /** Solve (the factorised matrix) · x = b in place (b becomes x). */
  solve(b: Float64Array): void {
    const { n, a, pivot } = this;
    // Rows were swapped whole during the factorisation (LAPACK style), so every interchange
    // is applied to b before the forward substitution.
    for (let k = 0; k < n; k++) {
      const p = pivot[k];
      if (p !== k) {
        const tmp = b[k];
        b[k] = b[p];
        b[p] = tmp;
      }
    }
    for (let k = 0; k < n; k++) {
      const bk = b[k];
      if (bk !== 0) for (let i = k + 1; i < n; i++) b[i] -= a[i * n + k] * bk;
    }
    for (let k = n - 1; k >= 0; k--) {
      let s = b[k];
      for (let j = k + 1; j < n; j++) s -= a[k * n + j] * b[j];
      b[k] = s / a[k * n + k];
    }
  }
}
