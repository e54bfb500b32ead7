/**
 * Exact algebra for identities: both sides as rational functions with rational coefficients over
 * "atoms" (symbols, constants, and function calls or non-integer powers taken as opaque). If
 * lhs - rhs is the zero rational function, the identity holds wherever both sides are defined.
 * A non-zero result proves nothing (sin(x)^2 + cos(x)^2 - 1 is not zero over atoms).
 */
import { type Term, toMathString } from './term';

interface Rational {
  n: bigint;
  d: bigint;
}

const abs = (a: bigint): bigint => (a < 0n ? -a : a);
function gcd(a: bigint, b: bigint): bigint {
  a = abs(a);
  b = abs(b);
  while (b !== 0n) [a, b] = [b, a % b];
  return a;
}
function rational(n: bigint, d: bigint): Rational {
  if (d === 0n) throw new Abort();
  if (d < 0n) {
    n = -n;
    d = -d;
  }
  const g = gcd(n, d);
  return g > 1n ? { n: n / g, d: d / g } : { n, d };
}
const rAdd = (a: Rational, b: Rational): Rational => rational(a.n * b.d + b.n * a.d, a.d * b.d);
const rMul = (a: Rational, b: Rational): Rational => rational(a.n * b.n, a.d * b.d);

/** The decimal a double prints as, exactly (0.1 -> 1/10). */
function fromNumber(v: number): Rational {
  if (!Number.isFinite(v)) throw new Abort();
  const match = /^(-?)(\d+)(?:\.(\d+))?(?:e([+-]?\d+))?$/.exec(String(v));
  if (!match) throw new Abort();
  const [, sign, whole, fraction = '', exponentText = '0'] = match;
  let n = BigInt(whole! + fraction);
  let d = 10n ** BigInt(fraction.length);
  const exponent = Number(exponentText);
  if (Math.abs(exponent) > 400) throw new Abort();
  if (exponent >= 0) n *= 10n ** BigInt(exponent);
  else d *= 10n ** BigInt(-exponent);
  return rational(sign ? -n : n, d);
}

class Abort extends Error {}

/** Monomial key: sorted "atom:power" pairs joined by ","; "" is the constant monomial. */
type Poly = Map<string, Rational>;
const MAX_TERMS = 3000;

function parseMonomial(key: string): Array<[number, number]> {
  if (key === '') return [];
  return key.split(',').map((pair) => {
    const [atom, power] = pair.split(':');
    return [Number(atom), Number(power)];
  });
}
function monomialKey(pairs: Array<[number, number]>): string {
  return pairs
    .filter(([, power]) => power !== 0)
    .sort((a, b) => a[0] - b[0])
    .map(([atom, power]) => `${atom}:${power}`)
    .join(',');
}
function mulMonomials(a: string, b: string): string {
  if (a === '') return b;
  if (b === '') return a;
  const powers = new Map<number, number>(parseMonomial(a));
  for (const [atom, power] of parseMonomial(b)) powers.set(atom, (powers.get(atom) ?? 0) + power);
  return monomialKey([...powers]);
}

function polyConst(c: Rational): Poly {
  return c.n === 0n ? new Map() : new Map([['', c]]);
}
function polyAdd(a: Poly, b: Poly, sign: 1n | -1n = 1n): Poly {
  const out = new Map(a);
  for (const [key, c] of b) {
    const sum = rAdd(out.get(key) ?? { n: 0n, d: 1n }, sign === 1n ? c : { n: -c.n, d: c.d });
    if (sum.n === 0n) out.delete(key);
    else out.set(key, sum);
  }
  if (out.size > MAX_TERMS) throw new Abort();
  return out;
}
function polyMul(a: Poly, b: Poly): Poly {
  if (a.size * b.size > MAX_TERMS * 4) throw new Abort();
  let out: Poly = new Map();
  for (const [ka, ca] of a) {
    const partial: Poly = new Map();
    for (const [kb, cb] of b) partial.set(mulMonomials(ka, kb), rMul(ca, cb));
    out = polyAdd(out, partial);
  }
  return out;
}
function polyEqual(a: Poly, b: Poly): boolean {
  if (a.size !== b.size) return false;
  for (const [key, c] of a) {
    const other = b.get(key);
    if (!other || other.n !== c.n || other.d !== c.d) return false;
  }
  return true;
}

interface Fraction {
  num: Poly;
  den: Poly;
}
const ONE_POLY = (): Poly => polyConst({ n: 1n, d: 1n });

function fAdd(a: Fraction, b: Fraction, sign: 1n | -1n): Fraction {
  if (polyEqual(a.den, b.den)) return { num: polyAdd(a.num, b.num, sign), den: a.den };
  return { num: polyAdd(polyMul(a.num, b.den), polyMul(b.num, a.den), sign), den: polyMul(a.den, b.den) };
}
function fMul(a: Fraction, b: Fraction): Fraction {
  return { num: polyMul(a.num, b.num), den: polyMul(a.den, b.den) };
}
function fDiv(a: Fraction, b: Fraction): Fraction {
  if (b.num.size === 0) throw new Abort();
  return { num: polyMul(a.num, b.den), den: polyMul(a.den, b.num) };
}
function fPow(a: Fraction, k: number): Fraction {
  let base = k < 0 ? fDiv({ num: ONE_POLY(), den: ONE_POLY() }, a) : a;
  let result: Fraction = { num: ONE_POLY(), den: ONE_POLY() };
  for (let e = Math.abs(k); e > 0; e >>= 1) {
    if (e & 1) result = fMul(result, base);
    if (e > 1) base = fMul(base, base);
  }
  return result;
}

/** An integer the exponent term equals exactly, if it is one. */
function integerExponent(term: Term): number | undefined {
  if (term.t === 'num' && Number.isInteger(term.v) && Math.abs(term.v) <= 32) return term.v;
  if (term.t === 'neg') {
    const inner = integerExponent(term.a);
    return inner === undefined ? undefined : -inner;
  }
  return undefined;
}

function toFraction(term: Term, atoms: Map<string, number>): Fraction {
  const atom = (key: string): Fraction => {
    let index = atoms.get(key);
    if (index === undefined) {
      index = atoms.size;
      atoms.set(key, index);
    }
    return { num: new Map([[`${index}:1`, { n: 1n, d: 1n }]]), den: ONE_POLY() };
  };
  switch (term.t) {
    case 'num':
      return { num: polyConst(fromNumber(term.v)), den: ONE_POLY() };
    case 'const':
      return atom(`c:${term.name === 'PI' ? 'pi' : term.name === 'E' ? 'e' : term.name}`);
    case 'sym':
      return atom(`s:${term.name}`);
    case 'neg': {
      const a = toFraction(term.a, atoms);
      return { num: polyAdd(new Map(), a.num, -1n), den: a.den };
    }
    case 'call':
      return atom(`f:${toMathString(term)}`);
    case 'op': {
      if (term.op === '^') {
        const k = integerExponent(term.b);
        if (k === undefined) return atom(`p:${toMathString(term)}`);
        return fPow(toFraction(term.a, atoms), k);
      }
      const a = toFraction(term.a, atoms);
      const b = toFraction(term.b, atoms);
      if (term.op === '+') return fAdd(a, b, 1n);
      if (term.op === '-') return fAdd(a, b, -1n);
      if (term.op === '*') return fMul(a, b);
      return fDiv(a, b);
    }
  }
}

/** 'zero' when lhs - rhs is identically zero as a rational function; 'undecided' otherwise. */
export function exactDifference(lhs: Term, rhs: Term): 'zero' | 'undecided' {
  try {
    const atoms = new Map<string, number>();
    const difference = fAdd(toFraction(lhs, atoms), toFraction(rhs, atoms), -1n);
    return difference.num.size === 0 ? 'zero' : 'undecided';
  } catch (error) {
    if (error instanceof Abort || error instanceof RangeError) return 'undecided';
    throw error;
  }
}
