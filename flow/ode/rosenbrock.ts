// RODAS4: the stiffly accurate, L-stable Rosenbrock method of order 4 with an embedded order-3
// error estimate, six stages, one Jacobian and one LU factorisation per step (E. Hairer and
// G. Wanner, Solving Ordinary Differential Equations II, 2nd ed., Springer 1996, sec. IV.7).
// Stage equations, in the form with the transformed stage variables k_i:
//   (I/(h gamma) - J) k_i = f(t + alpha_i h, y + sum_j a_ij k_j) + sum_j (c_ij / h) k_j + h d_i f_t
//   y_new = y + sum_i b_i k_i, error estimate k_6.
// Step sizes follow the predictive (Gustafsson) controller of the same book.

import { luFactor, luSolve } from './linalg';
import { allFinite, type Advance, type Stop } from './monitor';
import { differenceJacobian, errorNorm, UNIT_ROUNDOFF, type DriverContext } from './common';
import type { Rhs } from './types';

const GAMMA = 0.25;
const STAGES = 6;
// Lower-triangular tables, row i lists the coefficients for j < i.
const A: readonly (readonly number[])[] = [
  [],
  [1.544],
  [0.9466785280815826, 0.2557011698983284],
  [3.314825187068521, 2.896124015972201, 0.9986419139977817],
  [1.221224509226641, 6.019134481288629, 12.53708332932087, -0.687886036105895],
  [1.221224509226641, 6.019134481288629, 12.53708332932087, -0.687886036105895, 1.0],
];
const C: readonly (readonly number[])[] = [
  [],
  [-5.6688],
  [-2.430093356833875, -0.2063599157091915],
  [-0.1073529058151375, -9.594562251023355, -20.47028614809616],
  [7.496443313967647, -10.24680431464352, -33.99990352819905, 11.7089089320616],
  [8.083246795921522, -7.981132988064893, -31.52159432874371, 16.31930543123136, -6.058818238834054],
];
const ALPHA = [0, 0.386, 0.21, 0.63, 1, 1];
const D = [0.25, -0.1043, 0.1035, -0.0362, 0, 0];
// y_new = (y + sum_{j<6} a_6j k_j) + k_6: the method is stiffly accurate.
const SAFETY = 0.9;
const GROW_MAX = 6;
const SHRINK_MAX = 0.2;

export function integrateImplicit(f: Rhs, t0: number, y0: Float64Array, t1: number, ctx: DriverContext): Stop {
  const { n, stats, monitor } = ctx;
  const dir = t1 >= t0 ? 1 : -1;
  let t = t0;
  let y = Float64Array.from(y0);
  const f0 = new Float64Array(n);
  const ft = new Float64Array(n);
  const jac = new Float64Array(n * n);
  const mat = new Float64Array(n * n);
  const pivots = new Int32Array(n);
  const k = Array.from({ length: STAGES }, () => new Float64Array(n));
  const z = new Float64Array(n);
  const fz = new Float64Array(n);
  const work = new Float64Array(n);

  const evaluate = (tt: number, yy: Float64Array, out: Float64Array): void => {
    f(tt, yy, out);
    stats.evaluations++;
  };

  /** One RODAS4 step of size h from (t, y) with the Jacobian at (t, y); returns the error norm. */
  const step = (tS: number, yS: Float64Array, h: number, out: Float64Array): number => {
    const fac = 1 / (h * GAMMA);
    for (let i = 0; i < n * n; i++) mat[i] = -jac[i];
    for (let i = 0; i < n; i++) mat[i * n + i] += fac;
    if (!luFactor(mat, n, pivots)) return NaN;
    for (let s = 0; s < STAGES; s++) {
      const ks = k[s];
      if (s === 0) {
        for (let i = 0; i < n; i++) ks[i] = f0[i] + h * D[0] * ft[i];
      } else {
        const as = A[s];
        for (let i = 0; i < n; i++) {
          let zi = yS[i];
          for (let j = 0; j < s; j++) zi += as[j] * k[j][i];
          z[i] = zi;
        }
        evaluate(tS + ALPHA[s] * h, z, fz);
        const cs = C[s];
        const ds = D[s];
        for (let i = 0; i < n; i++) {
          let r = fz[i];
          for (let j = 0; j < s; j++) r += (cs[j] / h) * k[j][i];
          if (ds !== 0) r += h * ds * ft[i];
          ks[i] = r;
        }
      }
      if (!allFinite(ks)) return Infinity;
      luSolve(mat, n, pivots, ks);
    }
    const k6 = k[STAGES - 1];
    for (let i = 0; i < n; i++) out[i] = z[i] + k6[i];
    if (!allFinite(out)) return Infinity;
    return errorNorm(k6, yS, out, ctx.rtol, ctx.atol);
  };

  const prepare = (tS: number, yS: Float64Array): void => {
    if (ctx.jacobian) ctx.jacobian(tS, yS, jac);
    else differenceJacobian(f, tS, yS, f0, jac, work, stats, ctx.rtol, ctx.atol);
    stats.jacobians++;
    const delta = Math.sqrt(UNIT_ROUNDOFF * Math.max(1e-5, Math.abs(tS)));
    evaluate(tS + delta, yS, work);
    const dt = tS + delta - tS;
    for (let i = 0; i < n; i++) ft[i] = (work[i] - f0[i]) / dt;
  };

  evaluate(t, y, f0);
  if (!allFinite(f0)) return { outcome: 'non-finite', t, y };

  let h = dir * Math.min(Math.abs(ctx.hInit), ctx.hMax, Math.abs(t1 - t0));
  let hAccepted = 0;
  let errAccepted = 0;
  let acceptedHere = 0;
  let rejectedLast = false;
  let fresh = false;
  let lastTrialNonFinite = false;
  let trial = new Float64Array(n);

  // Single steps from the start of the current step, for locating events inside it.
  const advance: Advance = (tS, yS, tt) => {
    const out = new Float64Array(n);
    const err = step(tS, yS, tt - tS, out);
    return Number.isFinite(err) ? out : null;
  };

  for (;;) {
    if ((t1 - t) * dir <= 4 * UNIT_ROUNDOFF * Math.max(Math.abs(t), Math.abs(t1))) {
      return { outcome: 'reached', t: t1, y };
    }
    if (stats.steps >= ctx.maxSteps) return { outcome: 'max-steps', t, y };
    if (monitor.pastDeadline()) return { outcome: 'deadline', t, y };
    let last = false;
    if ((t + 1.01 * h - t1) * dir >= 0) {
      h = t1 - t;
      last = true;
    }
    if (Math.abs(h) <= 10 * UNIT_ROUNDOFF * Math.max(Math.abs(t), 1e-300)) {
      // Shrinking steps that keep producing NaN or infinities mean the flow itself does.
      return { outcome: lastTrialNonFinite ? 'non-finite' : 'stalled', t, y };
    }
    if (!fresh) {
      prepare(t, y);
      fresh = true;
    }
    const err = step(t, y, h, trial);
    stats.steps++;
    lastTrialNonFinite = err === Infinity;
    if (!Number.isFinite(err)) {
      // Singular matrix or non-finite stage: a much smaller step.
      stats.rejected++;
      h *= Number.isNaN(err) ? 0.5 : 0.25;
      rejectedLast = true;
      continue;
    }
    const e = Math.max(err, 1e-10);
    let factor = Math.max(1 / GROW_MAX, Math.min(1 / SHRINK_MAX, Math.pow(e, 0.25) / SAFETY));
    if (err <= 1) {
      stats.accepted++;
      acceptedHere++;
      if (acceptedHere > 1) {
        let predictive = ((hAccepted / h) * Math.pow((e * e) / errAccepted, 0.25)) / SAFETY;
        predictive = Math.max(1 / GROW_MAX, Math.min(1 / SHRINK_MAX, predictive));
        factor = Math.max(factor, predictive);
      }
      hAccepted = h;
      errAccepted = Math.max(1e-2, e);
      const tNew = last ? t1 : t + h;
      ctx.lastStep = tNew - t;
      const stop = monitor.check(t, y, tNew, trial, advance);
      if (stop) return stop;
      const previous = y;
      y = trial;
      trial = previous;
      t = tNew;
      evaluate(t, y, f0);
      if (!allFinite(f0)) return { outcome: 'non-finite', t, y };
      fresh = false;
      if (last) return { outcome: 'reached', t: t1, y };
      let hNew = h / factor;
      if (rejectedLast) hNew = dir * Math.min(Math.abs(hNew), Math.abs(h));
      h = dir * Math.min(Math.abs(hNew), ctx.hMax);
      rejectedLast = false;
    } else {
      stats.rejected++;
      h = acceptedHere === 0 && rejectedLast ? h * 0.1 : h / factor;
      rejectedLast = true;
    }
  }
}
