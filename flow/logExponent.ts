/**
 * The log-exponent check: at the marginal dimension, an RG-integrated observable behaves as
 * O(t0) ~ t0^-x |ln t0|^p as t0 -> 0 (stopping the flow where t(l*) = 1). The flow is integrated
 * to RG time 1e17, the effective exponent is computed exactly from the rates at every decade and
 * extrapolated with the known form of its corrections, p + b/l + a ln(l)/l; an observable that is
 * an integral along the flow approaches its exponent as a power of l and is continued with the
 * flow's asymptotic form instead. The uncertainty comes from varying the start, the tolerance and
 * the window; the analytic leading order (Taylor coefficients at zero couplings) is shown beside
 * it. Discrete RG maps go through the same steps with RG time counted in steps (logexp/map.ts).
 */
import type { CompiledModel } from './model';
import type { CheckOutcome, FlowCheck, LogExponentClaim, PlotData, SanityFlag, SettingsRecord } from './types';
import { ClaimInputError } from './errors';
import { formatMeasurement as fmtMeasurement, formatNumber as fmt } from './format';
import { readProblem, type LogExponentProblem } from './logexp/problem';
import { leadingOrder, marginalRay, marginalStructure, type LeadingOrder, type MarginalStructure } from './logexp/analytic';
import { runContinuous } from './logexp/continuous';
import { runMap } from './logexp/map';
import type { ExponentRun } from './logexp/run';
import { LOG_CORRECTION_BASIS, leastSquares } from './logexp/fit';

export const LOG_EXPONENT_DEFAULT_TOLERANCE = 1e-6;

export const LOG_EXPONENT_DEFAULTS = {
  /** Relative tolerance of the integrator. */
  rtol: 1e-10,
  /** Integrate to RG time 10^decades (for maps: 10^decades steps, partly by the asymptotic flow). */
  decades: 17,
  /**
   * Decades of RG time in the extrapolation window, ending at the last decade: from 1e9 on the
   * next-order corrections (ln(l)/l)^2 are below 1e-15, so the first-order form is exact there.
   */
  window: 9,
  /** The start is varied by this factor up and down. */
  startScale: 1.5,
};
export type LogExponentSettings = typeof LOG_EXPONENT_DEFAULTS;

interface Estimate {
  p: number;
  x: number;
  fitResidual: number;
  fit?: { b: number; a: number; lFrom: number };
}

function validateSettings(s: LogExponentSettings, where: string): void {
  const rule = (ok: boolean, name: string, text: string): void => {
    if (!ok) throw new ClaimInputError(`${where}.settings.${name}`, `${where}.settings.${name}: ${text}`);
  };
  rule(s.rtol >= 1e-14 && s.rtol <= 1e-4, 'rtol', 'must lie between 1e-14 and 1e-4');
  rule(Number.isInteger(s.decades) && s.decades >= 6 && s.decades <= 30, 'decades', 'must be a whole number from 6 to 30');
  rule(Number.isInteger(s.window) && s.window >= 4 && s.window <= s.decades, 'window', 'must be a whole number from 4 to the number of decades');
  rule(s.startScale > 1 && s.startScale <= 10, 'startScale', 'must lie between 1 (exclusive) and 10');
}

/** p + b/l + a ln(l)/l, and with the next order ln(l)^2/l^2, ln(l)/l^2, 1/l^2 as well. */
const SECOND_ORDER_BASIS: readonly ((l: number) => number)[] = [
  ...LOG_CORRECTION_BASIS,
  (l) => (Math.log(l) / l) ** 2,
  (l) => Math.log(l) / (l * l),
  (l) => 1 / (l * l),
];

interface Window {
  what: string;
  from: number;
  to: number;
  form: 'first-order' | 'second-order';
}

/** The central window and its variations, in RG time. */
function windows(run: ExponentRun, window: number): Window[] {
  const pts = run.fitPoints ?? run.points;
  const last = pts[pts.length - 1]?.l ?? 1;
  if (run.fitForm === 'second-order') {
    return [
      { what: 'central', from: 100, to: last, form: 'second-order' },
      { what: 'window from step 300', from: 300, to: last, form: 'second-order' },
      { what: 'first-order form from step 1000', from: 1000, to: last, form: 'first-order' },
    ];
  }
  return [
    { what: 'central', from: last / 10 ** (window - 1) / 1.01, to: last, form: 'first-order' },
    { what: 'window shifted two decades down', from: last / 10 ** (window + 1) / 1.01, to: last / 100 * 1.01, form: 'first-order' },
    { what: 'window shortened by three decades', from: last / 10 ** (window - 4) / 1.01, to: last, form: 'first-order' },
  ];
}

/** Extrapolated exponents from the points inside a window. */
function estimate(problem: LogExponentProblem, run: ExponentRun, w: Window): Estimate | null {
  const pts = (run.fitPoints ?? run.points).filter((p) => p.l >= w.from && p.l <= w.to);
  const basis = w.form === 'second-order' ? SECOND_ORDER_BASIS : LOG_CORRECTION_BASIS;
  if (pts.length < basis.length + 1) return null;
  const ls = pts.map((p) => p.l);
  const xFit = leastSquares(ls, pts.map((p) => p.xEff), [() => 1, (l) => 1 / l]);
  if (problem.observable.kind === 'integral') {
    return { p: run.asymptoticP, x: xFit.coefficients[0]!, fitResidual: 0 };
  }
  const pFit = leastSquares(ls, pts.map((p) => p.pEff), basis);
  const [p, b, a] = pFit.coefficients as [number, number, number];
  return { p, x: xFit.coefficients[0]!, fitResidual: pFit.residual, fit: { b, a, lFrom: ls[0]! } };
}

function verdict(measured: number, uncertainty: number, claimed: number, tolerance: number): 'holds' | 'fails' | 'inconclusive' {
  const diff = Math.abs(measured - claimed);
  if (diff + uncertainty <= tolerance) return 'holds';
  if (diff - uncertainty > tolerance) return 'fails';
  return 'inconclusive';
}

const fmtTime = (l: number): string => (l >= 1e4 ? l.toExponential(2) : fmt(l, 4));

function runOnce(problem: LogExponentProblem, start: Float64Array, rtol: number, decades: number, deadline: number, implicitFrom?: number): ExponentRun {
  const settings = { rtol, decades, deadline, implicitFrom };
  return problem.model.convention === 'map' ? runMap(problem, start, settings) : runContinuous(problem, start, settings);
}

function leading(problem: LogExponentProblem, structure: MarginalStructure, run: ExponentRun | null): LeadingOrder | null {
  if (structure.kind === 'single' && structure.v && structure.b !== undefined && structure.b > 0) {
    const ray = Float64Array.from(structure.v, (v) => v / structure.b!);
    return leadingOrder(problem, ray, structure.b);
  }
  if (structure.kind === 'all' && run && run.points.length > 0) {
    const guess = run.points[run.points.length - 1]!.lg;
    const ray = marginalRay(structure, guess);
    if (ray) return leadingOrder(problem, ray, null);
  }
  return null;
}

function flags(problem: LogExponentProblem, structure: MarginalStructure, base: ExponentRun, lo: LeadingOrder | null): SanityFlag[] {
  const out: SanityFlag[] = [];
  const isMap = problem.model.convention === 'map';
  const time = isMap ? 'step' : 'RG time';
  const marginalOk = structure.kind !== 'none' && (structure.b === undefined || structure.b > 0);
  let marginalText = structure.description;
  if (structure.b !== undefined && !(structure.b > 0)) {
    marginalText += `: b = ${fmt(structure.b, 6)} makes the coupling marginally relevant${structure.b === 0 ? ' (no quadratic term)' : ''}, so it does not die off like 1/l; a flow written in the wrong convention looks like this`;
  }
  out.push({ check: 'marginality', ok: marginalOk, message: `${marginalText}${Object.keys(problem.overrides).length ? ` (at ${Object.entries(problem.overrides).map(([k, v]) => `${k} = ${v}`).join(', ')})` : ''}` });

  const reached = base.outcome === 'reached';
  out.push({
    check: 'finite',
    ok: reached,
    message: reached
      ? `no blow-up: the flow stays finite up to ${time} ${fmtTime(base.lastL)}`
      : base.outcome === 'escaped'
        ? `the flow escapes to infinity at ${time} l = ${fmtTime(base.lastL)}`
        : `the integration stopped (${base.outcome}) at ${time} l = ${fmtTime(base.lastL)}`,
  });

  const pts = base.points;
  const names = problem.couplings;
  const gEndMax = Math.max(...Array.from(base.gEnd, Math.abs));
  const gStartMax = Math.max(...Array.from(problem.start, Math.abs));
  const decays = base.outcome !== 'no-decay' && (gEndMax < 1e-3 * gStartMax || gEndMax < 1e-9);
  const blewUp = base.outcome === 'escaped' || base.outcome === 'non-finite';
  if (!blewUp && !decays) {
    out.push({
      check: 'asymptote',
      ok: false,
      message: `the couplings do not flow to zero (at ${time} ${fmtTime(base.lastL)}: ${names.map((name, i) => `${name} = ${fmt(base.gEnd[i]!, 6)}`).join(', ')}), so there is no marginal regime`,
    });
  } else if (!blewUp && pts.length >= 2) {
    const lastPt = pts[pts.length - 1]!;
    const last = lastPt.lg;
    const before = pts[pts.length - 2]!.lg;
    const scale = Math.max(...Array.from(last, Math.abs));
    const change = Math.max(...Array.from(last, (v, i) => Math.abs(v - before[i]!))) / Math.max(scale, 1e-300);
    // l g(l) approaches its limit like ln(l)/l.
    const allowed = Math.max(1e-6, (30 * Math.log(lastPt.l)) / lastPt.l);
    const settled = Number.isFinite(scale) && change < allowed;
    const shown = names.map((name, i) => `${name}: ${fmt(last[i]!, 10)}`).join(', ');
    const expected = lo ? ` (leading order ${names.map((name, i) => `${name}: ${fmt(lo.ray[i]!, 10)}`).join(', ')})` : '';
    out.push({
      check: 'asymptote',
      ok: settled,
      message: settled
        ? `l g(l) tends to a constant: ${shown} at ${time} ${fmtTime(lastPt.l)}${expected}`
        : `l g(l) has not settled by ${time} ${fmtTime(lastPt.l)} (relative change ${change.toExponential(1)} over the last decade)`,
    });
  }

  const s = base.stats;
  const switched = base.switchedAtL !== undefined ? `; switched to the implicit method at ${time} ${fmtTime(base.switchedAtL)} (${base.switchReason})` : '';
  out.push({
    check: 'solver',
    ok: reached,
    message: `${base.method}: ${s.steps} steps (${s.rejected} rejected), ${s.evaluations} evaluations, outcome ${base.outcome}${switched}`,
  });
  return out;
}

function convergencePlot(problem: LogExponentProblem, base: ExponentRun, p: number, fit: Estimate | null, lo: LeadingOrder | null): PlotData {
  const x = (l: number): number => 1 / Math.log(l);
  const series: PlotData['series'] = [
    { name: 'effective exponent', points: base.points.map((pt) => [x(pt.l), pt.pEff] as [number, number]), style: 'points' },
  ];
  if (base.continuation && base.continuation.length > 0) {
    series.push({ name: 'asymptotic continuation', points: base.continuation.map((pt) => [x(pt.l), pt.pEff] as [number, number]), style: 'points' });
  }
  if (fit?.fit) {
    const { b, a, lFrom } = fit.fit;
    const pts: [number, number][] = [];
    for (const pt of base.points) if (pt.l >= lFrom) pts.push([x(pt.l), fit.p + b / pt.l + (a * Math.log(pt.l)) / pt.l]);
    pts.push([0, fit.p]);
    series.push({ name: 'fit p + b/l + a ln(l)/l', points: pts, style: 'line' });
  }
  const first = base.points[0];
  const right = first ? x(first.l) : 0.5;
  if (lo) series.push({ name: 'analytic leading order', points: [[0, lo.p], [right, lo.p]], style: 'line' });
  series.push({ name: 'measured p', points: [[0, p]], style: 'points' });
  return {
    title: `Effective exponent of |ln t0| for ${problem.observableLabel}`,
    xLabel: problem.model.convention === 'map' ? '1 / ln(steps)' : '1 / ln(RG time)',
    yLabel: 'effective exponent p',
    series,
  };
}

function ridgePlot(problem: LogExponentProblem, base: ExponentRun, lo: LeadingOrder | null): PlotData {
  const series: PlotData['series'] = problem.couplings.map((name, i) => ({
    name: `l ${name}(l)`,
    points: base.points.map((pt) => [pt.l, pt.lg[i]!] as [number, number]),
    style: 'line' as const,
  }));
  if (lo && base.points.length > 0) {
    problem.couplings.forEach((name, i) => {
      series.push({ name: `leading order for ${name}`, points: [[base.points[0]!.l, lo.ray[i]!], [base.points[base.points.length - 1]!.l, lo.ray[i]!]], style: 'line' });
    });
  }
  return { title: 'RG time times the couplings', xLabel: problem.model.convention === 'map' ? 'steps' : 'RG time', yLabel: 'l g(l)', xScale: 'log', series };
}

export const checkLogExponent: FlowCheck<LogExponentClaim, CompiledModel> = (claim, model, ctx): CheckOutcome => {
  const problem = readProblem(claim, model, ctx.where);
  const settings = ctx.settings(LOG_EXPONENT_DEFAULTS);
  validateSettings(settings, ctx.where);
  const rtol = ctx.tight ? Math.max(1e-13, settings.rtol / 100) : settings.rtol;
  const { decades, window, startScale } = settings;
  const tolerance = claim.tolerance ?? LOG_EXPONENT_DEFAULT_TOLERANCE;
  const structure = marginalStructure(problem);
  const deadline = performance.now() + Math.max(0, ctx.remainingMs() - 5);
  const isMap = model.convention === 'map';
  let method = isMap
    ? 'discrete map; effective exponent from the rates at every decade of steps'
    : `infrared flow in s = ln(1+l) to RG time 1e${decades}; effective exponent from the rates at every decade`;
  const settingsRecord: SettingsRecord = { rtol, decades, window, startScale, tolerance, expansionParameter: problem.expansionParameter };

  const base = runOnce(problem, problem.start, rtol, decades, deadline);
  ctx.checkpoint();
  method += `; ${[...base.notes, base.method].join(', ')}`;
  method +=
    problem.observable.kind === 'integral'
      ? '; the integral observable continued with the asymptotic form of the flow'
      : base.fitForm === 'second-order'
        ? '; fit with the corrections to second order'
        : `; fit p + b/l + a ln(l)/l over the last ${window} decades`;
  const lo = leading(problem, structure, base);
  const sanity = flags(problem, structure, base, lo);
  const stats: SettingsRecord = {
    steps: base.stats.steps,
    accepted: base.stats.accepted,
    rejected: base.stats.rejected,
    evaluations: base.stats.evaluations,
    jacobians: base.stats.jacobians,
    outcome: base.outcome,
    method: base.method,
  };
  if (base.switchedAtL !== undefined) stats.switchedAt = base.switchedAtL;
  const values: Record<string, number> = {};
  if (lo) {
    values['p, analytic leading order'] = lo.p;
    if (lo.b !== null) values['b in d xi/dl = -b xi^2'] = lo.b;
  }
  values['x = y_O / y_t'] = problem.exactPower;
  const expected = claimedRecord(problem);

  const complete = base.fitForm === 'second-order' ? base.points.length >= 4 : base.points.length >= decades;
  if ((base.outcome !== 'reached' && base.outcome !== 'no-decay') || (!complete && base.outcome === 'reached')) {
    const where = `${isMap ? 'step' : 'RG time'} l = ${fmtTime(base.lastL)}`;
    const reason =
      base.outcome === 'escaped'
        ? `the flow from the start escapes to infinity at ${where}; no log correction can be measured from this start`
        : base.outcome === 'deadline'
          ? `the integration reached the time bound at ${where}`
          : base.outcome === 'reached'
            ? `the run gave only ${base.points.length} decades of RG time, too few to extrapolate`
            : `the integration stopped (${base.outcome}) at ${where}`;
    if (base.outcome === 'escaped') values['RG time of escape'] = base.lastL;
    return { status: 'inconclusive', message: reason, method, expected, tolerance, settings: settingsRecord, stats, sanity, evidence: { values } };
  }
  const notMarginal = sanity.find((f) => f.check === 'asymptote' && !f.ok);
  if (base.outcome === 'no-decay' || (notMarginal && notMarginal.message.startsWith('the couplings do not flow'))) {
    const message = notMarginal?.message ?? 'the couplings do not flow to zero, so there is no marginal regime';
    return { status: 'inconclusive', message, method, expected, tolerance, settings: settingsRecord, stats, sanity, evidence: { values, plots: [ridgePlot(problem, base, lo)] } };
  }

  const [centralWindow, ...otherWindows] = windows(base, window);
  const central = estimate(problem, base, centralWindow!);
  if (!central) throw new ClaimInputError(`${ctx.where}.settings.window`, `${ctx.where}.settings.window: too few decades in the window for the fit`);
  // Variations: the window (shifted down, shortened), the start (scaled down and up), the tolerance.
  const estimates: { what: string; est: Estimate }[] = [];
  for (const w of otherWindows) {
    const est = estimate(problem, base, w);
    if (est) estimates.push({ what: w.what, est });
  }
  const skipped: string[] = [];
  let runs = 1;
  let evaluations = base.stats.evaluations;
  const variations: [string, Float64Array, number][] = [
    [`start divided by ${startScale}`, problem.start.map((v) => v / startScale), rtol],
    [`start times ${startScale}`, problem.start.map((v) => v * startScale), rtol],
    [`tolerance ${Math.min(1e-4, rtol * 100).toExponential(0)}`, problem.start, Math.min(1e-4, rtol * 100)],
  ];
  for (const [what, start, tol] of variations) {
    ctx.checkpoint();
    // A flow that proved stiff in the first run is handed to the implicit method where it switched.
    const run = runOnce(problem, start, tol, decades, deadline, base.switchedAtL);
    runs++;
    evaluations += run.stats.evaluations;
    const est = run.outcome === 'reached' && run.points.length === base.points.length ? estimate(problem, run, centralWindow!) : null;
    if (est) estimates.push({ what, est });
    else skipped.push(`${what} (${run.outcome} at ${isMap ? 'step' : 'RG time'} ${fmtTime(run.lastL)})`);
  }
  stats.runs = runs;
  stats.totalEvaluations = evaluations;

  const p = central.p;
  const x = central.x;
  const floorP = 1e-13 + 1e-14 * Math.abs(p);
  let spreadP = 0;
  let spreadX = 0;
  for (const { est } of estimates) {
    spreadP = Math.max(spreadP, Math.abs(est.p - p));
    spreadX = Math.max(spreadX, Math.abs(est.x - x));
  }
  const asymptoticGap = Number.isNaN(base.asymptoticP) ? 0 : Math.abs(base.asymptoticP - p);
  const uncertaintyP = spreadP + central.fitResidual + asymptoticGap + floorP;
  const uncertaintyX = spreadX + 1e-13 + 1e-14 * Math.abs(x);
  values['x, measured'] = x;
  values['x, uncertainty'] = uncertaintyX;
  values['p, far-infrared limit of the asymptotic form'] = base.asymptoticP;
  if (central.fit) {
    values['fit coefficient b (of 1/l)'] = central.fit.b;
    values['fit coefficient a (of ln(l)/l)'] = central.fit.a;
  }
  const lastPoint = base.points[base.points.length - 1];
  if (lastPoint) problem.couplings.forEach((name, i) => (values[`l ${name}(l) at the last decade`] = lastPoint.lg[i]!));
  settingsRecord.variations = estimates.map((e) => e.what).join('; ');
  if (skipped.length) settingsRecord.skipped = skipped.join('; ');

  const verdicts: ('holds' | 'fails' | 'inconclusive')[] = [];
  const parts: string[] = [];
  const loText = lo ? `; analytic leading order ${fmt(lo.p)}` : '';
  if (problem.claimedValue !== null) {
    const v = verdict(p, uncertaintyP, problem.claimedValue, tolerance);
    verdicts.push(v);
    parts.push(describe('p', p, uncertaintyP, problem.claimedValue, tolerance, v) + loText);
  }
  if (problem.claimedPower !== null) {
    const v = verdict(x, uncertaintyX, problem.claimedPower, tolerance);
    verdicts.push(v);
    parts.push(describe('x', x, uncertaintyX, problem.claimedPower, tolerance, v) + `; y_O / y_t = ${fmt(problem.exactPower)}`);
  }
  const status = verdicts.includes('fails') ? 'fails' : verdicts.every((v) => v === 'holds') ? 'holds' : 'inconclusive';
  const measured =
    problem.claimedValue !== null && problem.claimedPower !== null ? { p, x } : problem.claimedPower !== null ? x : p;
  const uncertainty = problem.claimedValue !== null ? uncertaintyP : uncertaintyX;
  const skippedText = skipped.length ? `. Variations left out: ${skipped.join('; ')}` : '';
  return {
    status,
    message: parts.join('. ') + skippedText,
    method,
    measured,
    uncertainty,
    expected,
    tolerance,
    settings: settingsRecord,
    stats,
    sanity,
    evidence: { values, plots: [convergencePlot(problem, base, p, central, lo), ridgePlot(problem, base, lo)] },
  };
};

function claimedRecord(problem: LogExponentProblem): CheckOutcome['expected'] {
  if (problem.claimedValue !== null && problem.claimedPower !== null) return { p: problem.claimedValue, x: problem.claimedPower };
  return problem.claimedValue ?? problem.claimedPower;
}

function describe(name: string, measured: number, uncertainty: number, claimed: number, tolerance: number, v: string): string {
  const head = `${name} = ${fmtMeasurement(measured, uncertainty)}`;
  if (v === 'holds') return `${head} agrees with the claimed ${fmt(claimed, 12)} (tolerance ${tolerance.toExponential(0)})`;
  if (v === 'fails') return `${head} differs from the claimed ${fmt(claimed, 12)} by ${Math.abs(measured - claimed).toExponential(2)} (tolerance ${tolerance.toExponential(0)})`;
  return `${head} cannot settle the claimed ${fmt(claimed, 12)} within the tolerance ${tolerance.toExponential(0)}`;
}
