// Pieces both methods share: the settings after defaults, the error norm and the starting step.

import type { Jacobian, Rhs, IntegrateStats } from './types';
import type { StepMonitor } from './monitor';

export const UNIT_ROUNDOFF = 2.220446049250313e-16;

export interface DriverContext {
  n: number;
  rtol: Float64Array;
  atol: Float64Array;
  /** Bound on stats.steps over the whole integration. */
  maxSteps: number;
  hInit: number;
  hMax: number;
  jacobian?: Jacobian;
  monitor: StepMonitor;
  stats: IntegrateStats;
  /** Size of the last accepted step (signed), updated by the methods. */
  lastStep: number;
}

/** Root-mean-square of v_i / (atol_i + rtol_i max(|a_i|, |b_i|)). */
export function errorNorm(
  v: Float64Array,
  a: Float64Array,
  b: Float64Array,
  rtol: Float64Array,
  atol: Float64Array,
): number {
  const n = v.length;
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const sc = atol[i] + rtol[i] * Math.max(Math.abs(a[i]), Math.abs(b[i]));
    const q = v[i] / sc;
    sum += q * q;
  }
  return Math.sqrt(sum / n);
}

/**
 * Starting step from the size of y, f and an estimate of f's variation (the usual estimate for
 * a method of the given order, Hairer, Norsett and Wanner, vol. I, sec. II.4).
 */
export function startingStep(
  f: Rhs,
  t0: number,
  y0: Float64Array,
  f0: Float64Array,
  t1: number,
  order: number,
  ctx: DriverContext,
): number {
  const n = ctx.n;
  const span = Math.abs(t1 - t0);
  const dir = t1 >= t0 ? 1 : -1;
  const scaled = (v: Float64Array): number => errorNorm(v, y0, y0, ctx.rtol, ctx.atol);
  const dy = scaled(f0);
  const dyy = scaled(y0);
  let h0 = dyy < 1e-5 || dy < 1e-5 ? 1e-6 : (0.01 * dyy) / dy;
  h0 = Math.min(h0, span);
  const y1 = new Float64Array(n);
  for (let i = 0; i < n; i++) y1[i] = y0[i] + dir * h0 * f0[i];
  const f1 = new Float64Array(n);
  f(t0 + dir * h0, y1, f1);
  ctx.stats.evaluations++;
  for (let i = 0; i < n; i++) f1[i] -= f0[i];
  const d2 = scaled(f1) / h0;
  const m = Math.max(dy, d2);
  const h1 = !Number.isFinite(m) ? h0 * 1e-3 : m <= 1e-15 ? Math.max(1e-6, h0 * 1e-3) : Math.pow(0.01 / m, 1 / (order + 1));
  let h = Math.min(100 * h0, h1, span, ctx.hMax);
  if (!(h > 0) || !Number.isFinite(h)) h = Math.min(1e-6, span);
  return h;
}

/**
 * Central-difference Jacobian, row-major. A Rosenbrock method keeps its order only with an
 * accurate Jacobian (an error dJ costs a local error of order h^2 dJ), so the increment is
 * u^(1/3) times each component's own scale max(|y_j|, atol_j / rtol_j): second-order truncation
 * and a rounding error near u^(2/3) rather than the u^(1/2) of forward differences.
 */
export function differenceJacobian(
  f: Rhs,
  t: number,
  y: Float64Array,
  _f0: Float64Array,
  jac: Float64Array,
  work: Float64Array,
  stats: IntegrateStats,
  rtol: Float64Array,
  atol: Float64Array,
): void {
  const n = y.length;
  const cubeRoot = Math.cbrt(UNIT_ROUNDOFF);
  const back = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const saved = y[j];
    const scale = Math.max(Math.abs(saved), atol[j] / Math.max(rtol[j], UNIT_ROUNDOFF));
    const delta = cubeRoot * (scale > 0 ? scale : 1e-5);
    y[j] = saved + delta;
    const up = y[j];
    f(t, y, work);
    y[j] = saved - delta;
    const down = y[j];
    f(t, y, back);
    stats.evaluations += 2;
    y[j] = saved;
    const step = up - down; // the increment actually represented
    for (let i = 0; i < n; i++) jac[i * n + j] = (work[i] - back[i]) / step;
  }
}
