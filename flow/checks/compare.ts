/**
 * Comparing two expressions at points drawn from the claim's fixed random start, in 64-digit
 * precision (mathjs BigNumber) where mathjs can, in double precision otherwise.
 */
import { ClaimInputError } from '../errors';
import { BIG_DIGITS, type Big, type Term, compileScalar, evaluateBig, parseTerm, symbolsOf, toBig } from '../expr';
import type { CheckContext, Domain, ValueInput } from '../types';
import { fmt, parameterValue } from './common';

export const DEFAULT_DOMAIN: readonly [number, number] = [0.05, 2];
/** Agreement needed in high precision, relative to the size of the values. */
export const BIG_RELATIVE = Math.pow(10, 6 - BIG_DIGITS);
export const BIG_ABSOLUTE = Math.pow(10, 4 - 2 * BIG_DIGITS);
/** How many of the points are re-evaluated in high precision. */
export const HIGH_PRECISION_POINTS = 4;
/** Agreement needed when only double precision is available. */
export const DOUBLE_RELATIVE = 1e-11;
export const DOUBLE_ABSOLUTE = 1e-14;

export interface ParsedSides {
  terms: Term[];
  /** Free variables (symbols that are not parameters), in order of appearance. */
  variables: string[];
}

/** Parse expressions of a plain claim: parameters are known, every other symbol is a free variable. */
export function parseSides(inputs: ReadonlyArray<[ValueInput, string]>, ctx: CheckContext, extraDeclared: readonly string[] = []): ParsedSides {
  const parameters = Object.keys(ctx.parameters);
  const terms = inputs.map(([input, where]) => parseTerm(input, where, new Set([...parameters, ...extraDeclared])));
  const variables = new Set<string>();
  for (const term of terms) for (const name of symbolsOf(term)) if (!parameters.includes(name)) variables.add(name);
  return { terms, variables: [...variables] };
}

export function domainsFor(variables: readonly string[], domain: Domain | undefined, ctx: CheckContext): Map<string, [number, number]> {
  const result = new Map<string, [number, number]>();
  for (const name of Object.keys(domain ?? {})) {
    if (!variables.includes(name)) {
      throw new ClaimInputError(`${ctx.where}.domain.${name}`, `${ctx.where}.domain.${name}: "${name}" is not a free variable of the claim (free variables: ${variables.join(', ') || 'none'})`);
    }
  }
  for (const name of variables) {
    const given = domain?.[name];
    if (!given) {
      result.set(name, [...DEFAULT_DOMAIN]);
      continue;
    }
    const where = `${ctx.where}.domain.${name}`;
    const a = parameterValue(given[0], `${where}[0]`, ctx.parameters);
    const b = parameterValue(given[1], `${where}[1]`, ctx.parameters);
    if (!Number.isFinite(a) || !Number.isFinite(b) || !(a < b)) throw new ClaimInputError(where, `${where}: expected a finite interval [from, to] with from < to`);
    result.set(name, [a, b]);
  }
  return result;
}

export interface Comparison {
  status: 'holds' | 'fails' | 'inconclusive';
  mode: 'high precision' | 'double precision';
  used: number;
  skipped: number;
  counterexample?: Record<string, number>;
  left?: number;
  right?: number;
  difference?: number;
  /** Points also compared in high precision. */
  highPrecisionPoints?: number;
  /** Largest difference relative to the size of the values, over the points used. */
  worst: number;
}

/** Draw a point; keep away from the ends where functions are often singular. */
function drawPoint(variables: readonly string[], domains: Map<string, [number, number]>, random: () => number): Record<string, number> {
  const point: Record<string, number> = {};
  for (const name of variables) {
    const [a, b] = domains.get(name)!;
    point[name] = Number((a + (b - a) * (0.02 + 0.96 * random())).toPrecision(12));
  }
  return point;
}

/**
 * Compare lhs and rhs at `points` random points in double precision (fast, catches ordinary
 * mistakes), then at a few of them in high precision (catches differences below double rounding).
 * `tolerance` (absolute) is added to the precision allowance. A point where a side is not a real
 * number is skipped.
 */
export function compareAtPoints(
  lhs: Term,
  rhs: Term,
  variables: readonly string[],
  domains: Map<string, [number, number]>,
  points: number,
  tolerance: number,
  ctx: CheckContext,
  highPrecisionPoints = HIGH_PRECISION_POINTS,
): Comparison {
  const parameterNames = Object.keys(ctx.parameters);
  const slots = [...variables, ...parameterNames];
  const left = compileScalar(lhs, slots);
  const right = compileScalar(rhs, slots);
  const wanted = variables.length === 0 ? 1 : points;
  const usable: Array<Record<string, number>> = [];
  let skipped = 0;
  let worst = 0;
  const attempts = Math.max(wanted * 3, wanted + 10);
  for (let attempt = 0; attempt < attempts && usable.length < wanted; attempt++) {
    ctx.checkpoint();
    const point = variables.length === 0 ? {} : drawPoint(variables, domains, ctx.random);
    const vector = [...variables.map((name) => point[name]!), ...parameterNames.map((name) => ctx.parameters[name]!)];
    const l = left(vector);
    const r = right(vector);
    if (!Number.isFinite(l) || !Number.isFinite(r)) {
      skipped++;
      continue;
    }
    const scale = Math.max(Math.abs(l), Math.abs(r));
    usable.push(point);
    worst = Math.max(worst, scale === 0 ? 0 : Math.abs(l - r) / scale);
    if (Math.abs(l - r) > DOUBLE_RELATIVE * scale + DOUBLE_ABSOLUTE + tolerance) {
      return { status: 'fails', mode: 'double precision', used: usable.length, skipped, counterexample: point, left: l, right: r, difference: l - r, worst };
    }
  }
  const enough = variables.length === 0 ? usable.length === 1 : usable.length >= Math.min(points, 3);
  if (!enough) return { status: 'inconclusive', mode: 'double precision', used: usable.length, skipped, worst };
  // High precision at the first few usable points.
  const bigParameters: Record<string, Big> = {};
  for (const name of parameterNames) bigParameters[name] = toBig(ctx.parameters[name]!);
  let bigWorst = 0;
  let checked = 0;
  for (const point of usable.slice(0, highPrecisionPoints)) {
    ctx.checkpoint();
    const values: Record<string, Big> = { ...bigParameters };
    for (const name of variables) values[name] = toBig(point[name]!);
    let lb: Big | null;
    let rb: Big | null;
    try {
      lb = evaluateBig(lhs, values);
      rb = evaluateBig(rhs, values);
    } catch {
      // mathjs has no high-precision form of a function used (gamma of a non-integer, erf, ...).
      return { status: 'holds', mode: 'double precision', used: usable.length, skipped, worst };
    }
    if (!lb || !rb) continue;
    checked++;
    const difference = lb.minus(rb).abs();
    const scale = lb.abs().greaterThan(rb.abs()) ? lb.abs() : rb.abs();
    bigWorst = Math.max(bigWorst, scale.isZero() ? 0 : difference.div(scale).toNumber());
    if (difference.greaterThan(scale.times(toBig(BIG_RELATIVE)).plus(toBig(BIG_ABSOLUTE + tolerance)))) {
      return {
        status: 'fails',
        mode: 'high precision',
        used: usable.length,
        skipped,
        counterexample: point,
        left: lb.toNumber(),
        right: rb.toNumber(),
        difference: lb.minus(rb).toNumber(),
        worst: bigWorst,
      };
    }
  }
  return checked > 0
    ? { status: 'holds', mode: 'high precision', used: usable.length, skipped, worst: bigWorst, highPrecisionPoints: checked }
    : { status: 'holds', mode: 'double precision', used: usable.length, skipped, worst };
}

export function describePoint(point: Record<string, number>): string {
  const entries = Object.entries(point);
  return entries.length === 0 ? 'no free variables' : entries.map(([name, value]) => `${name} = ${fmt(value, 12)}`).join(', ');
}
