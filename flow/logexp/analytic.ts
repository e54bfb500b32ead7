// The analytic leading order, from the Taylor coefficients of the flow and the rates at zero
// couplings. Along the marginal direction v (L v = 0 for the linearised flow L, with left null
// vector u, u.v = 1) the reduced flow is d xi/dl = -b xi^2 with b = -u.B(v,v)/2 (B the Hessian of
// the field at zero), so l g(l) -> G* = v / b, and each anomalous part A(g) = grad A . g + ...
// gives the exponent grad(A_O - x A_t) . G*; with one coupling this is the rule
// p = (y_O c_t / y_t - c_O) / b (common practice). When every coupling is marginal (L = 0) the
// flow approaches zero along a ray G* with G* + B(G*, G*)/2 = 0, found by Newton from where the
// integrated flow points.

import { compileScalar, differentiate } from '../expr';
import { ExpressionError } from '../errors';
import type { LogExponentProblem } from './problem';

export interface MarginalStructure {
  /** 'single': one marginal direction (others not marginal); 'all': every coupling marginal. */
  kind: 'single' | 'all' | 'none';
  /** Linearised flow at zero couplings, row-major. */
  linear: Float64Array;
  /** The field at zero couplings (must vanish). */
  atZero: Float64Array;
  /** Marginal direction and its dual (kind 'single'). */
  v?: Float64Array;
  u?: Float64Array;
  /** d xi / dl = -b xi^2 along v (kind 'single', or n = 1). */
  b?: number;
  /** B(a, a) for the Hessian of the field at zero; null when it has no symbolic form. */
  hessian: ((a: Float64Array) => Float64Array) | null;
  description: string;
}

const ZERO_TOLERANCE = 1e-12;

const short = (v: number): string => Number(v.toPrecision(10)).toString();

function maxAbs(values: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < values.length; i++) m = Math.max(m, Math.abs(values[i]!));
  return m;
}

/** Hessian tensor of the field at zero couplings, symbolic; null if mathjs cannot differentiate. */
function hessianAtZero(problem: LogExponentProblem): ((a: Float64Array) => Float64Array) | null {
  const { model, point } = problem;
  const n = model.dimension;
  const slotNames = [...model.couplings, ...model.parameterNames];
  const slots = Float64Array.from(point.slots);
  slots.fill(0, 0, n);
  const h = new Float64Array(n * n * n);
  try {
    model.fieldTerms.forEach((term, i) => {
      for (let j = 0; j < n; j++) {
        const dj = differentiate(term, model.couplings[j]!, model.declared, 'flow.beta');
        for (let k = j; k < n; k++) {
          const value = compileScalar(differentiate(dj, model.couplings[k]!, model.declared, 'flow.beta'), slotNames)(slots);
          h[(i * n + j) * n + k] = value;
          h[(i * n + k) * n + j] = value;
        }
      }
    });
  } catch (error) {
    if (error instanceof ExpressionError) return null;
    throw error;
  }
  return (a) => {
    const out = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let j = 0; j < n; j++) for (let k = 0; k < n; k++) s += h[(i * n + j) * n + k]! * a[j]! * a[k]!;
      out[i] = s;
    }
    return out;
  };
}

/** A null vector of an n x n matrix of rank n - 1 (complete pivoting), or null if the rank differs. */
function nullVector(m: Float64Array, n: number, transpose: boolean): Float64Array | null {
  const a = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) a[i * n + j] = transpose ? m[j * n + i]! : m[i * n + j]!;
  const scale = maxAbs(a);
  if (scale === 0) return null;
  const cols = Array.from({ length: n }, (_, j) => j);
  let rank = 0;
  for (let k = 0; k < n; k++) {
    let bi = k;
    let bj = k;
    let best = 0;
    for (let i = k; i < n; i++) {
      for (let j = k; j < n; j++) {
        const v = Math.abs(a[i * n + j]!);
        if (v > best) {
          best = v;
          bi = i;
          bj = j;
        }
      }
    }
    if (best <= 1e-10 * scale) break;
    rank++;
    if (bi !== k) for (let j = 0; j < n; j++) [a[k * n + j], a[bi * n + j]] = [a[bi * n + j]!, a[k * n + j]!];
    if (bj !== k) {
      for (let i = 0; i < n; i++) [a[i * n + k], a[i * n + bj]] = [a[i * n + bj]!, a[i * n + k]!];
      [cols[k], cols[bj]] = [cols[bj]!, cols[k]!];
    }
    for (let i = 0; i < n; i++) {
      if (i === k) continue;
      const f = a[i * n + k]! / a[k * n + k]!;
      if (f !== 0) for (let j = k; j < n; j++) a[i * n + j]! -= f * a[k * n + j]!;
    }
  }
  if (rank !== n - 1) return null;
  // Reduced form: rows 0..n-2 have pivots in columns 0..n-2; the free column is n-1.
  const x = new Float64Array(n);
  x[n - 1] = 1;
  for (let k = 0; k < n - 1; k++) x[k] = -a[k * n + (n - 1)]! / a[k * n + k]!;
  const out = new Float64Array(n);
  for (let k = 0; k < n; k++) out[cols[k]!] = x[k]!;
  const norm = Math.hypot(...out);
  for (let k = 0; k < n; k++) out[k]! /= norm;
  return out;
}

const dot = (a: ArrayLike<number>, b: ArrayLike<number>): number => {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i]! * b[i]!;
  return s;
};

export function marginalStructure(problem: LogExponentProblem): MarginalStructure {
  const { point, model, start } = problem;
  const n = model.dimension;
  const zero = new Float64Array(n);
  const atZero = new Float64Array(n);
  const linear = new Float64Array(n * n);
  point.field(zero, atZero);
  point.fieldJacobian(zero, linear);
  const hessian = hessianAtZero(problem);
  const names = model.couplings;
  if (maxAbs(atZero) > ZERO_TOLERANCE) {
    return {
      kind: 'none',
      linear,
      atZero,
      hessian,
      description: `zero couplings are not a fixed point at the marginal dimension (the flow there is ${Array.from(atZero, (v) => v.toPrecision(6)).join(', ')})`,
    };
  }
  if (maxAbs(linear) <= ZERO_TOLERANCE) {
    if (n === 1 && hessian) {
      const b = -hessian(Float64Array.of(1))[0]! / 2;
      return { kind: 'single', linear, atZero, hessian, v: Float64Array.of(1), u: Float64Array.of(1), b, description: `d${names[0]}/dl = ${short(-b)} ${names[0]}^2 + ... at zero couplings` };
    }
    return { kind: 'all', linear, atZero, hessian, description: `every coupling (${names.join(', ')}) is marginal at zero couplings` };
  }
  const v = nullVector(linear, n, false);
  const u = nullVector(linear, n, true);
  if (!v || !u || Math.abs(dot(u, v)) < 1e-8) {
    return {
      kind: 'none',
      linear,
      atZero,
      hessian,
      description: 'the linearised flow at zero couplings has no single marginal direction (no simple zero eigenvalue)',
    };
  }
  // Orient v towards the start and normalise u.v = 1, so xi = u.g > 0 at the start.
  const uv = dot(u, v);
  for (let i = 0; i < n; i++) u[i]! /= uv;
  if (dot(u, start) < 0) for (let i = 0; i < n; i++) (v[i]! *= -1), (u[i]! *= -1);
  const b = hessian ? -dot(u, hessian(v)) / 2 : undefined;
  const direction = names.map((name, i) => `${short(v[i]!)} ${name}`).join(' + ');
  return {
    kind: 'single',
    linear,
    atZero,
    hessian,
    v,
    u,
    b,
    description: `one marginal direction at zero couplings (${direction})${b === undefined ? '' : `, d xi/dl = ${short(-b)} xi^2 + ...`}`,
  };
}

/** The ray G* = lim l g(l) of an all-marginal flow, refined by Newton from a guess. */
export function marginalRay(structure: MarginalStructure, guess: Float64Array): Float64Array | null {
  const { hessian } = structure;
  if (!hessian) return null;
  const n = guess.length;
  const g = Float64Array.from(guess);
  for (let iter = 0; iter < 50; iter++) {
    const bg = hessian(g);
    const residual = new Float64Array(n);
    for (let i = 0; i < n; i++) residual[i] = g[i]! + bg[i]! / 2;
    if (maxAbs(residual) <= 1e-15 * Math.max(1, maxAbs(g))) return g;
    // Jacobian of G + B(G,G)/2 by polarisation: B(G + h e_k, G + h e_k) is quadratic in h.
    const jac = new Float64Array(n * n);
    for (let k = 0; k < n; k++) {
      const e = new Float64Array(n);
      e[k] = 1;
      const plus = new Float64Array(n);
      const minus = new Float64Array(n);
      for (let i = 0; i < n; i++) (plus[i] = g[i]! + e[i]!), (minus[i] = g[i]! - e[i]!);
      const bp = hessian(plus);
      const bm = hessian(minus);
      for (let i = 0; i < n; i++) jac[i * n + k] = (i === k ? 1 : 0) + (bp[i]! - bm[i]!) / 4;
    }
    // Solve jac * delta = residual (small dense, partial pivoting).
    const delta = solveSmall(jac, residual, n);
    if (!delta) return null;
    for (let i = 0; i < n; i++) g[i]! -= delta[i]!;
  }
  return null;
}

function solveSmall(a0: Float64Array, b0: Float64Array, n: number): Float64Array | null {
  const a = Float64Array.from(a0);
  const b = Float64Array.from(b0);
  for (let k = 0; k < n; k++) {
    let p = k;
    for (let i = k + 1; i < n; i++) if (Math.abs(a[i * n + k]!) > Math.abs(a[p * n + k]!)) p = i;
    if (a[p * n + k] === 0) return null;
    if (p !== k) {
      for (let j = 0; j < n; j++) [a[k * n + j], a[p * n + j]] = [a[p * n + j]!, a[k * n + j]!];
      [b[k], b[p]] = [b[p]!, b[k]!];
    }
    for (let i = k + 1; i < n; i++) {
      const f = a[i * n + k]! / a[k * n + k]!;
      for (let j = k; j < n; j++) a[i * n + j]! -= f * a[k * n + j]!;
      b[i]! -= f * b[k]!;
    }
  }
  const x = new Float64Array(n);
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i]!;
    for (let j = i + 1; j < n; j++) s -= a[i * n + j]! * x[j]!;
    x[i] = s / a[i * n + i]!;
  }
  return x;
}

/** Gradient at zero couplings of the anomalous part of a rate (Taylor coefficients of the model). */
export function rateGradientAtZero(problem: LogExponentProblem, rate: string): Float64Array {
  const { point, model } = problem;
  return Float64Array.from(model.couplings, (c) => point.taylor({ rate }, c, 1)[1]!);
}

export interface LeadingOrder {
  /** l g(l) -> G*. */
  ray: Float64Array;
  /** b along the marginal direction (single) or null (all marginal). */
  b: number | null;
  p: number;
  x: number;
  /** kappa_r = grad A_r(0) . G* per rate: l A_r(g(l)) in the far infrared (kappa = -c / b for one coupling). */
  slopes: Record<string, number>;
}

/** Exponents at leading order for a ray G*. */
export function leadingOrder(problem: LogExponentProblem, ray: Float64Array, b: number | null): LeadingOrder {
  const scalingGrad = rateGradientAtZero(problem, problem.scaling.name);
  const kappaT = dot(scalingGrad, ray);
  const slopes: Record<string, number> = { [problem.scaling.name]: kappaT };
  let p: number;
  const obs = problem.observable;
  if (obs.kind === 'rate') {
    const kappaO = dot(rateGradientAtZero(problem, obs.name), ray);
    slopes[obs.name] = kappaO;
    p = kappaO - problem.exactPower * kappaT;
  } else {
    let kappaR = 0;
    for (const w of obs.weights) {
      const k = dot(rateGradientAtZero(problem, w.name), ray);
      slopes[w.name] = k;
      kappaR += w.weight * k;
    }
    // O = int^l exp(kappaR ln l') dl' ~ l^(1 + kappaR) when 1 + kappaR > 0, else it stays finite.
    p = Math.max(0, 1 + kappaR);
  }
  return { ray, b, p, x: problem.exactPower, slopes };
}
