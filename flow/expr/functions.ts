/**
 * The functions an expression may call. Each maps to a fixed JavaScript implementation; nothing
 * the user writes is ever turned into code (compile.ts emits only names from this table).
 */
import { erf as mathErf, gamma as mathGamma, lgamma as mathLgamma, zeta as mathZeta } from 'mathjs';

export interface FunctionSpec {
  minArgs: number;
  maxArgs: number;
  /** A JavaScript expression naming the implementation inside generated code (`H` is the helper object). */
  js: string;
  impl: (...args: number[]) => number;
}

/** Helpers reachable from generated code as `H.name`. */
export const helpers = {
  gamma: (x: number): number => mathGamma(x) as number,
  lgamma: (x: number): number => mathLgamma(x) as number,
  erf: (x: number): number => mathErf(x) as number,
  zeta: (x: number): number => mathZeta(x) as number,
  factorial: (x: number): number => mathGamma(x + 1) as number,
  logb: (x: number, b: number): number => Math.log(x) / Math.log(b),
  sec: (x: number): number => 1 / Math.cos(x),
  csc: (x: number): number => 1 / Math.sin(x),
  cot: (x: number): number => 1 / Math.tan(x),
  nthRoot: (x: number, k: number): number => (x < 0 && Math.abs(k % 2) === 1 ? -Math.pow(-x, 1 / k) : Math.pow(x, 1 / k)),
  /** (c + a)^k - c^k without cancellation when a is small against c. */
  powdiff(c: number, a: number, k: number): number {
    if (a === 0) return 0;
    if (c === 0) return Math.pow(a, k);
    const ratio = a / c;
    if (ratio > -1 && (c > 0 || Number.isInteger(k))) return Math.pow(c, k) * Math.expm1(k * Math.log1p(ratio));
    return Math.pow(c + a, k) - Math.pow(c, k);
  },
  /** f(x + a) - f(x) for sin and cos, written as products so no cancellation happens. */
  sindiff: (c: number, a: number): number => 2 * Math.cos(c + a / 2) * Math.sin(a / 2),
  cosdiff: (c: number, a: number): number => -2 * Math.sin(c + a / 2) * Math.sin(a / 2),
};

const M = (name: keyof typeof Math & string, arity = 1): FunctionSpec => ({
  minArgs: arity,
  maxArgs: arity,
  js: `Math.${name}`,
  impl: Math[name] as (...args: number[]) => number,
});
const H = (name: keyof typeof helpers, min = 1, max = min): FunctionSpec => ({
  minArgs: min,
  maxArgs: max,
  js: `H.${name}`,
  impl: helpers[name] as (...args: number[]) => number,
});

export const FUNCTIONS: Readonly<Record<string, FunctionSpec>> = {
  sqrt: M('sqrt'),
  cbrt: M('cbrt'),
  exp: M('exp'),
  expm1: M('expm1'),
  log: { minArgs: 1, maxArgs: 2, js: 'Math.log', impl: (x: number, b?: number) => (b === undefined ? Math.log(x) : Math.log(x) / Math.log(b)) },
  log10: M('log10'),
  log2: M('log2'),
  log1p: M('log1p'),
  sin: M('sin'),
  cos: M('cos'),
  tan: M('tan'),
  sec: H('sec'),
  csc: H('csc'),
  cot: H('cot'),
  asin: M('asin'),
  acos: M('acos'),
  atan: M('atan'),
  atan2: M('atan2', 2),
  sinh: M('sinh'),
  cosh: M('cosh'),
  tanh: M('tanh'),
  asinh: M('asinh'),
  acosh: M('acosh'),
  atanh: M('atanh'),
  abs: M('abs'),
  sign: M('sign'),
  floor: M('floor'),
  ceil: M('ceil'),
  pow: M('pow', 2),
  nthRoot: H('nthRoot', 2),
  min: { minArgs: 1, maxArgs: 16, js: 'Math.min', impl: Math.min },
  max: { minArgs: 1, maxArgs: 16, js: 'Math.max', impl: Math.max },
  gamma: H('gamma'),
  lgamma: H('lgamma'),
  erf: H('erf'),
  zeta: H('zeta'),
  factorial: H('factorial'),
};

/** Names users may write that mean a function of the table (mathjs has no `ln`). */
export const FUNCTION_ALIASES: Readonly<Record<string, string>> = { ln: 'log' };

/** Constants an expression may use unless a flow declares a parameter or coupling of that name. */
export const CONSTANTS: Readonly<Record<string, number>> = {
  pi: Math.PI,
  PI: Math.PI,
  e: Math.E,
  E: Math.E,
  tau: 2 * Math.PI,
  Infinity: Number.POSITIVE_INFINITY,
  inf: Number.POSITIVE_INFINITY,
};

/** Names of parameters, couplings, rates and variables that would hide a function. */
export function isReservedName(name: string): boolean {
  return name in FUNCTIONS || name in FUNCTION_ALIASES;
}
