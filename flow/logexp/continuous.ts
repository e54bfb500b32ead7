// Integration of an infrared flow far into the infrared, for a log-exponent check.
//
// Variables: s = ln(1 + l), so RG time 1e17 is s = 39; the couplings scaled as G = (1 + l) g,
// which tend to the constant ray l g(l) -> G* instead of decaying (the relative accuracy of g
// becomes ordinary absolute accuracy of G); I_t = int A_t dl and, for a rate observable,
// J = int (A_O - x A_t) dl, or for an integral observable Z = z / (1 + l) with z = O exp(-K),
// K = int A_R dl, dz/dl = 1 - A_R z (so d ln O / dl = 1 / z exactly). The anomalous parts
// A = rate - rate(0) come separated symbolically from the model.
//
// With |ln t0| = y_t l* + I_t(l*) (t(l*) = 1), the effective exponent at RG time l is
//   rate observable:      p_eff = (A_O - x A_t) |ln t0| / (y_t + A_t)
//   integral observable:  p_eff = |ln t0| / (z (y_t + A_t))
// both exact derivatives d ln(O t0^x) / d ln|ln t0| from the rates, no differences of samples.

import { integrate, type IntegrateOutcome, type IntegrateStats, type Jacobian, type Rhs } from '../ode';
import { compileScalar, differentiate, type ScalarFunction } from '../expr';
import { ExpressionError } from '../errors';
import type { CompiledModel } from '../model';
import type { LogExponentProblem } from './problem';
import { integralContinuation, type ExponentRun } from './run';

export interface DecadePoint {
  /** RG time (steps for a map). */
  l: number;
  pEff: number;
  xEff: number;
  /** l g(l) per coupling. */
  lg: Float64Array;
  /**
   * (1 + l) times the observable's anomalous combination (A_O - x A_t, or A_R): its far-infrared
   * limit kappa is the asymptotic slope of the exponent.
   */
  kappa: number;
}

export interface RunSettings {
  rtol: number;
  /** Integrate to RG time 10^decades. */
  decades: number;
  /** performance.now() deadline. */
  deadline: number;
  /** RG time from which to use the implicit method at once (where an earlier run switched). */
  implicitFrom?: number;
}

/** The vector field the scaled system is built on: the flow itself, or a map's interpolating flow. */
export interface FieldSource {
  field: (g: ArrayLike<number>, out: Float64Array) => void;
  /** Row-major d field / d g, or null for difference Jacobians. */
  jacobian: ((g: ArrayLike<number>, out: Float64Array) => void) | null;
}

export interface ScaledRun {
  /** (s, state) at each requested output time reached. */
  outputs: { t: number; y: Float64Array }[];
  /** The integrator's outcome, 'escaped', or 'no-decay' when the couplings do not flow to zero. */
  outcome: IntegrateOutcome | 'no-decay';
  /** s where the integration ended, and the state there. */
  sEnd: number;
  yEnd: Float64Array;
  method: string;
  switchedAtS?: number;
  switchReason?: string;
  stats: IntegrateStats;
}

/** The implicit method runs 1000 times looser than the explicit one (at most 1e-5). */
const implicitRtol = (rtol: number): number => Math.min(1e-5, Math.max(rtol, 1000 * rtol));

const gradientCache = new WeakMap<CompiledModel, Map<string, ScalarFunction[] | null>>();

/** Symbolic gradient of a rate in the couplings, compiled (null when not differentiable). */
function rateGradient(model: CompiledModel, rate: string): ScalarFunction[] | null {
  let byRate = gradientCache.get(model);
  if (!byRate) gradientCache.set(model, (byRate = new Map()));
  if (byRate.has(rate)) return byRate.get(rate)!;
  const slotNames = [...model.couplings, ...model.parameterNames];
  let fns: ScalarFunction[] | null;
  try {
    const term = model.rateTerm(rate);
    fns = model.couplings.map((c) => compileScalar(differentiate(term, c, model.declared, `flow.rates.${rate}`), slotNames));
  } catch (error) {
    if (!(error instanceof ExpressionError)) throw error;
    fns = null;
  }
  byRate.set(rate, fns);
  return fns;
}

/**
 * Integrates the scaled system [G, I_t, J or Z] from s0 (state y0) to the last output time,
 * stopping at escape of the couplings (|g| beyond a bound, located precisely).
 */
export function integrateScaled(
  problem: LogExponentProblem,
  source: FieldSource,
  s0: number,
  y0: Float64Array,
  times: number[],
  settings: RunSettings,
): ScaledRun {
  const { model, scaling, observable } = problem;
  const n = model.dimension;
  const x = problem.exactPower;
  const size = n + 2;
  const g = new Float64Array(n);
  const f = new Float64Array(n);
  const isRate = observable.kind === 'rate';
  const anomalousO = observable.anomalous;
  const anomalousT = scaling.anomalous;
  const field = source.field;

  const rhs: Rhs = (s, y, d) => {
    const L = Math.exp(s);
    for (let i = 0; i < n; i++) g[i] = y[i]! / L;
    field(g, f);
    for (let i = 0; i < n; i++) d[i] = y[i]! + L * (L * f[i]!);
    const at = anomalousT(g);
    d[n] = L * at;
    if (isRate) d[n + 1] = L * (anomalousO(g) - x * at);
    else d[n + 1] = 1 - y[n + 1]! * (1 + L * anomalousO(g));
  };

  const jacobian = analyticJacobian(problem, source, n, size);
  let startSize = 0;
  for (let i = 0; i < n; i++) startSize = Math.max(startSize, Math.abs(y0[i]! / Math.exp(s0)));
  const bound = Math.max(1e6, 1e3 * startSize);
  const escapeEvent = (s: number, y: Float64Array): number => {
    const L = Math.exp(s);
    let m = 0;
    for (let i = 0; i < n; i++) m = Math.max(m, Math.abs(y[i]! / L));
    return bound - m;
  };

  // A flow that runs to a non-zero fixed point has l g growing tenfold per decade: stop early.
  let nextProbe = Math.max(s0, Math.log(1e3));
  let previousRay = Infinity;
  let decayFailed = false;
  const onStep = (s: number, y: Float64Array): boolean => {
    if (s < nextProbe) return true;
    let ray = 0;
    for (let i = 0; i < n; i++) ray = Math.max(ray, Math.abs(y[i]!));
    if (ray > 5 * previousRay && ray > 1) {
      decayFailed = true;
      return false;
    }
    previousRay = ray;
    nextProbe = s + Math.LN10;
    return true;
  };

  // Decade by decade: each segment ends exactly on an output time (no interpolated states),
  // and carries the step size and, once it has switched, the implicit method into the next.
  const outputs: { t: number; y: Float64Array }[] = [];
  const stats = { steps: 0, accepted: 0, rejected: 0, evaluations: 0, jacobians: 0 };
  let s = s0;
  let y = y0;
  let step: number | undefined;
  let method: 'auto' | 'implicit' = 'auto';
  let methodName = '';
  let switchedAtS: number | undefined;
  let switchReason: string | undefined;
  let outcome: ScaledRun['outcome'] = 'reached';
  const sImplicit = settings.implicitFrom === undefined ? Infinity : Math.log1p(settings.implicitFrom);
  const breaks = [...times, ...(sImplicit > s0 && sImplicit < times[times.length - 1]! ? [sImplicit] : [])].sort((a, b) => a - b);
  const isOutput = new Set(times);
  for (const target of breaks) {
    if (target <= s) continue;
    if (s >= sImplicit && method === 'auto') {
      method = 'implicit';
      methodName = methodName.includes('then') ? methodName : `${methodName || 'explicit (odex)'}, then implicit (RODAS4)`;
      switchedAtS ??= s;
      switchReason ??= 'stiffness';
    }
    const result = integrate(rhs, s, y, target, {
      onStep,
      rtol: settings.rtol,
      atol: settings.rtol * 1e-3,
      // Early errors die out in the far infrared (every start flows onto the same 1/l ray), so
      // the order-4 implicit method runs at a moderate tolerance; the tolerance variation of the
      // check measures what that costs.
      implicitTolerance: { rtol: implicitRtol(settings.rtol), atol: implicitRtol(settings.rtol) * 1e-3 },
      method,
      initialStep: step,
      maxSteps: Math.max(1, 200_000 - stats.steps),
      explicitBudget: 300,
      deadline: settings.deadline,
      jacobian: jacobian ?? undefined,
      event: escapeEvent,
    });
    for (const key of Object.keys(stats) as (keyof typeof stats)[]) stats[key] += result.stats[key];
    if (!methodName || result.switchedAt !== undefined) methodName = result.method;
    if (result.switchedAt !== undefined) {
      switchedAtS = result.switchedAt;
      switchReason = result.switchReason;
      method = 'implicit';
    }
    s = result.t;
    y = result.y;
    if (result.lastStep) step = Math.abs(result.lastStep);
    if (result.outcome !== 'reached') {
      outcome = result.outcome === 'event' ? 'escaped' : decayFailed ? 'no-decay' : result.outcome;
      break;
    }
    if (isOutput.has(target)) outputs.push({ t: target, y: Float64Array.from(y) });
  }
  return { outputs, outcome, sEnd: s, yEnd: y, method: methodName, switchedAtS, switchReason, stats };
}

function analyticJacobian(problem: LogExponentProblem, source: FieldSource, n: number, size: number): Jacobian | null {
  const { model, point, scaling, observable } = problem;
  const fieldJacobian = source.jacobian;
  if (!fieldJacobian) return null;
  const gradT = rateGradient(model, scaling.name);
  const gradObs: { weight: number; fns: ScalarFunction[] }[] = [];
  if (observable.kind === 'rate') {
    const fns = rateGradient(model, observable.name);
    if (!fns) return null;
    gradObs.push({ weight: 1, fns });
  } else {
    for (const w of observable.weights) {
      const fns = rateGradient(model, w.name);
      if (!fns) return null;
      gradObs.push({ weight: w.weight, fns });
    }
  }
  if (!gradT) return null;
  const slots = Float64Array.from(point.slots);
  const g = new Float64Array(n);
  const fieldJac = new Float64Array(n * n);
  const x = problem.exactPower;
  const isRate = observable.kind === 'rate';
  return (s, y, jac) => {
    const L = Math.exp(s);
    for (let i = 0; i < n; i++) {
      g[i] = y[i]! / L;
      slots[i] = g[i]!;
    }
    fieldJacobian(g, fieldJac);
    jac.fill(0);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) jac[i * size + j] = L * fieldJac[i * n + j]!;
      jac[i * size + i]! += 1;
    }
    // d/dG_j of L A(G/L) is dA/dg_j.
    for (let j = 0; j < n; j++) {
      const dt = gradT[j]!(slots);
      let dobs = 0;
      for (const o of gradObs) dobs += o.weight * o.fns[j]!(slots);
      jac[n * size + j] = dt;
      jac[(n + 1) * size + j] = isRate ? dobs - x * dt : -y[n + 1]! * dobs;
    }
    if (!isRate) jac[(n + 1) * size + (n + 1)] = -(1 + L * observable.anomalous(g));
  };
}

/** The decade point of a continuous flow at (s, state). */
export function flowPoint(problem: LogExponentProblem, s: number, y: Float64Array): DecadePoint {
  const n = problem.model.dimension;
  const { scaling, observable } = problem;
  const x = problem.exactPower;
  const L = Math.exp(s);
  const l = Math.expm1(s);
  const g = new Float64Array(n);
  for (let i = 0; i < n; i++) g[i] = y[i]! / L;
  const at = scaling.anomalous(g);
  const lnT0 = scaling.atZero * l + y[n]!;
  const rateT = scaling.atZero + at;
  let pEff: number;
  let xEff: number;
  let kappa: number;
  if (observable.kind === 'rate') {
    const ao = observable.anomalous(g);
    pEff = ((ao - x * at) * lnT0) / rateT;
    xEff = (observable.atZero + ao) / rateT;
    kappa = L * (ao - x * at);
  } else {
    const z = L * y[n + 1]!;
    pEff = lnT0 / (z * rateT);
    xEff = 1 / (z * rateT);
    kappa = L * observable.anomalous(g);
  }
  return { l, pEff, xEff, lg: Float64Array.from(g, (v) => v * l), kappa };
}

/** Output times s = ln(1 + 10^k) for the decades k = from..to. */
export function decadeTimes(from: number, to: number): number[] {
  const out: number[] = [];
  for (let k = from; k <= to; k++) out.push(Math.log1p(10 ** k));
  return out;
}

/** One run of a continuous flow from `start` to RG time 10^decades. */
export function runContinuous(problem: LogExponentProblem, start: Float64Array, settings: RunSettings): ExponentRun {
  const { model, point } = problem;
  const n = model.dimension;
  const source: FieldSource = { field: point.field, jacobian: model.jacobianMethod === 'symbolic' ? point.fieldJacobian : null };
  const y0 = new Float64Array(n + 2);
  y0.set(start);
  const run = integrateScaled(problem, source, 0, y0, decadeTimes(1, settings.decades), settings);
  const points = run.outputs.map((o) => flowPoint(problem, o.t, o.y));
  const LEnd = Math.exp(run.sEnd);
  const gEnd = Float64Array.from(run.yEnd.subarray(0, n), (v) => v / LEnd);
  const end = flowPoint(problem, run.sEnd, run.yEnd);
  const result: ExponentRun = {
    points,
    fitForm: 'first-order',
    outcome: run.outcome,
    lastL: Math.expm1(run.sEnd),
    gEnd,
    method: run.method,
    switchedAtL: run.switchedAtS === undefined ? undefined : Math.expm1(run.switchedAtS),
    switchReason: run.switchReason,
    stats: run.stats,
    asymptoticP: end.kappa,
    notes: [],
  };
  if (problem.observable.kind === 'integral' && run.outcome === 'reached') {
    const cont = integralContinuation(end.kappa, run.sEnd, run.yEnd[n + 1]!, settings.decades, end.lg);
    result.asymptoticP = cont.asymptoticP;
    result.continuation = cont.continuation;
  }
  return result;
}
