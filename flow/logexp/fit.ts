// Linear least squares for the extrapolation of effective exponents: y(l) = c0 + c1 b1(l) + ...,
// solved by Householder QR on column-scaled data (the correction columns 1/l and ln l / l span
// many orders of magnitude, so normal equations would lose the digits we are after).

export interface LinearFit {
  coefficients: number[];
  /** Root-mean-square residual. */
  residual: number;
}

/** Fits ys ~ sum_k c_k basis_k(x); basis[0] is usually the constant 1. Needs points >= columns. */
export function leastSquares(xs: readonly number[], ys: readonly number[], basis: readonly ((x: number) => number)[]): LinearFit {
  const m = xs.length;
  const k = basis.length;
  if (m < k) throw new RangeError(`a fit with ${k} terms needs at least ${k} points, got ${m}`);
  const a: number[][] = xs.map((x) => basis.map((fn) => fn(x)));
  const b = ys.slice();
  // Column scaling.
  const scale = new Array<number>(k).fill(0);
  for (let j = 0; j < k; j++) {
    for (let i = 0; i < m; i++) scale[j] = Math.max(scale[j]!, Math.abs(a[i]![j]!));
    if (scale[j] === 0) scale[j] = 1;
    for (let i = 0; i < m; i++) a[i]![j]! /= scale[j]!;
  }
  // Householder QR, applied to b as we go.
  for (let j = 0; j < k; j++) {
    let norm = 0;
    for (let i = j; i < m; i++) norm += a[i]![j]! ** 2;
    norm = Math.sqrt(norm);
    if (norm === 0) continue;
    const alpha = a[j]![j]! > 0 ? -norm : norm;
    const v = new Array<number>(m).fill(0);
    for (let i = j; i < m; i++) v[i] = a[i]![j]!;
    v[j]! -= alpha;
    let vv = 0;
    for (let i = j; i < m; i++) vv += v[i]! ** 2;
    if (vv === 0) continue;
    for (let c = j; c < k; c++) {
      let dot = 0;
      for (let i = j; i < m; i++) dot += v[i]! * a[i]![c]!;
      const f = (2 * dot) / vv;
      for (let i = j; i < m; i++) a[i]![c]! -= f * v[i]!;
    }
    let dot = 0;
    for (let i = j; i < m; i++) dot += v[i]! * b[i]!;
    const f = (2 * dot) / vv;
    for (let i = j; i < m; i++) b[i]! -= f * v[i]!;
  }
  const c = new Array<number>(k).fill(0);
  for (let j = k - 1; j >= 0; j--) {
    let s = b[j]!;
    for (let q = j + 1; q < k; q++) s -= a[j]![q]! * c[q]!;
    const diag = a[j]![j]!;
    c[j] = diag !== 0 ? s / diag : 0;
  }
  const coefficients = c.map((v, j) => v / scale[j]!);
  let ss = 0;
  for (let i = 0; i < m; i++) {
    let fit = 0;
    for (let j = 0; j < k; j++) fit += coefficients[j]! * basis[j]!(xs[i]!);
    ss += (ys[i]! - fit) ** 2;
  }
  return { coefficients, residual: Math.sqrt(ss / m) };
}

/** The correction form of an effective log exponent at RG time l: p + b / l + a ln(l) / l. */
export const LOG_CORRECTION_BASIS: readonly ((l: number) => number)[] = [() => 1, (l) => 1 / l, (l) => Math.log(l) / l];
