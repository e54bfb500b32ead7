/** Small dense linear algebra: solving, inverting, and eigenvalues of real nonsymmetric matrices. */
import type { Complex } from '../types';

/** Solve A x = b in place (A row-major n x n, destroyed; b overwritten with x). Returns false when A is singular. */
export function solveInPlace(a: Float64Array | number[], b: Float64Array | number[], n: number): boolean {
  for (let col = 0; col < n; col++) {
    let pivot = col;
    let best = Math.abs(a[col * n + col]!);
    for (let row = col + 1; row < n; row++) {
      const size = Math.abs(a[row * n + col]!);
      if (size > best) {
        best = size;
        pivot = row;
      }
    }
    if (!(best > 0) || !Number.isFinite(best)) return false;
    if (pivot !== col) {
      for (let k = 0; k < n; k++) {
        const t = a[col * n + k]!;
        a[col * n + k] = a[pivot * n + k]!;
        a[pivot * n + k] = t;
      }
      const t = b[col]!;
      b[col] = b[pivot]!;
      b[pivot] = t;
    }
    const diagonal = a[col * n + col]!;
    for (let row = col + 1; row < n; row++) {
      const factor = a[row * n + col]! / diagonal;
      if (factor === 0) continue;
      for (let k = col; k < n; k++) a[row * n + k]! -= factor * a[col * n + k]!;
      b[row]! -= factor * b[col]!;
    }
  }
  for (let row = n - 1; row >= 0; row--) {
    let sum = b[row]!;
    for (let k = row + 1; k < n; k++) sum -= a[row * n + k]! * b[k]!;
    b[row] = sum / a[row * n + row]!;
  }
  return true;
}

/** The inverse of a row-major n x n matrix, or null when singular. */
export function inverse(matrix: ArrayLike<number>, n: number): Float64Array | null {
  const result = new Float64Array(n * n);
  const column = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const a = Float64Array.from(matrix);
    column.fill(0);
    column[j] = 1;
    if (!solveInPlace(a, column, n)) return null;
    for (let i = 0; i < n; i++) result[i * n + j] = column[i]!;
  }
  return result;
}

/**
 * Eigenvalues of a real n x n matrix (row-major): reduction to upper Hessenberg form by
 * elimination with pivoting, then the shifted QR iteration with Francis double steps
 * (the classic EISPACK hqr scheme). Returns null if the iteration does not converge.
 */
export function eigenvalues(matrix: ArrayLike<number>, n: number): Complex[] | null {
  if (n === 0) return [];
  if (n === 1) return [{ re: matrix[0]!, im: 0 }];
  for (let i = 0; i < n * n; i++) if (!Number.isFinite(matrix[i]!)) return null;
  // 1-based copy keeps the classic index arithmetic readable.
  const a: number[][] = Array.from({ length: n + 1 }, () => new Array<number>(n + 1).fill(0));
  for (let i = 1; i <= n; i++) for (let j = 1; j <= n; j++) a[i]![j] = matrix[(i - 1) * n + (j - 1)]!;
  toHessenberg(a, n);
  return hessenbergEigenvalues(a, n);
}

function toHessenberg(a: number[][], n: number): void {
  for (let m = 2; m < n; m++) {
    let x = 0;
    let i = m;
    for (let j = m; j <= n; j++) {
      if (Math.abs(a[j]![m - 1]!) > Math.abs(x)) {
        x = a[j]![m - 1]!;
        i = j;
      }
    }
    if (i !== m) {
      for (let j = m - 1; j <= n; j++) [a[i]![j], a[m]![j]] = [a[m]![j]!, a[i]![j]!];
      for (let j = 1; j <= n; j++) [a[j]![i], a[j]![m]] = [a[j]![m]!, a[j]![i]!];
    }
    if (x !== 0) {
      for (i = m + 1; i <= n; i++) {
        let y = a[i]![m - 1]!;
        if (y !== 0) {
          y /= x;
          a[i]![m - 1] = 0;
          for (let j = m; j <= n; j++) a[i]![j]! -= y * a[m]![j]!;
          for (let j = 1; j <= n; j++) a[j]![m]! += y * a[j]![i]!;
        }
      }
    }
  }
  for (let i = 3; i <= n; i++) for (let j = 1; j < i - 1; j++) a[i]![j] = 0;
}

const sign = (a: number, b: number): number => (b >= 0 ? Math.abs(a) : -Math.abs(a));

function hessenbergEigenvalues(a: number[][], n: number): Complex[] | null {
  const wr = new Array<number>(n + 1).fill(0);
  const wi = new Array<number>(n + 1).fill(0);
  let anorm = 0;
  for (let i = 1; i <= n; i++) for (let j = Math.max(i - 1, 1); j <= n; j++) anorm += Math.abs(a[i]![j]!);
  let nn = n;
  let t = 0;
  let p = 0;
  let q = 0;
  let r = 0;
  let s: number;
  let w: number;
  let x: number;
  let y: number;
  let z: number;
  while (nn >= 1) {
    let its = 0;
    let l: number;
    do {
      for (l = nn; l >= 2; l--) {
        s = Math.abs(a[l - 1]![l - 1]!) + Math.abs(a[l]![l]!);
        if (s === 0) s = anorm;
        if (Math.abs(a[l]![l - 1]!) + s === s) {
          a[l]![l - 1] = 0;
          break;
        }
      }
      x = a[nn]![nn]!;
      if (l === nn) {
        wr[nn] = x + t;
        wi[nn--] = 0;
      } else {
        y = a[nn - 1]![nn - 1]!;
        w = a[nn]![nn - 1]! * a[nn - 1]![nn]!;
        if (l === nn - 1) {
          p = 0.5 * (y - x);
          q = p * p + w;
          z = Math.sqrt(Math.abs(q));
          x += t;
          if (q >= 0) {
            z = p + sign(z, p);
            wr[nn - 1] = wr[nn] = x + z;
            if (z !== 0) wr[nn] = x - w / z;
            wi[nn - 1] = wi[nn] = 0;
          } else {
            wr[nn - 1] = wr[nn] = x + p;
            wi[nn - 1] = -(wi[nn] = z);
          }
          nn -= 2;
        } else {
          if (its === 60) return null;
          if (its === 10 || its === 20 || its === 40) {
            t += x;
            for (let i = 1; i <= nn; i++) a[i]![i]! -= x;
            s = Math.abs(a[nn]![nn - 1]!) + Math.abs(a[nn - 1]![nn - 2]!);
            y = x = 0.75 * s;
            w = -0.4375 * s * s;
          }
          ++its;
          let m: number;
          for (m = nn - 2; m >= l; m--) {
            z = a[m]![m]!;
            r = x - z;
            s = y - z;
            p = (r * s - w) / a[m + 1]![m]! + a[m]![m + 1]!;
            q = a[m + 1]![m + 1]! - z - r - s;
            r = a[m + 2]![m + 1]!;
            s = Math.abs(p) + Math.abs(q) + Math.abs(r);
            p /= s;
            q /= s;
            r /= s;
            if (m === l) break;
            const u = Math.abs(a[m]![m - 1]!) * (Math.abs(q) + Math.abs(r));
            const v = Math.abs(p) * (Math.abs(a[m - 1]![m - 1]!) + Math.abs(z) + Math.abs(a[m + 1]![m + 1]!));
            if (u + v === v) break;
          }
          for (let i = m + 2; i <= nn; i++) {
            a[i]![i - 2] = 0;
            if (i !== m + 2) a[i]![i - 3] = 0;
          }
          for (let k = m; k <= nn - 1; k++) {
            if (k !== m) {
              p = a[k]![k - 1]!;
              q = a[k + 1]![k - 1]!;
              r = 0;
              if (k !== nn - 1) r = a[k + 2]![k - 1]!;
              x = Math.abs(p) + Math.abs(q) + Math.abs(r);
              if (x !== 0) {
                p /= x;
                q /= x;
                r /= x;
              }
            }
            s = sign(Math.sqrt(p * p + q * q + r * r), p);
            if (s !== 0) {
              if (k === m) {
                if (l !== m) a[k]![k - 1] = -a[k]![k - 1]!;
              } else {
                a[k]![k - 1] = -s * x;
              }
              p += s;
              x = p / s;
              y = q / s;
              z = r / s;
              q /= p;
              r /= p;
              for (let j = k; j <= nn; j++) {
                p = a[k]![j]! + q * a[k + 1]![j]!;
                if (k !== nn - 1) {
                  p += r * a[k + 2]![j]!;
                  a[k + 2]![j]! -= p * z;
                }
                a[k + 1]![j]! -= p * y;
                a[k]![j]! -= p * x;
              }
              const mmin = nn < k + 3 ? nn : k + 3;
              for (let i = l; i <= mmin; i++) {
                p = x * a[i]![k]! + y * a[i]![k + 1]!;
                if (k !== nn - 1) {
                  p += z * a[i]![k + 2]!;
                  a[i]![k + 2]! -= p * r;
                }
                a[i]![k + 1]! -= p * q;
                a[i]![k]! -= p;
              }
            }
          }
        }
      }
    } while (l < nn - 1);
  }
  const result: Complex[] = [];
  for (let i = 1; i <= n; i++) result.push({ re: wr[i]!, im: wi[i]! });
  return result.sort((u, v) => v.re - u.re || v.im - u.im);
}
