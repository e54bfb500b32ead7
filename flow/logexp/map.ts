// The log-exponent check on a discrete RG map g_{j+1} = F(g_j), RG time counted in steps:
// ln t_{j+1} - ln t_j = rate_t(g_j), so |ln t0| = y_t j* + sum_{i<j*} A_t(g_i), and the
// effective exponent at step j is the exact discrete log-derivative
//   p_eff(j) = (A_O - x A_t)(g_j) / ln(1 + (y_t + A_t(g_j)) / |ln t0|(j)).
//
// The map is iterated step by step until the coupling is small. Beyond that, for one coupling,
// the far infrared is reached honestly through the map's interpolating flow: the vector field V
// whose time-one map is F (a formal series from F's Taylor coefficients, truncated at order 10
// where g^11 is far below rounding), with the sums over steps turned into integrals along V by
// the Euler–Maclaurin boundary terms. Maps of several couplings are iterated to 1e5 steps and
// extrapolated with the second-order correction form.

import { integrateScaled, decadeTimes, type DecadePoint, type RunSettings } from './continuous';
import { integralContinuation, type ExponentRun } from './run';
import { evaluate, eulerMaclaurinBoundary, interpolatingField, derivative, type Series } from './series';
import type { LogExponentProblem } from './problem';
import { ExpressionError } from '../errors';
import { SeriesUnavailable, taylorSeries } from './jets';

const SERIES_ORDER = 10;
/** Steps iterated before the interpolating flow takes over (and the coupling size it needs). */
const DIRECT_STEPS = 1000;
const SMALL_COUPLING = 2e-3;
const MAX_DIRECT_STEPS = 100_000;

interface MapState {
  j: number;
  g: Float64Array;
  /** sum_{i<j} A_t(g_i) */
  it: number;
  /** sum_{i<j} (A_O - x A_t)(g_i), or for an integral observable z_j = O_j exp(-K_j). */
  obs: number;
}

function discretePoint(problem: LogExponentProblem, state: MapState): DecadePoint {
  const { scaling, observable } = problem;
  const x = problem.exactPower;
  const { j, g } = state;
  const at = scaling.anomalous(g);
  const lnT0 = scaling.atZero * j + state.it;
  const stepT = Math.log1p((scaling.atZero + at) / lnT0);
  let pEff: number;
  let xEff: number;
  let kappa: number;
  if (observable.kind === 'rate') {
    const ao = observable.anomalous(g);
    pEff = (ao - x * at) / stepT;
    xEff = (observable.atZero + ao) / (scaling.atZero + at);
    kappa = (j + 1) * (ao - x * at);
  } else {
    const stepO = Math.log1p(1 / state.obs);
    pEff = stepO / stepT;
    xEff = stepO / (scaling.atZero + at);
    kappa = (j + 1) * observable.anomalous(g);
  }
  return { l: j, pEff, xEff, lg: Float64Array.from(g, (v) => v * j), kappa };
}

/** One step of the map with the sums. */
function advance(problem: LogExponentProblem, state: MapState, next: Float64Array): void {
  const { scaling, observable, point } = problem;
  const at = scaling.anomalous(state.g);
  state.it += at;
  if (observable.kind === 'rate') state.obs += observable.anomalous(state.g) - problem.exactPower * at;
  else state.obs = (state.obs + 1) * Math.exp(-observable.anomalous(state.g));
  point.step(state.g, next);
  state.g.set(next);
  state.j += 1;
}

/** Taylor coefficients at zero coupling of the map's displacement F(g) - g or of a rate. */
function seriesOf(problem: LogExponentProblem, target: { field: true } | { rate: string }): Series {
  const { model, point } = problem;
  const term = 'field' in target ? model.fieldTerms[0]! : model.rateTerm(target.rate);
  return taylorSeries(term, model.couplings[0]!, point.parameters, SERIES_ORDER);
}

export function runMap(problem: LogExponentProblem, start: Float64Array, settings: RunSettings): ExponentRun {
  const n = problem.model.dimension;
  const stats = { steps: 0, accepted: 0, rejected: 0, evaluations: 0, jacobians: 0 };
  const state: MapState = { j: 0, g: Float64Array.from(start), it: 0, obs: 0 };
  const next = new Float64Array(n);
  const points: DecadePoint[] = [];
  const quarter: DecadePoint[] = [];
  const bound = Math.max(1e6, 1e3 * Math.max(...Array.from(start, Math.abs)));
  const single = n === 1;
  const maxDirect = Math.min(10 ** settings.decades, single ? MAX_DIRECT_STEPS : MAX_DIRECT_STEPS);
  let nextDecade = 10;
  let nextQuarter = 1;
  let quarterIndex = 0;
  let outcome = 'reached';
  const notes: string[] = [];
  for (;;) {
    if (state.j === nextDecade) {
      points.push(discretePoint(problem, state));
      nextDecade *= 10;
    }
    if (!single && state.j === nextQuarter) {
      quarter.push(discretePoint(problem, state));
      quarterIndex++;
      while (Math.round(10 ** (quarterIndex / 4)) <= state.j) quarterIndex++;
      nextQuarter = Math.round(10 ** (quarterIndex / 4));
    }
    if (single && state.j >= DIRECT_STEPS && Math.abs(state.g[0]!) < SMALL_COUPLING) break;
    if (state.j >= maxDirect) break;
    if ((state.j & 1023) === 0 && performance.now() > settings.deadline) {
      outcome = 'deadline';
      break;
    }
    advance(problem, state, next);
    stats.steps++;
    stats.accepted++;
    stats.evaluations += 3;
    let size = 0;
    for (let i = 0; i < n; i++) size = Math.max(size, Math.abs(state.g[i]!));
    if (!Number.isFinite(size)) {
      outcome = 'non-finite';
      break;
    }
    if (size > bound) {
      outcome = 'escaped';
      break;
    }
  }
  const direct = `iterated ${state.j} steps`;
  if (outcome !== 'reached' || !single || state.j >= 10 ** settings.decades) {
    notes.push(direct);
    const finalPoint = discretePoint(problem, state);
    const asymptoticP = single || outcome !== 'reached' ? finalPoint.kappa : Number.NaN;
    return {
      points,
      fitPoints: single ? undefined : quarter,
      fitForm: single ? 'first-order' : 'second-order',
      outcome,
      lastL: state.j,
      gEnd: Float64Array.from(state.g),
      method: 'map iteration',
      stats,
      asymptoticP: single ? asymptoticP : Number.NaN,
      notes,
    };
  }
  return continueByInterpolatingFlow(problem, state, points, stats, settings, notes, direct);
}

function continueByInterpolatingFlow(
  problem: LogExponentProblem,
  state: MapState,
  points: DecadePoint[],
  stats: ExponentRun['stats'],
  settings: RunSettings,
  notes: string[],
  direct: string,
): ExponentRun {
  let v: Series;
  let rt: Series;
  let ro: Series;
  try {
    const displacement = seriesOf(problem, { field: true });
    if (Math.abs(displacement[1]!) > 1e-12) throw new SeriesUnavailable('the map is not marginal at zero coupling');
    v = interpolatingField(displacement);
    rt = seriesOf(problem, { rate: problem.scaling.name });
    rt[0] = 0;
    const obs = problem.observable;
    if (obs.kind === 'rate') {
      const o = seriesOf(problem, { rate: obs.name });
      ro = Float64Array.from(o, (c, i) => (i === 0 ? 0 : c - problem.exactPower * rt[i]!));
    } else {
      ro = new Float64Array(SERIES_ORDER + 1);
      for (const w of obs.weights) {
        const o = seriesOf(problem, { rate: w.name });
        for (let i = 1; i <= SERIES_ORDER; i++) ro[i]! += w.weight * o[i]!;
      }
    }
  } catch (error) {
    if (!(error instanceof SeriesUnavailable || error instanceof ExpressionError)) throw error;
    notes.push(`${direct}; no interpolating flow (${error.message})`);
    return {
      points,
      fitForm: 'first-order',
      outcome: 'reached',
      lastL: state.j,
      gEnd: Float64Array.from(state.g),
      method: 'map iteration',
      stats,
      asymptoticP: discretePoint(problem, state).kappa,
      notes,
    };
  }
  const vPrime = derivative(v);
  const eT = eulerMaclaurinBoundary(v, rt);
  const eO = problem.observable.kind === 'rate' ? eulerMaclaurinBoundary(v, ro) : null;
  const source = {
    field: (g: ArrayLike<number>, out: Float64Array) => void (out[0] = evaluate(v, g[0]!)),
    jacobian: (g: ArrayLike<number>, out: Float64Array) => void (out[0] = evaluate(vPrime, g[0]!)),
  };
  const j0 = state.j;
  const g0 = state.g[0]!;
  const s0 = Math.log1p(j0);
  const y0 = Float64Array.of((1 + j0) * g0, state.it - evaluate(eT, g0), eO ? state.obs - evaluate(eO, g0) : state.obs / (1 + j0));
  const firstDecade = Math.floor(Math.log10(j0)) + 1;
  const times = decadeTimes(firstDecade, settings.decades);
  const run = integrateScaled(problem, source, s0, y0, times, settings);
  for (const o of run.outputs) {
    const j = Math.expm1(o.t);
    const g = o.y[0]! / (1 + j);
    const st: MapState = {
      j,
      g: Float64Array.of(g),
      it: o.y[1]! + evaluate(eT, g),
      obs: eO ? o.y[2]! + evaluate(eO, g) : (1 + j) * o.y[2]!,
    };
    points.push(discretePoint(problem, st));
  }
  const L = Math.exp(run.sEnd);
  const gEnd = run.yEnd[0]! / L;
  const kappa = L * evaluateAnomalous(problem, gEnd);
  notes.push(`${direct}, then the interpolating flow (order ${SERIES_ORDER}) to 1e${settings.decades} steps`);
  const base: ExponentRun = {
    points,
    fitForm: 'first-order',
    outcome: run.outcome,
    lastL: Math.expm1(run.sEnd),
    gEnd: Float64Array.of(gEnd),
    method: `map iteration, then ${run.method} on the interpolating flow`,
    switchedAtL: run.switchedAtS === undefined ? undefined : Math.expm1(run.switchedAtS),
    switchReason: run.switchReason,
    stats: {
      steps: stats.steps + run.stats.steps,
      accepted: stats.accepted + run.stats.accepted,
      rejected: run.stats.rejected,
      evaluations: stats.evaluations + run.stats.evaluations,
      jacobians: run.stats.jacobians,
    },
    asymptoticP: kappa,
    notes,
  };
  if (problem.observable.kind === 'integral' && run.outcome === 'reached') {
    const lastLg = points[points.length - 1]?.lg ?? Float64Array.of(gEnd * (L - 1));
    const cont = integralContinuation(kappa, run.sEnd, run.yEnd[2]!, settings.decades, lastLg);
    base.asymptoticP = cont.asymptoticP;
    base.continuation = cont.continuation;
  }
  return base;
}

function evaluateAnomalous(problem: LogExponentProblem, g: number): number {
  const obs = problem.observable;
  const arg = Float64Array.of(g);
  return obs.kind === 'rate' ? obs.anomalous(arg) - problem.exactPower * problem.scaling.anomalous(arg) : obs.anomalous(arg);
}
