/**
 * High-precision evaluation (mathjs BigNumber, 40 significant digits) of Terms, for identity and
 * order checks where double precision would hide or invent a difference.
 */
import { all, create, type BigNumber, type EvalFunction } from 'mathjs';
import { BoundedCache } from './cache';
import { type Term, toMathString } from './term';

export const BIG_DIGITS = 40;
const big = create(all, { number: 'BigNumber', precision: BIG_DIGITS });
const compiled = new BoundedCache<string, EvalFunction>(2000);

export type Big = BigNumber;

export function toBig(value: number | string): Big {
  return big.bignumber(typeof value === 'number' ? String(value) : value);
}

/**
 * Evaluate at the given values. Returns null where the value is not a real number (complex,
 * infinite, undefined) and throws when mathjs cannot evaluate a function in BigNumber precision
 * (gamma of a non-integer, erf): callers fall back to double precision.
 */
export function evaluateBig(term: Term, values: Readonly<Record<string, Big>>): Big | null {
  const source = toMathString(term);
  let code = compiled.get(source);
  if (!code) {
    code = big.compile(source);
    compiled.set(source, code);
  }
  const result: unknown = code.evaluate({ ...values });
  if (big.isBigNumber(result)) return result.isFinite() ? result : null;
  if (typeof result === 'number') return Number.isFinite(result) ? toBig(result) : null;
  return null;
}

export function bigToNumber(value: Big): number {
  return value.toNumber();
}

/** |a - b| <= absolute + relative * max(|a|, |b|), in full precision. */
export function bigClose(a: Big, b: Big, absolute: number, relative: number): boolean {
  const difference = a.minus(b).abs();
  const scale = a.abs().greaterThan(b.abs()) ? a.abs() : b.abs();
  return difference.lessThanOrEqualTo(scale.times(toBig(relative)).plus(toBig(absolute)));
}

export function bigAbsDifference(a: Big, b: Big): Big {
  return a.minus(b).abs();
}
