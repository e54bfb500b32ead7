/** The coefficient claim: the variable^k Taylor coefficient of `of` at `at` equals `value`. */
import { ClaimInputError, ExpressionError } from '../errors';
import { type Term, compileScalar, differentiateTimes, div, exactDifference, num, substitute, symbolsOf } from '../expr';
import { checkName } from '../model';
import { expandAtZero } from '../numerics/series';
import type { CoefficientClaim, PlainCheck, Status } from '../types';
import { fmt, fmtMeasurement, fmtUncertainty, verdict } from './common';
import { compareAtPoints, describePoint, domainsFor, parseSides } from './compare';

const DEFAULTS = { points: 8, radius: 0.5, extraDegree: 10 };
const DEFAULT_TOLERANCE = 1e-9;

function factorial(k: number): number {
  let f = 1;
  for (let i = 2; i <= k; i++) f *= i;
  return f;
}

export const checkCoefficient: PlainCheck<CoefficientClaim> = (claim, ctx) => {
  const settings = ctx.settings(DEFAULTS);
  if (ctx.tight) {
    settings.points *= 2;
    settings.extraDegree += 2;
  }
  const tolerance = claim.tolerance ?? DEFAULT_TOLERANCE;
  const where = ctx.where;
  checkName(claim.variable, `${where}.variable`, 'variable');
  if (claim.variable in ctx.parameters) throw new ClaimInputError(`${where}.variable`, `${where}.variable: "${claim.variable}" is a parameter of the flow, not a free variable`);
  if (claim.power > 24) throw new ClaimInputError(`${where}.power`, `${where}.power: at most 24`);
  const parameters = Object.keys(ctx.parameters);
  const { terms, variables } = parseSides(
    [
      [claim.of, `${where}.of`],
      [claim.value, `${where}.value`],
      [claim.at ?? 0, `${where}.at`],
    ],
    ctx,
    [claim.variable],
  );
  const [of, value, at] = terms as [Term, Term, Term];
  if (symbolsOf(at).has(claim.variable)) throw new ClaimInputError(`${where}.at`, `${where}.at: the expansion point cannot depend on ${claim.variable}`);
  if (symbolsOf(value).has(claim.variable)) throw new ClaimInputError(`${where}.value`, `${where}.value: the coefficient cannot depend on ${claim.variable}`);
  const others = variables.filter((name) => name !== claim.variable);
  const domains = domainsFor(others, claim.domain, ctx);
  const declared = new Set([...parameters, ...variables]);
  const settingsRecord = { ...settings, tolerance };
  // Symbolic: the k-th derivative at the point, divided by k!.
  let symbolic: Term | null = null;
  try {
    const derivative = differentiateTimes(of, claim.variable, claim.power, declared, `${where}.of`, ctx.checkpoint);
    symbolic = div(substitute(derivative, new Map([[claim.variable, at]])), num(factorial(claim.power)));
  } catch (error) {
    if (!(error instanceof ExpressionError)) throw error;
  }
  if (symbolic) {
    if (exactDifference(symbolic, value) === 'zero') {
      return {
        status: 'holds',
        message: `the ${claim.variable}^${claim.power} coefficient equals the claimed value identically (symbolic derivative, exact algebra)`,
        method: 'symbolic derivative (mathjs), exact algebra',
        measured: 0,
        expected: 0,
        tolerance,
        settings: settingsRecord,
      };
    }
    const comparison = compareAtPoints(symbolic, value, others, domains, settings.points, tolerance, ctx);
    if (comparison.status !== 'inconclusive') {
      const atPoint = others.length > 0 ? ` at ${describePoint(comparison.counterexample ?? {})}` : '';
      return {
        status: comparison.status,
        message:
          comparison.status === 'holds'
            ? `the ${claim.variable}^${claim.power} coefficient (symbolic derivative) equals the claimed value${others.length > 0 ? ` at ${comparison.used} random points of ${others.join(', ')}` : ''} in ${comparison.mode}`
            : `the ${claim.variable}^${claim.power} coefficient is ${fmt(comparison.left!, 14)}, not ${fmt(comparison.right!, 14)}${atPoint}`,
        method: `symbolic derivative (mathjs), evaluated in ${comparison.mode}`,
        measured: comparison.left ?? null,
        expected: comparison.right ?? null,
        tolerance,
        settings: settingsRecord,
        stats: { pointsUsed: comparison.used, pointsSkipped: comparison.skipped },
        ...(comparison.counterexample ? { evidence: { counterexample: comparison.counterexample } } : {}),
      };
    }
  }
  // Numerical: Taylor coefficients by interpolation around the point (for functions mathjs cannot
  // differentiate, or derivatives with a removable singularity at the point such as sin(x)/x).
  const slots = [claim.variable, ...others, ...parameters];
  const f = compileScalar(of, slots);
  const valueFn = compileScalar(value, slots);
  const atFn = compileScalar(at, slots);
  const tries = others.length === 0 ? 1 : Math.min(settings.points, 4);
  let worst: { status: Status; measured: number; expected: number; uncertainty: number; point: Record<string, number> } | null = null;
  for (let trial = 0; trial < tries; trial++) {
    const point: Record<string, number> = {};
    for (const name of others) {
      const [a, b] = domains.get(name)!;
      point[name] = Number((a + (b - a) * (0.02 + 0.96 * ctx.random())).toPrecision(12));
    }
    const rest = [...others.map((name) => point[name]!), ...parameters.map((name) => ctx.parameters[name]!)];
    const x0 = atFn([0, ...rest]);
    const fit = expandAtZero((h) => {
      const y = f([x0 + h, ...rest]);
      return Number.isFinite(y) ? y : null;
    }, claim.power, { radius: settings.radius * Math.max(1, Math.abs(x0)), extraDegree: settings.extraDegree, checkpoint: ctx.checkpoint, noiseFactor: 8 });
    if (!fit) {
      return { status: 'inconclusive', message: `${claim.of} could not be evaluated around ${claim.variable} = ${fmt(x0)}`, method: 'Taylor coefficients by interpolation', settings: settingsRecord };
    }
    const measured = fit.coefficients[claim.power]!;
    const uncertainty = fit.uncertainties[claim.power]!;
    const expected = valueFn([0, ...rest]);
    const status = verdict(measured - expected, uncertainty, tolerance);
    if (!worst || status === 'fails' || (status === 'inconclusive' && worst.status === 'holds')) worst = { status, measured, expected, uncertainty, point };
    if (status === 'fails') break;
  }
  const result = worst!;
  const atText = others.length > 0 ? ` at ${describePoint(result.point)}` : '';
  return {
    status: result.status,
    message:
      result.status === 'holds'
        ? `the ${claim.variable}^${claim.power} coefficient is ${fmtMeasurement(result.measured, result.uncertainty)}${atText}, as claimed`
        : result.status === 'fails'
          ? `the ${claim.variable}^${claim.power} coefficient is ${fmtMeasurement(result.measured, result.uncertainty)}${atText}, not ${fmt(result.expected, 12)}`
          : `the ${claim.variable}^${claim.power} coefficient ${fmtMeasurement(result.measured, result.uncertainty)}${atText} cannot be settled against tolerance ${fmt(tolerance)}`,
    method: symbolic ? 'symbolic derivative not finite at the point; Taylor coefficients by interpolation' : 'no symbolic derivative in mathjs; Taylor coefficients by interpolation',
    measured: result.measured,
    expected: result.expected,
    uncertainty: result.uncertainty,
    tolerance,
    settings: settingsRecord,
    ...(others.length > 0 ? { evidence: { counterexample: result.point } } : {}),
  };
};

