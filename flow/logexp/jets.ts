// Taylor coefficients of an expression in one coupling by truncated power-series arithmetic
// (Taylor-mode differentiation): exact to rounding at any order, where repeated symbolic
// derivatives of a quotient such as g / (1 + g) grow without bound. Functions without a series
// rule here make it throw SeriesUnavailable, and the caller falls back.

import type { Term } from '../expr';

export class SeriesUnavailable extends Error {}

type S = Float64Array;

const constant = (v: number, k: number): S => {
  const out = new Float64Array(k);
  out[0] = v;
  return out;
};

function mul(a: S, b: S): S {
  const k = a.length;
  const out = new Float64Array(k);
  for (let i = 0; i < k; i++) {
    if (a[i] === 0) continue;
    for (let j = 0; i + j < k; j++) out[i + j]! += a[i]! * b[j]!;
  }
  return out;
}

function div(a: S, b: S): S {
  const k = a.length;
  if (b[0] === 0) throw new SeriesUnavailable('division by a series that vanishes at zero coupling');
  const out = new Float64Array(k);
  for (let n = 0; n < k; n++) {
    let s = a[n]!;
    for (let j = 1; j <= n; j++) s -= b[j]! * out[n - j]!;
    out[n] = s / b[0]!;
  }
  return out;
}

function exp(a: S): S {
  const k = a.length;
  const out = new Float64Array(k);
  out[0] = Math.exp(a[0]!);
  for (let n = 1; n < k; n++) {
    let s = 0;
    for (let j = 1; j <= n; j++) s += j * a[j]! * out[n - j]!;
    out[n] = s / n;
  }
  return out;
}

function log(a: S): S {
  const k = a.length;
  if (!(a[0]! > 0)) throw new SeriesUnavailable('logarithm of a series that is not positive at zero coupling');
  const out = new Float64Array(k);
  out[0] = Math.log(a[0]!);
  for (let n = 1; n < k; n++) {
    let s = a[n]!;
    for (let j = 1; j < n; j++) s -= (j / n) * out[j]! * a[n - j]!;
    out[n] = s / a[0]!;
  }
  return out;
}

/** a^c for a constant exponent c. */
function power(a: S, c: number): S {
  const k = a.length;
  if (Number.isInteger(c) && c >= 0 && c <= 64) {
    let out = constant(1, k);
    for (let i = 0; i < c; i++) out = mul(out, a);
    return out;
  }
  if (!(a[0]! > 0)) throw new SeriesUnavailable('a non-integer power of a series that is not positive at zero coupling');
  const out = new Float64Array(k);
  out[0] = Math.pow(a[0]!, c);
  for (let n = 1; n < k; n++) {
    let s = 0;
    for (let j = 1; j <= n; j++) s += ((c + 1) * j - n) * a[j]! * out[n - j]!;
    out[n] = s / (n * a[0]!);
  }
  return out;
}

/** sin and cos (or sinh and cosh with sign +1) together. */
function trig(a: S, sign: -1 | 1): [S, S] {
  const k = a.length;
  const s = new Float64Array(k);
  const c = new Float64Array(k);
  s[0] = sign < 0 ? Math.sin(a[0]!) : Math.sinh(a[0]!);
  c[0] = sign < 0 ? Math.cos(a[0]!) : Math.cosh(a[0]!);
  for (let n = 1; n < k; n++) {
    let ss = 0;
    let cc = 0;
    for (let j = 1; j <= n; j++) {
      ss += j * a[j]! * c[n - j]!;
      cc += j * a[j]! * s[n - j]!;
    }
    s[n] = ss / n;
    c[n] = (sign * cc) / n;
  }
  return [s, c];
}

/** Coefficients c_0..c_order of `term` in `variable`, other symbols taken from `values`. */
export function taylorSeries(term: Term, variable: string, values: Readonly<Record<string, number>>, order: number): Float64Array {
  const k = order + 1;
  const go = (t: Term): S => {
    switch (t.t) {
      case 'num':
      case 'const':
        return constant(t.v, k);
      case 'sym': {
        if (t.name === variable) {
          const out = new Float64Array(k);
          if (k > 1) out[1] = 1;
          return out;
        }
        const v = values[t.name];
        if (v === undefined) throw new SeriesUnavailable(`no value for ${t.name}`);
        return constant(v, k);
      }
      case 'neg':
        return go(t.a).map((v) => -v);
      case 'op': {
        const a = go(t.a);
        if (t.op === '^') {
          const b = go(t.b);
          if (b.some((v, i) => i > 0 && v !== 0)) return exp(mul(b, log(a)));
          return power(a, b[0]!);
        }
        const b = go(t.b);
        if (t.op === '+') return a.map((v, i) => v + b[i]!);
        if (t.op === '-') return a.map((v, i) => v - b[i]!);
        if (t.op === '*') return mul(a, b);
        return div(a, b);
      }
      case 'call': {
        const args = t.args.map(go);
        const [a] = args;
        if (!a) throw new SeriesUnavailable(`${t.f}() without arguments`);
        switch (t.f) {
          case 'exp':
            return exp(a);
          case 'expm1': {
            const e = exp(a);
            e[0] = Math.expm1(a[0]!);
            return e;
          }
          case 'log':
            if (args.length === 2) return div(log(a), log(args[1]!));
            return log(a);
          case 'log1p': {
            const shifted = Float64Array.from(a);
            shifted[0]! += 1;
            const out = log(shifted);
            out[0] = Math.log1p(a[0]!);
            return out;
          }
          case 'sqrt':
            return power(a, 0.5);
          case 'cbrt':
            return power(a, 1 / 3);
          case 'pow': {
            const b = args[1]!;
            if (b.some((v, i) => i > 0 && v !== 0)) return exp(mul(b, log(a)));
            return power(a, b[0]!);
          }
          case 'sin':
            return trig(a, -1)[0];
          case 'cos':
            return trig(a, -1)[1];
          case 'tan': {
            const [s, c] = trig(a, -1);
            return div(s, c);
          }
          case 'sinh':
            return trig(a, 1)[0];
          case 'cosh':
            return trig(a, 1)[1];
          case 'tanh': {
            const [s, c] = trig(a, 1);
            return div(s, c);
          }
          default:
            throw new SeriesUnavailable(`no series rule for ${t.f}()`);
        }
      }
    }
  };
  return go(term);
}
