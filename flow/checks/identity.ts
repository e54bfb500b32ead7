/** The identity claim: lhs = rhs for all values of the free variables. */
import { BIG_DIGITS, exactDifference } from '../expr';
import type { IdentityClaim, PlainCheck } from '../types';
import { fmt } from './common';
import { compareAtPoints, describePoint, domainsFor, parseSides } from './compare';

const DEFAULTS = { points: 12 };

export const checkIdentity: PlainCheck<IdentityClaim> = (claim, ctx) => {
  const settings = ctx.settings(DEFAULTS);
  const points = ctx.tight ? settings.points * 3 : settings.points;
  const tolerance = claim.tolerance ?? 0;
  const { terms, variables } = parseSides(
    [
      [claim.lhs, `${ctx.where}.lhs`],
      [claim.rhs, `${ctx.where}.rhs`],
    ],
    ctx,
  );
  const [lhs, rhs] = terms as [typeof terms[0], typeof terms[0]];
  const domains = domainsFor(variables, claim.domain, ctx);
  const settingsRecord = { ...settings, points, tolerance };
  if (exactDifference(lhs, rhs) === 'zero') {
    return {
      status: 'holds',
      message: 'both sides are the same rational function (exact algebra); the identity holds wherever both are defined',
      method: 'exact algebra over rational functions (function calls taken as symbols)',
      measured: 0,
      expected: 0,
      uncertainty: 0,
      tolerance,
      settings: settingsRecord,
    };
  }
  const comparison = compareAtPoints(lhs, rhs, variables, domains, points, tolerance, ctx);
  const stats = { pointsUsed: comparison.used, pointsSkipped: comparison.skipped, precision: comparison.mode };
  const method = `exact algebra did not settle it; evaluation at points from a fixed random start in double precision, ${comparison.highPrecisionPoints ?? 0} of them again with ${BIG_DIGITS} digits`;
  if (comparison.status === 'fails') {
    return {
      status: 'fails',
      message: `the sides differ at ${describePoint(comparison.counterexample!)}: lhs = ${fmt(comparison.left!, 14)}, rhs = ${fmt(comparison.right!, 14)}, lhs - rhs = ${fmt(comparison.difference!, 4)}${comparison.mode === 'high precision' ? ` (seen in ${BIG_DIGITS}-digit precision)` : ''}`,
      method,
      measured: comparison.left!,
      expected: comparison.right!,
      tolerance,
      settings: settingsRecord,
      stats,
      evidence: { counterexample: comparison.counterexample! },
    };
  }
  if (comparison.status === 'inconclusive') {
    return {
      status: 'inconclusive',
      message: `the sides could be evaluated at only ${comparison.used} point${comparison.used === 1 ? '' : 's'} (${comparison.skipped} gave no real value); give a domain where both are defined`,
      method,
      settings: settingsRecord,
      stats,
    };
  }
  const where = variables.length === 0 ? 'the two sides are equal' : `equal at ${comparison.used} random points of ${variables.join(', ')}`;
  const digits = comparison.mode === 'high precision' ? `(${comparison.highPrecisionPoints} of them to ${BIG_DIGITS - 6} significant digits)` : 'to 11 significant digits (no high-precision form for a function used)';
  return {
    status: 'holds',
    message: `${where} ${digits} (largest relative difference ${comparison.worst.toExponential(1)})`,
    method,
    measured: comparison.worst,
    expected: 0,
    uncertainty: comparison.worst,
    tolerance,
    settings: settingsRecord,
    stats,
  };
};
