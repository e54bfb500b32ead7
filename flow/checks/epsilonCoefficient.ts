/**
 * The epsilon-coefficient claim: the eps^k coefficient of a quantity evaluated at the fixed point
 * (e.g. nu = 1/t, eta = 2 - chi, gamma = chi/t with t and chi rates of the flow).
 */
import { ClaimInputError } from '../errors';
import type { CompiledModel } from '../model';
import { expandAtZero } from '../numerics/series';
import type { EpsilonCoefficientClaim, FlowCheck } from '../types';
import { couplingPoint, evaluatePoint, fmt, fmtMeasurement, fmtUncertainty, parameterExpression, requireParameter, verdict } from './common';
import { LOCATE_DEFAULTS, branchTracker, tightened } from './locate';

const DEFAULTS = { ...LOCATE_DEFAULTS, radius: 0.05, extraDegree: 10 };
const DEFAULT_TOLERANCE = 1e-6;

export const checkEpsilonCoefficient: FlowCheck<EpsilonCoefficientClaim, CompiledModel> = (claim, model, ctx) => {
  const settings = tightened(ctx.settings(DEFAULTS), ctx.tight);
  if (ctx.tight) settings.extraDegree += 2;
  const tolerance = claim.tolerance ?? DEFAULT_TOLERANCE;
  const where = ctx.where;
  const parameter = claim.parameter ?? 'eps';
  requireParameter(model, parameter, `${where}.parameter`);
  if (model.dimension === 0) throw new ClaimInputError(`${where}.near`, `${where}: the flow has no couplings, so there is no fixed point`);
  const quantity = model.quantity(claim.quantity, `${where}.quantity`);
  const near = couplingPoint(claim.near, `${where}.near`, model);
  const expected = parameterExpression(claim.value, `${where}.value`, model).at(model.parameters);
  const settingsRecord = { ...settings, tolerance, parameter };
  const tracker = branchTracker(model, parameter, (point) => evaluatePoint(near, point), null, settings, ctx);
  if ('error' in tracker) return { status: 'inconclusive', message: tracker.error, method: 'series in eps', settings: settingsRecord };
  const sample = (e: number): number | null => {
    const x = tracker.at(e);
    if (!x) return null;
    const value = tracker.pointAt(e).evaluate(quantity, x);
    return Number.isFinite(value) ? value : null;
  };
  const fit = expandAtZero(sample, claim.power, {
    radius: settings.radius,
    extraDegree: settings.extraDegree,
    checkpoint: ctx.checkpoint,
    goodEnough: ctx.tight ? 0 : tolerance * 1e-2,
  });
  if (!fit) {
    return {
      status: 'inconclusive',
      message: `the fixed point near the guess could not be followed for small ${parameter} (or the quantity is not finite there)`,
      method: 'series in eps',
      settings: settingsRecord,
    };
  }
  const measured = fit.coefficients[claim.power]!;
  const uncertainty = fit.uncertainties[claim.power]!;
  const status = verdict(measured - expected, uncertainty, tolerance);
  const term = `the ${parameter}^${claim.power} coefficient of ${quantity.source} at the fixed point`;
  const message =
    status === 'holds'
      ? `${term} is ${fmtMeasurement(measured, uncertainty)}, as claimed (${fmt(expected, 12)})`
      : status === 'fails'
        ? `${term} is ${fmtMeasurement(measured, uncertainty)}, not ${fmt(expected, 12)} (difference ${fmt(measured - expected, 4)}, tolerance ${fmt(tolerance)})`
        : `${term} is ${fmtMeasurement(measured, uncertainty)}: the uncertainty is too large to settle the claim at tolerance ${fmt(tolerance)}`;
  const curve: Array<[number, number]> = fit.samples
    .map(([e]) => e)
    .sort((a, b) => a - b)
    .map((e) => [e, fit.coefficients.reduce((sum, c, k) => sum + c * Math.pow(e, k), 0)]);
  return {
    status,
    message,
    method: `quantity at the fixed point for ${fit.samples.length} values of ${parameter} (Chebyshev nodes, ${fit.twoSided ? `|${parameter}|` : parameter} <= ${fmt(fit.twoSided ? fit.radius : 2 * fit.radius)}); Taylor coefficients by interpolation of degree ${fit.degree}; uncertainty from a lower degree, a narrower interval and rounding`,
    measured,
    expected,
    uncertainty,
    tolerance,
    settings: settingsRecord,
    stats: { solves: tracker.solves(), evaluations: fit.evaluations, degree: fit.degree, radius: fit.radius, twoSided: fit.twoSided, scaledGuess: tracker.scaledGuess },
    sanity: [
      {
        check: 'solver',
        ok: true,
        message: `the fixed point was followed at ${tracker.solves()} values of ${parameter}${tracker.scaledGuess ? ` (guess scaled from ${parameter} = ${fmt(model.parameters[parameter]!)})` : ''}`,
      },
    ],
    evidence: {
      coefficients: fit.coefficients.map((value, power) => ({ power, value, uncertainty: fit.uncertainties[power]! })),
      plots: [
        {
          title: `${quantity.source} at the fixed point against ${parameter}`,
          xLabel: parameter,
          yLabel: quantity.source,
          series: [
            { name: 'computed', points: [...fit.samples].sort((a, b) => a[0] - b[0]), style: 'points' },
            { name: `series through ${parameter}^${claim.power}`, points: curve, style: 'line' },
          ],
        },
      ],
    },
  };
};
