// Small dense LU with partial pivoting, in place on a row-major n*n Float64Array. The implicit
// method solves a handful of these per step for systems of a few couplings, so a plain
// Doolittle elimination is the right tool.

/** Factors `a` in place (L below the diagonal, unit diagonal implied; U on and above). */
export function luFactor(a: Float64Array, n: number, pivots: Int32Array): boolean {
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
    pivots[k] = p;
    if (best === 0 || !Number.isFinite(best)) return false;
    if (p !== k) {
      for (let j = 0; j < n; j++) {
        const tmp = a[k * n + j];
        a[k * n + j] = a[p * n + j];
        a[p * n + j] = tmp;
      }
    }
    const inv = 1 / a[k * n + k];
    for (let i = k + 1; i < n; i++) {
      const m = a[i * n + k] * inv;
      a[i * n + k] = m;
      if (m !== 0) for (let j = k + 1; j < n; j++) a[i * n + j] -= m * a[k * n + j];
    }
  }
  return true;
}

/** Solves (LU) x = b in place in `b`, using the factors and pivots from luFactor. */
export function luSolve(a: Float64Array, n: number, pivots: Int32Array, b: Float64Array): void {
  for (let k = 0; k < n; k++) {
    const p = pivots[k];
    if (p !== k) {
      const tmp = b[k];
      b[k] = b[p];
      b[p] = tmp;
    }
  }
  for (let i = 1; i < n; i++) {
    let s = b[i];
    for (let j = 0; j < i; j++) s -= a[i * n + j] * b[j];
    b[i] = s;
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i];
    for (let j = i + 1; j < n; j++) s -= a[i * n + j] * b[j];
    b[i] = s / a[i * n + i];
  }
}
