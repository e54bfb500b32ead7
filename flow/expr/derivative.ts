/**
 * Symbolic derivatives through mathjs (without its slow simplifier), followed by our own exact
 * constant folding so repeated derivatives stay small.
 */
import { derivative as mathDerivative } from 'mathjs';
import { ExpressionError } from '../errors';
import { BoundedCache } from './cache';
import { nodeToTerm, parseNode } from './parse';
import { type Term, binary, neg, num, termSize, toMathString } from './term';

/** Beyond this many nodes a derivative is refused (repeated product rules grow exponentially). */
const MAX_DERIVATIVE_SIZE = 20_000;

const cache = new BoundedCache<string, Term>(4000);

const isSafeInteger = (v: number): boolean => Number.isSafeInteger(v);

/** Fold numeric subterms where the result is exact (integers), and drop 0 and 1 identities. */
export function fold(term: Term): Term {
  switch (term.t) {
    case 'neg':
      return neg(fold(term.a));
    case 'call':
      return { t: 'call', f: term.f, args: term.args.map(fold) };
    case 'op': {
      const a = fold(term.a);
      const b = fold(term.b);
      if (a.t === 'num' && b.t === 'num' && isSafeInteger(a.v) && isSafeInteger(b.v)) {
        let value: number | undefined;
        if (term.op === '+') value = a.v + b.v;
        else if (term.op === '-') value = a.v - b.v;
        else if (term.op === '*') value = a.v * b.v;
        else if (term.op === '/' && b.v !== 0 && a.v % b.v === 0) value = a.v / b.v;
        else if (term.op === '^' && b.v >= 0 && b.v <= 64) value = Math.pow(a.v, b.v);
        if (value !== undefined && isSafeInteger(value)) return num(value);
      }
      return binary(term.op, a, b);
    }
    default:
      return term;
  }
}

/**
 * d term / d variable. `declared` must be the same set the term was parsed with (it decides
 * whether "e" and "pi" are constants or names). Throws ExpressionError when mathjs cannot
 * differentiate a function (gamma, erf, ...).
 */
export function differentiate(term: Term, variable: string, declared: ReadonlySet<string>, where: string): Term {
  const source = toMathString(term);
  const key = `${[...declared].sort().join(',')}\u0000${variable}\u0000${source}`;
  const cached = cache.get(key);
  if (cached) return cached;
  let result: Term;
  try {
    const node = mathDerivative(parseNode(source, where), variable, { simplify: false });
    result = fold(nodeToTerm(node, where, declared));
  } catch (error) {
    if (error instanceof ExpressionError) throw error;
    const reason = error instanceof Error ? error.message : String(error);
    throw new ExpressionError(`${where}: no symbolic derivative with respect to ${variable}: ${reason}`, where, source);
  }
  cache.set(key, result);
  return result;
}

/** The k-th derivative (k >= 0); `checkpoint` runs between orders (time bound, cancellation). */
export function differentiateTimes(term: Term, variable: string, times: number, declared: ReadonlySet<string>, where: string, checkpoint?: () => void): Term {
  let result = fold(term);
  for (let k = 0; k < times; k++) {
    checkpoint?.();
    result = differentiate(result, variable, declared, where);
    if (termSize(result) > MAX_DERIVATIVE_SIZE) {
      throw new ExpressionError(`${where}: the derivative of order ${k + 1} with respect to ${variable} is too large to form symbolically`, where, toMathString(term));
    }
  }
  return result;
}
