/**
 * The checked expression tree everything in flow/ computes with. It is built from a mathjs
 * parse tree after the whitelist check (parse.ts); compile.ts turns it into plain functions.
 */

export type BinaryOp = '+' | '-' | '*' | '/' | '^';

export type Term =
  | { readonly t: 'num'; readonly v: number }
  /** A named constant (pi, e, ...): numeric in compiled code, a symbol in exact algebra. */
  | { readonly t: 'const'; readonly name: string; readonly v: number }
  | { readonly t: 'sym'; readonly name: string }
  | { readonly t: 'op'; readonly op: BinaryOp; readonly a: Term; readonly b: Term }
  | { readonly t: 'neg'; readonly a: Term }
  | { readonly t: 'call'; readonly f: string; readonly args: readonly Term[] };

export const num = (v: number): Term => ({ t: 'num', v });
export const sym = (name: string): Term => ({ t: 'sym', name });
export const call = (f: string, ...args: Term[]): Term => ({ t: 'call', f, args });
export const ZERO = num(0);
export const ONE = num(1);

const isNum = (x: Term, v?: number): x is { t: 'num'; v: number } => x.t === 'num' && (v === undefined || x.v === v);

/** Builders with the obvious simplifications (x + 0, 1 * x, ...); nothing that changes a value. */
export function add(a: Term, b: Term): Term {
  if (isNum(a, 0)) return b;
  if (isNum(b, 0)) return a;
  if (b.t === 'neg') return sub(a, b.a);
  return { t: 'op', op: '+', a, b };
}
export function sub(a: Term, b: Term): Term {
  if (isNum(b, 0)) return a;
  if (isNum(a, 0)) return neg(b);
  return { t: 'op', op: '-', a, b };
}
export function mul(a: Term, b: Term): Term {
  if (isNum(a, 1)) return b;
  if (isNum(b, 1)) return a;
  if (isNum(a, 0) || isNum(b, 0)) return ZERO;
  return { t: 'op', op: '*', a, b };
}
export function div(a: Term, b: Term): Term {
  if (isNum(b, 1)) return a;
  if (isNum(a, 0)) return ZERO;
  return { t: 'op', op: '/', a, b };
}
export function pow(a: Term, b: Term): Term {
  if (isNum(b, 1)) return a;
  if (isNum(b, 0)) return ONE;
  return { t: 'op', op: '^', a, b };
}
export function neg(a: Term): Term {
  if (a.t === 'num') return num(-a.v);
  if (a.t === 'neg') return a.a;
  return { t: 'neg', a };
}

/** Names of the free symbols of a term, in order of first appearance. */
export function symbolsOf(term: Term, into: Set<string> = new Set()): Set<string> {
  switch (term.t) {
    case 'sym':
      into.add(term.name);
      break;
    case 'op':
      symbolsOf(term.a, into);
      symbolsOf(term.b, into);
      break;
    case 'neg':
      symbolsOf(term.a, into);
      break;
    case 'call':
      for (const arg of term.args) symbolsOf(arg, into);
      break;
    default:
      break;
  }
  return into;
}

export function dependsOn(term: Term, names: ReadonlySet<string>): boolean {
  switch (term.t) {
    case 'sym':
      return names.has(term.name);
    case 'op':
      return dependsOn(term.a, names) || dependsOn(term.b, names);
    case 'neg':
      return dependsOn(term.a, names);
    case 'call':
      return term.args.some((arg) => dependsOn(arg, names));
    default:
      return false;
  }
}

/** Replace symbols by terms (symbols not in the map stay). */
/** The operation `op` of a and b through its builder above (which folds what it can). */
export function binary(op: BinaryOp, a: Term, b: Term): Term {
  switch (op) {
    case '+':
      return add(a, b);
    case '-':
      return sub(a, b);
    case '*':
      return mul(a, b);
    case '/':
      return div(a, b);
    default:
      return pow(a, b);
  }
}

export function substitute(term: Term, replace: ReadonlyMap<string, Term>): Term {
  switch (term.t) {
    case 'sym':
      return replace.get(term.name) ?? term;
    case 'op': {
      return binary(term.op, substitute(term.a, replace), substitute(term.b, replace));
    }
    case 'neg':
      return neg(substitute(term.a, replace));
    case 'call':
      return { t: 'call', f: term.f, args: term.args.map((arg) => substitute(arg, replace)) };
    default:
      return term;
  }
}

function formatNumber(v: number): string {
  if (Number.isNaN(v)) return 'NaN';
  if (v === Number.POSITIVE_INFINITY) return 'Infinity';
  if (v === Number.NEGATIVE_INFINITY) return '(-Infinity)';
  const text = String(v);
  return v < 0 ? `(${text})` : text;
}

/** mathjs syntax, fully parenthesised (used for high-precision evaluation and as a cache key). */
export function toMathString(term: Term): string {
  switch (term.t) {
    case 'num':
      return formatNumber(term.v);
    case 'const':
      return term.name === 'inf' ? 'Infinity' : term.name;
    case 'sym':
      return term.name;
    case 'op':
      return `(${toMathString(term.a)} ${term.op} ${toMathString(term.b)})`;
    case 'neg':
      return `(-${toMathString(term.a)})`;
    case 'call':
      return `${term.f}(${term.args.map(toMathString).join(', ')})`;
  }
}

export function termSize(term: Term): number {
  switch (term.t) {
    case 'op':
      return 1 + termSize(term.a) + termSize(term.b);
    case 'neg':
      return 1 + termSize(term.a);
    case 'call':
      return term.args.reduce((total, arg) => total + termSize(arg), 1);
    default:
      return 1;
  }
}
