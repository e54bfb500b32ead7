// The explicit method: odex (Gragg–Bulirsch–Stoer extrapolation), wrapped so that it reports
// blow-ups, honours the deadline and can hand over to the implicit method when the flow turns
// out to be stiff. odex itself only ever says Converged, MaxStepsExceeded or EarlyReturn, and a
// NaN inside it silently burns the step budget, so the right-hand side wrapper leaves odex by
// throwing as soon as a value is not finite.

import { Outcome, Solver } from '#odex';
import { AbortIntegration, allFinite, type Advance, type Stop } from './monitor';
import { differenceJacobian, type DriverContext } from './common';
import type { Rhs } from './types';

export type SwitchReason = 'stiffness' | 'step budget' | 'non-finite trial step';

export type ExplicitEnd = Stop | { outcome: 'switch'; reason: SwitchReason; t: number; y: Float64Array };

/** Accepted steps before stiffness is first probed, and the probe interval. */
const PROBE_START = 10;
const PROBE_EVERY = 5;
/**
 * h |lambda| above this for a dominant real negative eigenvalue, on consecutive probes, means
 * the step is held by the explicit method's stability bound rather than by accuracy.
 */
const STIFF_PRODUCT = 1;
/** ... and that eigenvalue must be this many times faster than the solution itself changes. */
const STIFF_RATIO = 20;
const STIFF_HITS = 3;

function makeSolver(ctx: DriverContext, maxSteps: number, dense = false): Solver {
  const solver = new Solver(ctx.n);
  solver.absoluteTolerance = Array.from(ctx.atol);
  solver.relativeTolerance = Array.from(ctx.rtol);
  solver.maxSteps = Math.max(1, maxSteps);
  solver.initialStepSize = ctx.hInit;
  if (Number.isFinite(ctx.hMax)) solver.maxStepSize = ctx.hMax;
  solver.denseOutput = dense;
  return solver;
}

export function integrateExplicit(
  f: Rhs,
  t0: number,
  y0: Float64Array,
  t1: number,
  ctx: DriverContext,
  switchable: boolean,
  explicitBudget: number,
  wantsDense: boolean,
): ExplicitEnd {
  const { n, stats, monitor } = ctx;
  const yBuffer = new Float64Array(n);
  const dBuffer = new Float64Array(n);
  // odex copies the returned values at once, so one array serves every call.
  const out = new Array<number>(n).fill(0);
  const wrapped = (x: number, y: number[]): number[] => {
    for (let i = 0; i < n; i++) yBuffer[i] = y[i]!;
    f(x, yBuffer, dBuffer);
    stats.evaluations++;
    if (!allFinite(dBuffer)) throw new AbortIntegration('non-finite');
    if ((stats.evaluations & 255) === 0 && monitor.pastDeadline()) throw new AbortIntegration('deadline');
    for (let i = 0; i < n; i++) out[i] = dBuffer[i]!;
    return out;
  };

  // Re-integration inside one accepted step, for locating an event.
  const advance: Advance = (tS, yS, tt) => {
    try {
      const sub = makeSolver(ctx, 1000);
      const r = sub.solve(wrapped, tS, Array.from(yS), tt);
      stats.steps += r.nStep;
      if (r.outcome !== Outcome.Converged) return null;
      return Float64Array.from(r.y);
    } catch (e) {
      if (e instanceof AbortIntegration) return null;
      throw e;
    }
  };

  let lastT = t0;
  let lastY = Float64Array.from(y0);
  let end = null as ExplicitEnd | null;
  let accepted = 0;
  let stiffHits = 0;
  const jac = new Float64Array(n * n);
  const f0 = new Float64Array(n);
  const work = new Float64Array(n);

  let probe = new Float64Array(n).fill(1 / Math.sqrt(n));
  const image = new Float64Array(n);

  /**
   * The dominant eigenvalue of df/dy by power iteration on the Jacobian scaled by the error
   * weights (a similarity transform, so the eigenvalues are those of df/dy). Returns it only when
   * the iteration settles on a real eigenvalue; a dominant complex pair (an oscillation) is not
   * stiffness and gives null.
   */
  const dominantRealEigenvalue = (x: number, y: Float64Array): number | null => {
    f(x, y, f0);
    stats.evaluations++;
    if (ctx.jacobian) ctx.jacobian(x, y, jac);
    else differenceJacobian(f, x, y, f0, jac, work, stats, ctx.rtol, ctx.atol);
    stats.jacobians++;
    for (let i = 0; i < n; i++) work[i] = ctx.atol[i] + ctx.rtol[i] * Math.abs(y[i]);
    let lambda = 0;
    let residual = Infinity;
    for (let iter = 0; iter < 16; iter++) {
      for (let i = 0; i < n; i++) {
        let s = 0;
        for (let j = 0; j < n; j++) s += jac[i * n + j] * work[j] * probe[j];
        image[i] = s / work[i];
      }
      let dot = 0;
      let norm = 0;
      for (let i = 0; i < n; i++) {
        dot += probe[i] * image[i];
        norm += image[i] * image[i];
      }
      norm = Math.sqrt(norm);
      if (!(norm > 0) || !Number.isFinite(norm)) return null;
      lambda = dot;
      let r = 0;
      for (let i = 0; i < n; i++) r += (image[i] - lambda * probe[i]) ** 2;
      residual = Math.sqrt(r) / Math.max(Math.abs(lambda), 1e-300);
      for (let i = 0; i < n; i++) probe[i] = image[i] / norm;
    }
    if (!allFinite(probe)) probe = new Float64Array(n).fill(1 / Math.sqrt(n));
    return residual < 0.05 ? lambda : null;
  };

  /** How fast the solution changes, |f| / |y| in the error weights (f0 holds f at the probe). */
  const solutionRate = (y: Float64Array): number => {
    let fs = 0;
    let ys = 0;
    for (let i = 0; i < n; i++) {
      const w = ctx.atol[i] + ctx.rtol[i] * Math.abs(y[i]);
      fs += (f0[i] / w) ** 2;
      ys += (y[i] / w) ** 2;
    }
    return ys > 0 ? Math.sqrt(fs / ys) : Infinity;
  };

  const observer = (
    nr: number,
    xOld: number,
    x: number,
    y: number[],
    dense?: (component: number, x: number) => number,
  ): boolean | void => {
    if (nr === 1) return;
    const yNew = Float64Array.from(y);
    const interpolate = dense
      ? (tt: number): Float64Array => {
          const out = new Float64Array(n);
          for (let i = 0; i < n; i++) out[i] = dense(i, tt);
          return out;
        }
      : undefined;
    const stop = monitor.check(lastT, lastY, x, yNew, advance, interpolate);
    if (stop) {
      end = stop;
      return false;
    }
    lastT = x;
    lastY = yNew;
    ctx.lastStep = x - xOld;
    accepted++;
    if (switchable && accepted >= PROBE_START && accepted % PROBE_EVERY === 0) {
      const h = Math.abs(x - xOld);
      const lambda = dominantRealEigenvalue(x, Float64Array.from(yNew));
      const held = lambda !== null && lambda < 0 && h * -lambda > STIFF_PRODUCT;
      stiffHits = held && -lambda > STIFF_RATIO * solutionRate(yNew) ? stiffHits + 1 : 0;
      if (stiffHits >= STIFF_HITS) {
        end = { outcome: 'switch', reason: 'stiffness', t: lastT, y: lastY };
        return false;
      }
    }
  };

  const remaining = ctx.maxSteps - stats.steps;
  const budget = switchable ? Math.min(remaining, explicitBudget) : remaining;
  const solver = makeSolver(ctx, budget, wantsDense);
  let outcome: Outcome;
  try {
    const r = solver.solve(wrapped, t0, Array.from(y0), t1, observer);
    stats.steps += r.nStep;
    stats.rejected += r.nReject;
    stats.accepted += r.nAccept;
    outcome = r.outcome;
    if (outcome === Outcome.Converged) {
      const y = Float64Array.from(r.y);
      if (!allFinite(y)) return { outcome: 'non-finite', t: lastT, y: lastY };
      return { outcome: 'reached', t: t1, y };
    }
  } catch (e) {
    if (!(e instanceof AbortIntegration)) throw e;
    stats.steps += accepted;
    stats.accepted += accepted;
    if (e.reason === 'deadline') return { outcome: 'deadline', t: lastT, y: lastY };
    if (switchable) return { outcome: 'switch', reason: 'non-finite trial step', t: lastT, y: lastY };
    return { outcome: 'non-finite', t: lastT, y: lastY };
  }
  if (end) return end;
  // MaxStepsExceeded: either the whole budget is gone or the explicit share of it.
  if (switchable && stats.steps < ctx.maxSteps) return { outcome: 'switch', reason: 'step budget', t: lastT, y: lastY };
  return { outcome: 'max-steps', t: lastT, y: lastY };
}
