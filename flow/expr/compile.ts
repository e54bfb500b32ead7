/**
 * Terms to plain JavaScript functions over a slot vector. The generated source is assembled
 * only from slot indices, numbers we format ourselves, operators and names from the function
 * table: no user text reaches it. Where code generation is forbidden (a strict Content Security
 * Policy), the same term is compiled to nested closures instead.
 */
import { FUNCTIONS, helpers } from './functions';
import { BoundedCache } from './cache';
import { type Term, toMathString } from './term';

export type ScalarFunction = (slots: ArrayLike<number>) => number;
export type VectorFunction = (slots: ArrayLike<number>, out: Float64Array) => void;

function literal(v: number): string {
  if (Number.isNaN(v)) return 'NaN';
  if (v === Number.POSITIVE_INFINITY) return 'Infinity';
  if (v === Number.NEGATIVE_INFINITY) return '(-Infinity)';
  return v < 0 || Object.is(v, -0) ? `(${String(v)})` : String(v);
}

function slotIndex(name: string, slots: ReadonlyMap<string, number>): number {
  const index = slots.get(name);
  if (index === undefined) throw new Error(`internal: symbol "${name}" has no slot`);
  return index;
}

/** Temporaries for integer powers of compound bases, declared at the top of the generated function. */
interface Emitter {
  temporaries: number;
}

function integerPower(base: string, k: number, simple: boolean, emitter: Emitter): string {
  if (simple) return `(${Array.from({ length: k }, () => base).join(' * ')})`;
  const t = `t${emitter.temporaries++}`;
  return `((${t} = ${base}), ${Array.from({ length: k }, () => t).join(' * ')})`;
}

function emit(term: Term, slots: ReadonlyMap<string, number>, emitter: Emitter = { temporaries: 0 }): string {
  const recurse = (x: Term): string => emit(x, slots, emitter);
  switch (term.t) {
    case 'num':
    case 'const':
      return literal(term.v);
    case 'sym':
      return `s[${slotIndex(term.name, slots)}]`;
    case 'neg':
      return `(-${recurse(term.a)})`;
    case 'op':
      if (term.op === '^') {
        // Small integer powers as products: exact like Math.pow for these, and much faster.
        if (term.b.t === 'num' && Number.isInteger(term.b.v) && term.b.v >= 2 && term.b.v <= 6) {
          const simple = term.a.t === 'sym' || term.a.t === 'num' || term.a.t === 'const';
          return integerPower(recurse(term.a), term.b.v, simple, emitter);
        }
        return `Math.pow(${recurse(term.a)}, ${recurse(term.b)})`;
      }
      return `(${recurse(term.a)} ${term.op} ${recurse(term.b)})`;
    case 'call': {
      const spec = FUNCTIONS[term.f] ?? internalSpec(term.f);
      const js = term.f === 'log' && term.args.length === 2 ? 'H.logb' : spec.js;
      return `${js}(${term.args.map(recurse).join(', ')})`;
    }
  }
}

/** Functions used only by terms flow/ builds itself (the anomalous-part forms). */
const INTERNAL: Readonly<Record<string, { js: string; impl: (...args: number[]) => number }>> = {
  powdiff: { js: 'H.powdiff', impl: helpers.powdiff },
  sindiff: { js: 'H.sindiff', impl: helpers.sindiff },
  cosdiff: { js: 'H.cosdiff', impl: helpers.cosdiff },
};

function internalSpec(name: string): { js: string; impl: (...args: number[]) => number } {
  const spec = INTERNAL[name];
  if (!spec) throw new Error(`internal: unknown function "${name}"`);
  return spec;
}

function implOf(name: string, arity: number): (...args: number[]) => number {
  if (name === 'log' && arity === 2) return helpers.logb;
  return FUNCTIONS[name]?.impl ?? internalSpec(name).impl;
}

// ---------------------------------------------------------------------------------------------
// Closure compilation (no code generation)

function closure(term: Term, slots: ReadonlyMap<string, number>): ScalarFunction {
  switch (term.t) {
    case 'num':
    case 'const': {
      const v = term.v;
      return () => v;
    }
    case 'sym': {
      const i = slotIndex(term.name, slots);
      return (s) => s[i]!;
    }
    case 'neg': {
      const a = closure(term.a, slots);
      return (s) => -a(s);
    }
    case 'op': {
      const a = closure(term.a, slots);
      const b = closure(term.b, slots);
      switch (term.op) {
        case '+':
          return (s) => a(s) + b(s);
        case '-':
          return (s) => a(s) - b(s);
        case '*':
          return (s) => a(s) * b(s);
        case '/':
          return (s) => a(s) / b(s);
        default:
          return (s) => Math.pow(a(s), b(s));
      }
    }
    case 'call': {
      const f = implOf(term.f, term.args.length);
      const args = term.args.map((arg) => closure(arg, slots));
      if (args.length === 1) {
        const [a] = args as [ScalarFunction];
        return (s) => f(a(s));
      }
      if (args.length === 2) {
        const [a, b] = args as [ScalarFunction, ScalarFunction];
        return (s) => f(a(s), b(s));
      }
      return (s) => f(...args.map((arg) => arg(s)));
    }
  }
}

let codeGenerationAllowed: boolean | undefined;

/** For tests: force closure compilation as if code generation were forbidden. */
export function setCodeGeneration(allowed: boolean | undefined): void {
  codeGenerationAllowed = allowed;
}

function generate<T>(body: string): T | undefined {
  if (codeGenerationAllowed === false) return undefined;
  try {
    const factory = new Function('H', `"use strict";\n${body}`) as (h: typeof helpers) => T;
    codeGenerationAllowed = true;
    return factory(helpers);
  } catch (error) {
    if (error instanceof EvalError || (error instanceof Error && /unsafe-eval|Content Security/i.test(error.message))) {
      codeGenerationAllowed = false;
      return undefined;
    }
    throw error;
  }
}

function slotMap(slots: readonly string[]): Map<string, number> {
  return new Map(slots.map((name, index) => [name, index]));
}

function declarations(emitter: Emitter): string {
  return emitter.temporaries === 0 ? '' : `let ${Array.from({ length: emitter.temporaries }, (_, i) => `t${i}`).join(', ')};\n`;
}

const scalarCache = new BoundedCache<string, ScalarFunction>(4000);
const vectorCache = new BoundedCache<string, VectorFunction>(500);

/** Compile (cached per expression and slot layout). */
export function compileScalar(term: Term, slots: readonly string[]): ScalarFunction {
  const key = `${slots.join(',')}\u0000${toMathString(term)}`;
  let fn = scalarCache.get(key);
  if (!fn) {
    fn = compileScalarUncached(term, slots);
    scalarCache.set(key, fn);
  }
  return fn;
}

export function compileVector(terms: readonly Term[], slots: readonly string[]): VectorFunction {
  const key = `${slots.join(',')}\u0000${terms.map(toMathString).join('\u0001')}`;
  let fn = vectorCache.get(key);
  if (!fn) {
    fn = compileVectorUncached(terms, slots);
    vectorCache.set(key, fn);
  }
  return fn;
}

function compileScalarUncached(term: Term, slots: readonly string[]): ScalarFunction {
  const map = slotMap(slots);
  const emitter: Emitter = { temporaries: 0 };
  const body = emit(term, map, emitter);
  const generated = generate<ScalarFunction>(`return function (s) {\n${declarations(emitter)}return ${body};\n};`);
  return generated ?? closure(term, map);
}

function compileVectorUncached(terms: readonly Term[], slots: readonly string[]): VectorFunction {
  const map = slotMap(slots);
  const emitter: Emitter = { temporaries: 0 };
  const lines = terms.map((term, i) => `o[${i}] = ${emit(term, map, emitter)};`).join('\n');
  const generated = generate<VectorFunction>(`return function (s, o) {\n${declarations(emitter)}${lines}\n};`);
  if (generated) return generated;
  const parts = terms.map((term) => closure(term, map));
  return (s, o) => {
    for (let i = 0; i < parts.length; i++) o[i] = parts[i]!(s);
  };
}
