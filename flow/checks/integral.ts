/** The integral claim: a definite one-dimensional integral equals a value. */
import { ClaimInputError } from '../errors';
import { compileScalar, parseTerm, requireKnown } from '../expr';
import { checkName } from '../model';
import { integrate } from '../numerics/quadrature';
import type { IntegralClaim, PlainCheck } from '../types';
import { fmt, fmtMeasurement, fmtUncertainty, parameterValue, verdict } from './common';

const DEFAULTS = { absoluteTolerance: 1e-13, relativeTolerance: 1e-12, maxIntervals: 2000 };
const DEFAULT_TOLERANCE = 1e-9;

function limit(input: number | string, where: string, parameters: Readonly<Record<string, number>>): number {
  const text = typeof input === 'string' ? input.trim() : input;
  if (text === 'inf' || text === '+inf' || text === '+Infinity') return Number.POSITIVE_INFINITY;
  if (text === '-inf') return Number.NEGATIVE_INFINITY;
  const value = parameterValue(text, where, parameters);
  if (Number.isNaN(value)) throw new ClaimInputError(where, `${where}: not a number`);
  return value;
}

export const checkIntegral: PlainCheck<IntegralClaim> = (claim, ctx) => {
  const settings = ctx.settings(DEFAULTS);
  if (ctx.tight) {
    settings.absoluteTolerance /= 100;
    settings.relativeTolerance /= 100;
    settings.maxIntervals *= 4;
  }
  const tolerance = claim.tolerance ?? DEFAULT_TOLERANCE;
  const where = ctx.where;
  checkName(claim.variable, `${where}.variable`, 'variable');
  const parameters = Object.keys(ctx.parameters);
  if (parameters.includes(claim.variable)) throw new ClaimInputError(`${where}.variable`, `${where}.variable: "${claim.variable}" is a parameter of the flow`);
  const term = parseTerm(claim.integrand, `${where}.integrand`, new Set([...parameters, claim.variable]));
  requireKnown(term, String(claim.integrand), `${where}.integrand`, new Set([...parameters, claim.variable]), `the integrand may use the variable ${claim.variable} and the parameters (${parameters.join(', ') || 'none'})`);
  const from = limit(claim.from, `${where}.from`, ctx.parameters);
  const to = limit(claim.to, `${where}.to`, ctx.parameters);
  const expected = parameterValue(claim.value, `${where}.value`, ctx.parameters);
  const fn = compileScalar(term, [claim.variable, ...parameters]);
  const vector = [0, ...parameters.map((name) => ctx.parameters[name]!)];
  const f = (x: number): number => {
    vector[0] = x;
    return fn(vector);
  };
  const result = integrate(f, from, to, { ...settings, checkpoint: ctx.checkpoint });
  const settingsRecord = { ...settings, tolerance };
  const stats = { evaluations: result.evaluations, intervals: result.intervals, converged: result.converged };
  const method = `adaptive Gauss–Kronrod (7/15 points)${Number.isFinite(from) && Number.isFinite(to) ? '' : ' after mapping the infinite range to a finite one'}`;
  if (result.badPoint !== undefined) {
    return {
      status: 'inconclusive',
      message: `the integrand is not finite at ${claim.variable} = ${fmt(result.badPoint, 12)} inside the range`,
      method,
      settings: settingsRecord,
      stats,
      sanity: [{ check: 'finite', ok: false, message: `not finite at ${claim.variable} = ${fmt(result.badPoint, 12)}` }],
    };
  }
  if (!Number.isFinite(result.value)) {
    return {
      status: 'fails',
      message: `the integral diverges: the quadrature sum grows without bound (${result.evaluations} evaluations), so it cannot equal ${fmt(expected, 15)}`,
      method,
      measured: result.value,
      expected,
      tolerance,
      settings: settingsRecord,
      stats,
      sanity: [{ check: 'finite', ok: false, message: 'the integral is not finite' }],
    };
  }
  const status = verdict(result.value - expected, result.error, tolerance);
  const reached = result.converged ? '' : ` (the requested accuracy was not reached in ${result.intervals} subintervals: the integral may diverge or oscillate)`;
  return {
    status,
    message:
      status === 'holds'
        ? `the integral is ${fmtMeasurement(result.value, result.error, 15)}, as claimed (${fmt(expected, 15)})`
        : status === 'fails'
          ? `the integral is ${fmtMeasurement(result.value, result.error, 15)}, not ${fmt(expected, 15)} (difference ${fmt(result.value - expected, 4)})${reached}`
          : `the integral is ${fmtMeasurement(result.value, result.error, 15)}: too uncertain to settle the claim at tolerance ${fmt(tolerance)}${reached}`,
    method,
    measured: result.value,
    expected,
    uncertainty: result.error,
    tolerance,
    settings: settingsRecord,
    stats,
    sanity: [{ check: 'solver', ok: result.converged, message: `${result.evaluations} evaluations in ${result.intervals} subintervals${result.converged ? '' : '; accuracy not reached'}` }],
  };
};
