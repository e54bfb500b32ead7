/**
 * Locating fixed points: Newton from several starts with the symbolic Jacobian, deduplicated, each
 * with its eigenvalues and classification; and, for one coupling, the complex fixed points when no
 * real one is near the guess.
 */
import { type Term, differentiate, toMathString } from './expr';
import type { CompiledModel, ModelPoint } from './model';
import { eigenvalues } from './numerics/linalg';
import { newton, type NewtonResult } from './numerics/newton';
import { polynomialRoots } from './numerics/polynomial';
import type { Classification, Complex, FixedPointInfo } from './types';
import { compile as mathCompile, complex as mathComplex, type Complex as MathComplex } from 'mathjs';

export interface SearchOptions {
  /** Random starts in addition to the guess, its rescalings and zero. */
  starts: number;
  tolerance: number;
  maxIterations: number;
  /** A fixed point counts as "near" the guess within proximity * max(|guess|, 1e-3) (max norm). */
  proximity: number;
  random: () => number;
  checkpoint: () => void;
  /** Only the guess and the extra starts (used when tracking a branch as eps varies). */
  quick?: boolean;
  /** The point "near" is measured from (default: the guess). */
  reference?: Float64Array;
}

export interface SearchResult {
  /** The found fixed point nearest to the guess, when it is near. */
  located: Float64Array | null;
  /** All distinct fixed points found, nearest to the guess first. */
  all: Float64Array[];
  starts: number;
  converged: number;
  iterations: number;
  evaluations: number;
}

const maxAbs = (v: ArrayLike<number>): number => Math.max(0, ...Array.from(v, Math.abs));
const distance = (a: ArrayLike<number>, b: ArrayLike<number>): number => {
  let d = 0;
  for (let i = 0; i < a.length; i++) d = Math.max(d, Math.abs(a[i]! - b[i]!));
  return d;
};

function startsFor(guess: Float64Array, extra: readonly Float64Array[], options: SearchOptions): Float64Array[] {
  const starts = [guess, ...extra];
  if (options.quick) return starts;
  const n = guess.length;
  const size = Math.max(maxAbs(guess), 1e-3);
  for (const factor of [0.5, 2, 0.25, 1.5]) starts.push(guess.map((x) => x * factor));
  starts.push(new Float64Array(n));
  for (let k = 0; k < options.starts; k++) {
    // Spread over a box twice the guess's size, in every sign combination.
    starts.push(Float64Array.from({ length: n }, () => (2 * options.random() - 1) * 2 * size));
  }
  return starts;
}

export function searchFixedPoints(point: ModelPoint, n: number, guess: Float64Array, extra: readonly Float64Array[], options: SearchOptions): SearchResult {
  const system = { n, f: point.field, jacobian: point.fieldJacobian };
  const found: Float64Array[] = [];
  let converged = 0;
  let iterations = 0;
  let evaluations = 0;
  const starts = startsFor(guess, extra, options);
  for (const start of starts) {
    const result: NewtonResult = newton(system, start, { tolerance: options.tolerance, maxIterations: options.maxIterations, checkpoint: options.checkpoint });
    iterations += result.iterations;
    evaluations += result.evaluations;
    if (!result.converged) continue;
    converged++;
    const x = result.x;
    if (!found.some((y) => distance(x, y) <= 1e-7 * (1 + maxAbs(y)))) found.push(Float64Array.from(x));
  }
  const reference = options.reference ?? guess;
  found.sort((a, b) => distance(a, reference) - distance(b, reference));
  const nearest = found[0];
  const reach = options.proximity * Math.max(maxAbs(reference), 1e-3);
  const located = nearest && distance(nearest, reference) <= reach ? nearest : null;
  return { located, all: found, starts: starts.length, converged, iterations, evaluations };
}

/** Eigenvalues (infrared convention; lambda for maps), exponents for maps, and the classification. */
export function describeFixedPoint(model: CompiledModel, point: ModelPoint, x: Float64Array, marginal: number): FixedPointInfo & { complete: boolean } {
  const n = model.dimension;
  const matrix = new Float64Array(n * n);
  point.stabilityMatrix(x, matrix);
  const values = eigenvalues(matrix, n);
  const field = new Float64Array(n);
  point.field(x, field);
  const position: Record<string, number> = {};
  model.couplings.forEach((name, i) => (position[name] = x[i]!));
  if (!values) {
    return { position, eigenvalues: [], classification: [], relevant: 0, residual: maxAbs(field), complete: false };
  }
  const isMap = model.convention === 'map';
  const exponents = isMap ? values.map((v) => Math.log(Math.hypot(v.re, v.im))) : undefined;
  const classification: Classification[] = values.map((v, i) => {
    const y = isMap ? exponents![i]! : v.re;
    return y > marginal ? 'relevant' : y < -marginal ? 'irrelevant' : 'marginal';
  });
  return {
    position,
    eigenvalues: values,
    ...(exponents ? { exponents } : {}),
    classification,
    relevant: classification.filter((c) => c === 'relevant').length,
    residual: maxAbs(field),
    complete: true,
  };
}

function isZeroTerm(term: Term): boolean {
  return term.t === 'num' && term.v === 0;
}

/** The polynomial coefficients of a one-coupling field, if it is a polynomial of degree <= 16. */
function polynomialCoefficients(model: CompiledModel, point: ModelPoint): number[] | null {
  const coupling = model.couplings[0]!;
  let term = model.fieldTerms[0]!;
  for (let degree = 0; degree <= 16; degree++) {
    let next: Term;
    try {
      next = differentiate(term, coupling, model.declared, 'flow.beta');
    } catch {
      return null;
    }
    if (isZeroTerm(next)) return point.taylor({ field: coupling }, coupling, degree);
    term = next;
  }
  return null;
}

function complexNewton(model: CompiledModel, point: ModelPoint, guess: number, checkpoint: () => void): Complex[] {
  const coupling = model.couplings[0]!;
  const fieldTerm = model.fieldTerms[0]!;
  let derivativeTerm: Term;
  try {
    derivativeTerm = differentiate(fieldTerm, coupling, model.declared, 'flow.beta');
  } catch {
    return [];
  }
  const f = mathCompile(toMathString(fieldTerm));
  const df = mathCompile(toMathString(derivativeTerm));
  const scope: Record<string, unknown> = { ...point.parameters };
  const roots: Complex[] = [];
  const size = Math.max(Math.abs(guess), 1e-3);
  for (const [re, im] of [[1, 0.5], [1, -0.5], [0.5, 1], [2, 1], [-1, 0.5]] as const) {
    let z: Complex = { re: guess * re || size * re, im: size * im };
    for (let iteration = 0; iteration < 80; iteration++) {
      checkpoint();
      scope[coupling] = mathComplex(z.re, z.im);
      const value = mathComplex(f.evaluate(scope) as MathComplex | number);
      const slope = mathComplex(df.evaluate(scope) as MathComplex | number);
      const d = slope.re * slope.re + slope.im * slope.im;
      const step = { re: (value.re * slope.re + value.im * slope.im) / d, im: (value.im * slope.re - value.re * slope.im) / d };
      z = { re: z.re - step.re, im: z.im - step.im };
      if (!Number.isFinite(z.re) || !Number.isFinite(z.im)) break;
      if (Math.hypot(step.re, step.im) <= 1e-14 * (1 + Math.hypot(z.re, z.im))) {
        const root = z;
        if (Math.abs(root.im) > 1e-10 * (1 + Math.abs(root.re)) && !roots.some((r) => Math.hypot(r.re - root.re, r.im - root.im) < 1e-8)) {
          roots.push({ re: root.re, im: root.im }, { re: root.re, im: -root.im });
        }
        break;
      }
    }
  }
  return roots;
}

export interface ComplexSearch {
  /** Real fixed points when the field is a polynomial (all of them). */
  real: number[] | null;
  complex: Complex[];
  method: 'polynomial roots' | 'complex Newton';
}

/** For one coupling: the complex fixed points (and, for a polynomial field, all real ones). */
export function complexFixedPoints(model: CompiledModel, point: ModelPoint, guess: number, checkpoint: () => void): ComplexSearch | null {
  if (model.dimension !== 1) return null;
  const coefficients = polynomialCoefficients(model, point);
  if (coefficients) {
    const roots = polynomialRoots(coefficients);
    return {
      real: roots.filter((r) => r.im === 0).map((r) => r.re).sort((a, b) => a - b),
      complex: roots.filter((r) => r.im !== 0),
      method: 'polynomial roots',
    };
  }
  return { real: null, complex: complexNewton(model, point, guess, checkpoint), method: 'complex Newton' };
}

export function formatComplex(z: Complex): string {
  const re = Number(z.re.toPrecision(8));
  const im = Number(Math.abs(z.im).toPrecision(8));
  return `${re} ${z.im < 0 ? '-' : '+'} ${im}i`;
}
