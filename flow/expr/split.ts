/**
 * A term split at zero couplings: f(g) = f(0) + delta(g), with delta written so that evaluating it
 * never subtracts two nearly equal floating-point numbers (the anomalous part of a rate is tiny
 * deep in the infrared while f(0) is of order one).
 */
import { type Term, add, sub, mul, div, neg, call, num, dependsOn, substitute } from './term';

export interface SplitTerm {
  /** f at zero couplings. */
  base: Term;
  /** f - f(0); null when f does not depend on the couplings. */
  delta: Term | null;
}

/** f(A) - f(c) for functions without a cancellation-free form (rare in rates). */
function plainDifference(f: string, args: readonly Term[], parts: readonly SplitTerm[]): Term {
  return sub({ t: 'call', f, args }, { t: 'call', f, args: parts.map((part) => part.base) });
}

export function splitAtZero(term: Term, couplings: ReadonlySet<string>): SplitTerm {
  const zero = new Map([...couplings].map((name) => [name, num(0)] as const));
  const go = (x: Term): SplitTerm => {
    if (!dependsOn(x, couplings)) return { base: x, delta: null };
    switch (x.t) {
      case 'sym':
        return { base: num(0), delta: x };
      case 'neg': {
        const a = go(x.a);
        return { base: neg(a.base), delta: a.delta && neg(a.delta) };
      }
      case 'op': {
        const a = go(x.a);
        const b = go(x.b);
        switch (x.op) {
          case '+':
            return { base: add(a.base, b.base), delta: a.delta && b.delta ? add(a.delta, b.delta) : (a.delta ?? b.delta) };
          case '-':
            return { base: sub(a.base, b.base), delta: a.delta && b.delta ? sub(a.delta, b.delta) : (a.delta ?? (b.delta && neg(b.delta))) };
          case '*': {
            // AB - A0 B0 = dA * B + A0 * dB
            const left = a.delta ? mul(a.delta, x.b) : null;
            const right = b.delta ? mul(a.base, b.delta) : null;
            return { base: mul(a.base, b.base), delta: left && right ? add(left, right) : (left ?? right) };
          }
          case '/': {
            const base = div(a.base, b.base);
            if (!b.delta) return { base, delta: div(a.delta!, b.base) };
            // A/B - A0/B0 = (dA B0 - A0 dB) / (B B0)
            const numerator = a.delta ? sub(mul(a.delta, b.base), mul(a.base, b.delta)) : neg(mul(a.base, b.delta));
            return { base, delta: div(numerator, mul(x.b, b.base)) };
          }
          default: {
            if (!b.delta) return { base: { t: 'op', op: '^', a: a.base, b: b.base }, delta: call('powdiff', a.base, a.delta!, b.base) };
            // A^B with B depending on the couplings: exp(B ln A)
            return go(call('exp', mul(x.b, call('log', x.a))));
          }
        }
      }
      case 'call': {
        const parts = x.args.map(go);
        const base: Term = { t: 'call', f: x.f, args: parts.map((part) => part.base) };
        const [first] = parts;
        if (parts.length === 1 && first?.delta) {
          const c = first.base;
          const d = first.delta;
          switch (x.f) {
            case 'exp':
              return { base, delta: mul(base, call('expm1', d)) };
            case 'expm1':
              return { base, delta: mul(call('exp', c), call('expm1', d)) };
            case 'log':
              return { base, delta: call('log1p', div(d, c)) };
            case 'log1p':
              return { base, delta: call('log1p', div(d, add(num(1), c))) };
            case 'sqrt':
              return { base, delta: div(d, add(call('sqrt', x.args[0]!), base)) };
            case 'sin':
              return { base, delta: call('sindiff', c, d) };
            case 'cos':
              return { base, delta: call('cosdiff', c, d) };
            default:
              break;
          }
        }
        return { base, delta: plainDifference(x.f, x.args, parts) };
      }
      default:
        return { base: substitute(x, zero), delta: null };
    }
  };
  return go(term);
}
