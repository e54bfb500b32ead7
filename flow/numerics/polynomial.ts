/** All complex roots of a real polynomial (Aberth–Ehrlich iteration with Newton polishing). */
import type { Complex } from '../types';

const cAdd = (a: Complex, b: Complex): Complex => ({ re: a.re + b.re, im: a.im + b.im });
const cSub = (a: Complex, b: Complex): Complex => ({ re: a.re - b.re, im: a.im - b.im });
const cMul = (a: Complex, b: Complex): Complex => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
function cDiv(a: Complex, b: Complex): Complex {
  const d = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
}

/** p(z) and p'(z) by Horner, coefficients c_0..c_d (c_k multiplies z^k). */
function horner(c: readonly number[], z: Complex): [Complex, Complex] {
  let p: Complex = { re: c[c.length - 1]!, im: 0 };
  let dp: Complex = { re: 0, im: 0 };
  for (let k = c.length - 2; k >= 0; k--) {
    dp = cAdd(cMul(dp, z), p);
    p = cAdd(cMul(p, z), { re: c[k]!, im: 0 });
  }
  return [p, dp];
}

/** Roots of sum_k c_k z^k (trailing zero leading coefficients are dropped). */
export function polynomialRoots(coefficients: readonly number[]): Complex[] {
  const c = [...coefficients];
  while (c.length > 1 && c[c.length - 1] === 0) c.pop();
  const degree = c.length - 1;
  if (degree < 1) return [];
  const roots: Complex[] = [];
  // Exact zero roots first (common: beta(g) = g * (...)).
  let lowest = 0;
  while (lowest < degree && c[lowest] === 0) {
    roots.push({ re: 0, im: 0 });
    lowest++;
  }
  const q = c.slice(lowest);
  const d = q.length - 1;
  if (d === 0) return roots;
  // Starting circle from the Cauchy bound, rotated off the real axis.
  const lead = Math.abs(q[d]!);
  const radius = 1 + Math.max(...q.slice(0, d).map((x) => Math.abs(x) / lead));
  const z: Complex[] = Array.from({ length: d }, (_, k) => {
    const angle = (2 * Math.PI * k) / d + 0.4;
    return { re: 0.5 * radius * Math.cos(angle), im: 0.5 * radius * Math.sin(angle) };
  });
  for (let iteration = 0; iteration < 500; iteration++) {
    let moved = 0;
    for (let i = 0; i < d; i++) {
      const [p, dp] = horner(q, z[i]!);
      if (p.re === 0 && p.im === 0) continue;
      const ratio = cDiv(p, dp);
      let sum: Complex = { re: 0, im: 0 };
      for (let j = 0; j < d; j++) if (j !== i) sum = cAdd(sum, cDiv({ re: 1, im: 0 }, cSub(z[i]!, z[j]!)));
      const correction = cDiv(ratio, cSub({ re: 1, im: 0 }, cMul(ratio, sum)));
      z[i] = cSub(z[i]!, correction);
      moved = Math.max(moved, Math.hypot(correction.re, correction.im) / (1 + Math.hypot(z[i]!.re, z[i]!.im)));
    }
    if (moved < 1e-15) break;
  }
  for (const root of z) {
    // Roots with a negligible imaginary part are real.
    const [p] = horner(q, { re: root.re, im: 0 });
    const [pc] = horner(q, root);
    const realEnough = Math.abs(root.im) <= 1e-10 * (1 + Math.abs(root.re)) || Math.abs(p.re) <= Math.hypot(pc.re, pc.im);
    roots.push(realEnough ? { re: root.re, im: 0 } : root);
  }
  return roots;
}
