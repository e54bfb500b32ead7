/** The fixed-point claim: the flow has a fixed point near a guess, optionally at a claimed position or series in eps. */
import { ClaimInputError } from '../errors';
import type { CompiledModel } from '../model';
import { expandAtZero } from '../numerics/series';
import type { CheckOutcome, Evidence, FixedPointClaim, FlowCheck, PlotData, Status } from '../types';
import { couplingPoint, describePosition, evaluatePoint, fmt, fmtMeasurement, fmtUncertainty, positionRecord, requireParameter, verdict } from './common';
import { LOCATE_DEFAULTS, branchTracker, locate, searchStats, summarizeFixedPoint, tightened } from './locate';

const DEFAULTS = { ...LOCATE_DEFAULTS, radius: 0.05, extraDegree: 10 };
const DEFAULT_TOLERANCE = 1e-6;

export const checkFixedPoint: FlowCheck<FixedPointClaim, CompiledModel> = (claim, model, ctx) => {
  const settings = tightened(ctx.settings(DEFAULTS), ctx.tight);
  const tolerance = claim.tolerance ?? DEFAULT_TOLERANCE;
  if (model.dimension === 0) throw new ClaimInputError(`${ctx.where}.near`, `${ctx.where}: the flow has no couplings, so it has no fixed point to find`);
  const near = couplingPoint(claim.near, `${ctx.where}.near`, model);
  const value = claim.value ? couplingPoint(claim.value, `${ctx.where}.value`, model) : null;
  if (claim.order !== undefined && !value) {
    throw new ClaimInputError(`${ctx.where}.value`, `${ctx.where}.value: missing (an order needs the claimed position as a series)`);
  }
  const point = model.at();
  const guess = evaluatePoint(near, point);
  const claimed = value ? evaluatePoint(value, point) : null;
  const settingsRecord = { ...settings, tolerance };

  if (claim.order !== undefined && value) {
    const parameter = claim.parameter ?? 'eps';
    requireParameter(model, parameter, `${ctx.where}.parameter`);
    return seriesCheck(claim.order, parameter, model, near, value, settings, tolerance, ctx);
  }

  const found = locate(model, point, guess, claimed ? [claimed] : [], settings, ctx, claimed ?? undefined);
  if (!found.ok) return { ...found.outcome, settings: settingsRecord, tolerance };
  const located = found.located;
  const { infos, search, sanity } = located;
  const others = infos.length > 1 ? ` (${infos.length} fixed points found in all)` : '';
  const base = {
    method: 'Newton from several starts with the symbolic Jacobian',
    settings: settingsRecord,
    stats: searchStats(search),
    evidence: { fixedPoints: infos } satisfies Evidence,
  };
  if (!claimed) {
    return {
      ...base,
      status: 'holds',
      measured: positionRecord(model, located.x),
      uncertainty: located.uncertainty,
      message: `fixed point at ${describePosition(model, located.x)} (${summarizeFixedPoint(located.info)})${others}`,
      sanity,
    };
  }
  // The claimed position: compare with the found fixed point nearest to it.
  const nearest = located.x;
  const difference = Math.max(...Array.from(nearest, (xi, i) => Math.abs(xi - claimed[i]!)));
  const status = verdict(difference, located.uncertainty, tolerance);
  const words: Record<Status, string> = {
    holds: `fixed point at ${describePosition(model, nearest)} matches the claimed position (difference ${fmtUncertainty(difference)} within tolerance ${fmt(tolerance)})`,
    fails: `the nearest fixed point is at ${describePosition(model, nearest)}, not at the claimed ${describePosition(model, claimed)} (difference ${fmt(difference, 4)}, tolerance ${fmt(tolerance)})`,
    inconclusive: `the fixed point at ${describePosition(model, nearest)} is ${fmt(difference, 4)} from the claimed position, which the position uncertainty ${fmtUncertainty(located.uncertainty)} cannot settle against tolerance ${fmt(tolerance)}`,
    invalid: '',
  };
  return {
    ...base,
    status,
    measured: positionRecord(model, nearest),
    expected: positionRecord(model, claimed),
    uncertainty: located.uncertainty,
    tolerance,
    message: words[status] + others,
    sanity,
  };
};

function seriesCheck(
  order: number,
  parameter: string,
  model: CompiledModel,
  near: ReturnType<typeof couplingPoint>,
  value: ReturnType<typeof couplingPoint>,
  settings: typeof DEFAULTS,
  tolerance: number,
  ctx: Parameters<FlowCheck<FixedPointClaim, CompiledModel>>[2],
): CheckOutcome {
  const tracker = branchTracker(
    model,
    parameter,
    (point) => evaluatePoint(near, point),
    (point) => evaluatePoint(value, point),
    settings,
    ctx,
  );
  if ('error' in tracker) return { status: 'inconclusive', message: tracker.error, method: 'series check', settings: { ...settings, tolerance } };
  const claimedAt = (e: number) => evaluatePoint(value, tracker.pointAt(e));
  const n = model.dimension;
  const powers: NonNullable<Evidence['coefficients']> = [];
  let status: Status = 'holds';
  let worst = { text: '', excess: Number.NEGATIVE_INFINITY };
  let evaluations = 0;
  for (let i = 0; i < n; i++) {
    const residual = (e: number): number | null => {
      const x = tracker.at(e);
      return x ? x[i]! - claimedAt(e)[i]! : null;
    };
    const fit = expandAtZero(residual, order, { radius: settings.radius, extraDegree: settings.extraDegree, checkpoint: ctx.checkpoint, goodEnough: ctx.tight ? 0 : tolerance * 1e-2 });
    if (!fit) {
      return {
        status: 'inconclusive',
        message: `the fixed point near the guess could not be followed for small ${parameter} (Newton did not converge at every sampled ${parameter})`,
        method: 'series check',
        settings: { ...settings, tolerance },
      };
    }
    evaluations += fit.evaluations;
    // g* itself on the same nodes, for display (no further radii).
    const gstar = expandAtZero((e) => tracker.at(e)?.[i] ?? null, order, {
      radius: fit.radius,
      extraDegree: settings.extraDegree,
      checkpoint: ctx.checkpoint,
      goodEnough: Number.POSITIVE_INFINITY,
    });
    for (let k = 0; k <= order; k++) {
      const c = fit.coefficients[k]!;
      const u = fit.uncertainties[k]!;
      const v = verdict(c, u, tolerance);
      if (v === 'fails') status = 'fails';
      else if (v === 'inconclusive' && status === 'holds') status = 'inconclusive';
      const excess = Math.abs(c) - tolerance;
      if (excess > worst.excess) worst = { text: `${parameter}^${k} coefficient of ${model.couplings[i]} differs by ${fmtMeasurement(c, u, 4)}`, excess };
      if (gstar) powers.push({ power: k, value: gstar.coefficients[k]!, uncertainty: gstar.uncertainties[k]!, of: model.couplings[i] });
    }
  }
  const plot = residualPlot(model, parameter, order, tracker.at, claimedAt, settings.radius);
  const slope = plot.slope;
  const slopeText = slope === null ? 'the residual is at rounding level' : `the residual scales as ${parameter}^${fmt(slope, 3)}`;
  const message =
    status === 'holds'
      ? `the fixed point agrees with the claimed series through ${parameter}^${order} (every coefficient of the difference within ${fmt(tolerance)}; ${slopeText})`
      : status === 'fails'
        ? `the claimed series is wrong: the ${worst.text} (tolerance ${fmt(tolerance)}; ${slopeText}, expected ${parameter}^${order + 1})`
        : `the coefficients of the difference cannot be settled against tolerance ${fmt(tolerance)}: the ${worst.text}`;
  const base = model.at();
  return {
    status,
    message,
    method: `fixed point followed over small ${parameter} (Chebyshev nodes, |${parameter}| <= ${fmt(settings.radius)}); Taylor coefficients of g* minus the claimed series by interpolation`,
    measured: tracker.at(model.parameters[parameter]!) ? positionRecord(model, tracker.at(model.parameters[parameter]!)!) : null,
    expected: positionRecord(model, evaluatePoint(value, base)),
    uncertainty: null,
    tolerance,
    settings: { ...settings, tolerance, parameter },
    stats: { solves: tracker.solves(), evaluations, scaledGuess: tracker.scaledGuess },
    evidence: { coefficients: powers, plots: [plot.data], ...(slope === null ? {} : { values: { residualSlope: slope } }) },
  };
}

/** |g*(e) - claimed(e)| on a geometric sequence of e, with its fitted log-log slope. */
function residualPlot(
  model: CompiledModel,
  parameter: string,
  order: number,
  at: (e: number) => Float64Array | null,
  claimedAt: (e: number) => Float64Array,
  radius: number,
): { data: PlotData; slope: number | null } {
  const points: Array<[number, number]> = [];
  for (let j = 0; j < 8; j++) {
    const e = radius * Math.pow(0.5, j);
    const x = at(e);
    if (!x) continue;
    const c = claimedAt(e);
    const r = Math.max(...Array.from(x, (xi, i) => Math.abs(xi - c[i]!)));
    const scale = Math.max(...Array.from(x, Math.abs));
    if (r > 1e-13 * scale) points.push([e, r]);
  }
  let slope: number | null = null;
  if (points.length >= 3) {
    const logs = points.map(([e, r]) => [Math.log(e), Math.log(r)] as const);
    const mx = logs.reduce((s, [x]) => s + x, 0) / logs.length;
    const my = logs.reduce((s, [, y]) => s + y, 0) / logs.length;
    const sxx = logs.reduce((s, [x]) => s + (x - mx) ** 2, 0);
    const sxy = logs.reduce((s, [x, y]) => s + (x - mx) * (y - my), 0);
    slope = sxy / sxx;
  }
  const reference: Array<[number, number]> =
    points.length > 0 ? points.map(([e]) => [e, points[0]![1] * Math.pow(e / points[0]![0], order + 1)]) : [];
  return {
    slope,
    data: {
      title: `fixed point minus the claimed series (${model.couplings.join(', ')})`,
      xLabel: parameter,
      yLabel: '|g* - claimed|',
      xScale: 'log',
      yScale: 'log',
      series: [
        { name: 'difference', points, style: 'points' },
        { name: `slope ${order + 1}`, points: reference, style: 'line' },
      ],
    },
  };
}
