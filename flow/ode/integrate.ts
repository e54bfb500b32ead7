// integrate(): one entry for both methods. 'auto' starts with the explicit extrapolation method
// (cheap and very accurate on smooth non-stiff flows) and hands the rest of the interval to the
// implicit Rosenbrock method as soon as the step is held by stability rather than accuracy, the
// explicit step budget is spent, or an explicit trial step produced non-finite values.

import { integrateExplicit } from './explicit';
import { integrateImplicit } from './rosenbrock';
import { StepMonitor } from './monitor';
import { startingStep, type DriverContext } from './common';
import {
  EXPLICIT_NAME,
  IMPLICIT_NAME,
  type IntegrateOptions,
  type IntegrateResult,
  type Rhs,
  type Tolerance,
} from './types';

const DEFAULT_RTOL = 1e-8;
const DEFAULT_ATOL = 1e-10;
const DEFAULT_MAX_STEPS = 100_000;
const DEFAULT_EXPLICIT_BUDGET = 2000;

function expandTolerance(tol: Tolerance | undefined, fallback: number, n: number, name: string): Float64Array {
  const out = new Float64Array(n);
  if (tol === undefined || typeof tol === 'number') {
    const v = tol ?? fallback;
    if (!(v >= 0) || !Number.isFinite(v)) throw new RangeError(`integrate: ${name} must be a finite number >= 0, got ${v}`);
    out.fill(v);
    return out;
  }
  if (tol.length !== n) throw new RangeError(`integrate: ${name} has ${tol.length} entries for ${n} components`);
  for (let i = 0; i < n; i++) {
    const v = tol[i];
    if (!(v >= 0) || !Number.isFinite(v)) throw new RangeError(`integrate: ${name}[${i}] must be a finite number >= 0, got ${v}`);
    out[i] = v;
  }
  return out;
}

/**
 * Integrates y' = f(t, y) from t0 to t1 (either direction). Never throws for a flow that blows
 * up, turns NaN, or runs out of steps or time: the outcome says which, with the last good point.
 * Throws RangeError only for arguments that are not numbers of the right shape.
 */
export function integrate(f: Rhs, t0: number, y0: ArrayLike<number>, t1: number, options: IntegrateOptions = {}): IntegrateResult {
  if (!Number.isFinite(t0) || !Number.isFinite(t1)) {
    throw new RangeError(`integrate: the interval [${t0}, ${t1}] must have finite ends`);
  }
  const n = y0.length;
  const y = Float64Array.from(y0);
  const rtol = expandTolerance(options.rtol, DEFAULT_RTOL, n, 'rtol');
  const atol = expandTolerance(options.atol, DEFAULT_ATOL, n, 'atol');
  for (let i = 0; i < n; i++) {
    if (rtol[i] === 0 && atol[i] === 0) throw new RangeError(`integrate: rtol and atol are both 0 for component ${i}`);
  }
  const stats = { steps: 0, accepted: 0, rejected: 0, evaluations: 0, jacobians: 0 };
  const method = options.method ?? 'auto';
  const monitor = new StepMonitor(options, n, t0, y, t1);
  const outputs = monitor.outputs;
  const startName = method === 'implicit' ? IMPLICIT_NAME : EXPLICIT_NAME;

  const early = monitor.initial(t0, y);
  if (early) return { ...early, method: startName, stats, outputs };
  if (t0 === t1 || n === 0) return { t: t1, y, outcome: 'reached', method: startName, stats, outputs };

  const ctx: DriverContext = {
    n,
    rtol,
    atol,
    maxSteps: Math.max(1, Math.floor(options.maxSteps ?? DEFAULT_MAX_STEPS)),
    hInit: 0,
    hMax: Math.abs(options.maxStep ?? Infinity) || Infinity,
    jacobian: options.jacobian,
    monitor,
    stats,
    lastStep: 0,
  };
  if (options.initialStep !== undefined && options.initialStep > 0) {
    ctx.hInit = options.initialStep;
  } else {
    const f0 = new Float64Array(n);
    f(t0, y, f0);
    stats.evaluations++;
    ctx.hInit = startingStep(f, t0, y, f0, t1, 4, ctx);
  }

  const implicitCtx = (): DriverContext => {
    const given = options.implicitTolerance;
    if (!given) return ctx;
    return {
      ...ctx,
      rtol: given.rtol === undefined ? rtol : expandTolerance(given.rtol, DEFAULT_RTOL, n, 'implicitTolerance.rtol'),
      atol: given.atol === undefined ? atol : expandTolerance(given.atol, DEFAULT_ATOL, n, 'implicitTolerance.atol'),
    };
  };

  if (method === 'implicit') {
    const only = implicitCtx();
    const end = integrateImplicit(f, t0, y, t1, only);
    return { ...end, method: IMPLICIT_NAME, stats, outputs, lastStep: only.lastStep };
  }
  const explicitEnd = integrateExplicit(
    f,
    t0,
    y,
    t1,
    ctx,
    method === 'auto',
    Math.max(1, options.explicitBudget ?? DEFAULT_EXPLICIT_BUDGET),
    (options.outputTimes?.length ?? 0) > 0,
  );
  if (explicitEnd.outcome !== 'switch') return { ...explicitEnd, method: EXPLICIT_NAME, stats, outputs, lastStep: ctx.lastStep };

  const tSwitch = explicitEnd.t;
  const yMid = new Float64Array(n);
  f(tSwitch, explicitEnd.y, yMid);
  stats.evaluations++;
  const second = implicitCtx();
  second.hInit = startingStep(f, tSwitch, explicitEnd.y, yMid, t1, 4, second);
  const end = integrateImplicit(f, tSwitch, explicitEnd.y, t1, second);
  return {
    ...end,
    method: `${EXPLICIT_NAME}, then ${IMPLICIT_NAME}`,
    switchedAt: tSwitch,
    switchReason: explicitEnd.reason,
    stats,
    outputs,
    lastStep: second.lastStep,
  };
}
