/**
 * A compiled flow: the infrared field dg/dl (or the map), its symbolic Jacobian, the rates whole
 * and as their anomalous part (separated symbolically), Taylor coefficients at zero couplings,
 * all as plain functions over one slot vector [couplings..., parameters...]. Parameters can be
 * overridden per evaluation point (e.g. eps), and parameters defined from others follow.
 */
import { ClaimInputError, ExpressionError } from './errors';
import {
  BoundedCache,
} from './expr/cache';
import {
  type ScalarFunction,
  type Term,
  type VectorFunction,
  compileScalar,
  compileVector,
  differentiateTimes,
  differentiate,
  isReservedName,
  neg,
  num,
  parseTerm,
  requireKnown,
  splitAtZero,
  sub,
  substitute,
  symbolsOf,
} from './expr';
import type { Convention, FlowSpec, ValueInput } from './types';

const NAME = /^[A-Za-z_\u0370-\u03FF][A-Za-z0-9_\u0370-\u03FF]*$/;
/** Words the mathjs parser reads as operators. */
const KEYWORDS = new Set(['mod', 'to', 'in', 'and', 'or', 'not', 'xor', 'end']);

export function checkName(name: string, field: string, what: string): void {
  if (!NAME.test(name)) throw new ClaimInputError(field, `${field}: "${name}" is not a valid ${what} name (letters, digits and _, starting with a letter)`);
  if (KEYWORDS.has(name)) throw new ClaimInputError(field, `${field}: "${name}" is a reserved word and cannot name a ${what}`);
  if (isReservedName(name)) throw new ClaimInputError(field, `${field}: "${name}" is the name of a function and cannot name a ${what}`);
}

export interface RateFunctions {
  /** rate(g) */
  whole: ScalarFunction;
  /** rate(g) - rate(0), evaluated without cancellation. */
  anomalous: ScalarFunction;
  /** rate(0) at these parameters. */
  atZero: number;
}

export type TaylorTarget = { field: string } | { rate: string };

/** A model bound to parameter values. All functions take couplings in `couplings` order. */
export interface ModelPoint {
  readonly parameters: Readonly<Record<string, number>>;
  /** The slot vector [couplings..., parameters...]; write couplings into 0..n-1 to call compiled functions directly. */
  readonly slots: Float64Array;
  /** dg/dl for flows; F(g) - g for maps (zero at fixed points in both cases). */
  field(g: ArrayLike<number>, out: Float64Array): void;
  /** d field_i / d g_j, row-major n x n. */
  fieldJacobian(g: ArrayLike<number>, out: Float64Array): void;
  /** The matrix whose eigenvalues classify a fixed point: the field's Jacobian (flows) or DF (maps). */
  stabilityMatrix(g: ArrayLike<number>, out: Float64Array): void;
  /** Maps only: g_{j+1} = F(g_j). */
  step(g: ArrayLike<number>, out: Float64Array): void;
  /** Compiled rate functions; throws ExpressionError if the rate is malformed. */
  rate(name: string): RateFunctions;
  /** Evaluate a compiled quantity at couplings g. */
  evaluate(quantity: CompiledQuantity, g: ArrayLike<number>): number;
  /** Taylor coefficients c_0..c_order of the target in one coupling, the others at zero. */
  taylor(target: TaylorTarget, coupling: string, order: number): number[];
}

export interface CompiledQuantity {
  readonly source: string;
  readonly term: Term;
  readonly fn: ScalarFunction;
}

export interface CompiledModel {
  readonly spec: FlowSpec;
  readonly convention: Convention;
  readonly couplings: readonly string[];
  readonly dimension: number;
  /** In dependency order. */
  readonly parameterNames: readonly string[];
  readonly rateNames: readonly string[];
  /** The declared parameter values. */
  readonly parameters: Readonly<Record<string, number>>;
  /** Names that shadow constants in expressions of this flow (couplings, parameters, rates). */
  readonly declared: ReadonlySet<string>;
  /** "symbolic", or "finite-difference" when mathjs cannot differentiate a function used in beta. */
  readonly jacobianMethod: 'symbolic' | 'finite-difference';
  /** Field terms (dg/dl, or F - g for maps), per coupling. */
  readonly fieldTerms: readonly Term[];
  at(overrides?: Readonly<Record<string, number>>): ModelPoint;
  /** Compile an expression in couplings, parameters and rate names (rate names stand for their expressions). */
  quantity(source: ValueInput, where: string): CompiledQuantity;
  /** A rate's term (couplings and parameters only). */
  rateTerm(name: string): Term;
  /** Describes what a flow expression may use, for messages. */
  readonly origin: string;
}

function listOf(names: readonly string[]): string {
  return names.length === 0 ? 'none' : names.join(', ');
}

function parameterOrder(spec: FlowSpec, declared: ReadonlySet<string>): { order: string[]; terms: Map<string, Term> } {
  const names = Object.keys(spec.parameters);
  const terms = new Map<string, Term>();
  const nameSet = new Set(names);
  for (const name of names) {
    const field = `flow.parameters.${name}`;
    const input = spec.parameters[name]!;
    const term = parseTerm(input, field, declared);
    requireKnown(term, String(input), field, nameSet, `a parameter value may use numbers, constants (pi, e) and other parameters (${listOf(names)})`);
    terms.set(name, term);
  }
  const order: string[] = [];
  const state = new Map<string, 'visiting' | 'done'>();
  const visit = (name: string, path: string[]): void => {
    const seen = state.get(name);
    if (seen === 'done') return;
    if (seen === 'visiting') {
      throw new ClaimInputError(`flow.parameters.${name}`, `flow.parameters.${name}: the parameters depend on each other in a circle (${[...path, name].join(' -> ')})`);
    }
    state.set(name, 'visiting');
    for (const dependency of symbolsOf(terms.get(name)!)) visit(dependency, [...path, name]);
    state.set(name, 'done');
    order.push(name);
  };
  for (const name of names) visit(name, []);
  return { order, terms };
}

class Model implements CompiledModel {
  readonly convention: Convention;
  readonly couplings: readonly string[];
  readonly dimension: number;
  readonly parameterNames: readonly string[];
  readonly rateNames: readonly string[];
  readonly parameters: Readonly<Record<string, number>>;
  readonly declared: ReadonlySet<string>;
  readonly jacobianMethod: 'symbolic' | 'finite-difference';
  readonly fieldTerms: readonly Term[];
  readonly origin: string;

  private readonly slotNames: readonly string[];
  private readonly parameterFns: ScalarFunction[];
  private readonly fieldFn: VectorFunction;
  private readonly stepFn: VectorFunction | null;
  private readonly jacobianFn: VectorFunction | null;
  private readonly rateTerms = new Map<string, Term | ExpressionError | ClaimInputError>();
  private readonly rateFns = new Map<string, { whole: ScalarFunction; anomalous: ScalarFunction; zero: ScalarFunction }>();
  private readonly taylorFns = new Map<string, ScalarFunction[]>();
  private readonly quantities = new BoundedCache<string, CompiledQuantity>(500);

  constructor(readonly spec: FlowSpec) {
    this.convention = spec.convention;
    this.couplings = [...spec.couplings];
    this.dimension = this.couplings.length;
    const parameterNames = Object.keys(spec.parameters);
    this.rateNames = Object.keys(spec.rates ?? {});

    const seen = new Map<string, string>();
    const claimName = (name: string, field: string, what: string): void => {
      checkName(name, field, what);
      const other = seen.get(name);
      if (other) throw new ClaimInputError(field, `${field}: "${name}" is already used as ${other}`);
      seen.set(name, `a ${what}`);
    };
    this.couplings.forEach((name, i) => claimName(name, `flow.couplings[${i}]`, 'coupling'));
    for (const name of parameterNames) claimName(name, `flow.parameters.${name}`, 'parameter');
    for (const name of this.rateNames) claimName(name, `flow.rates.${name}`, 'rate');
    for (const name of this.couplings) {
      if (!(name in spec.beta)) throw new ClaimInputError(`flow.beta.${name}`, `flow.beta.${name}: missing (every coupling needs its beta function)`);
    }
    for (const name of Object.keys(spec.beta)) {
      if (!this.couplings.includes(name)) throw new ClaimInputError(`flow.beta.${name}`, `flow.beta.${name}: "${name}" is not a coupling (couplings: ${listOf(this.couplings)})`);
    }
    this.declared = new Set([...this.couplings, ...parameterNames, ...this.rateNames]);
    this.origin = `a flow expression may use the couplings (${listOf(this.couplings)}), the parameters (${listOf(parameterNames)}) and the rate names (${listOf(this.rateNames)})`;

    const { order, terms } = parameterOrder(spec, this.declared);
    this.parameterNames = order;
    this.slotNames = [...this.couplings, ...order];
    this.parameterFns = order.map((name) => compileScalar(terms.get(name)!, this.slotNames));
    this.parameters = this.evaluateParameters({});

    const betaTerms = this.couplings.map((name) => this.flowTerm(spec.beta[name]!, `flow.beta.${name}`, []));
    this.fieldTerms = betaTerms.map((term, i) => {
      if (this.convention === 'uv') return neg(term);
      if (this.convention === 'map') return sub(term, { t: 'sym', name: this.couplings[i]! });
      return term;
    });
    this.fieldFn = compileVector(this.fieldTerms, this.slotNames);
    this.stepFn = this.convention === 'map' ? compileVector(betaTerms, this.slotNames) : null;

    let jacobianTerms: Term[] | null = [];
    try {
      for (const term of this.fieldTerms) {
        for (const coupling of this.couplings) jacobianTerms.push(differentiate(term, coupling, this.declared, 'flow.beta'));
      }
    } catch (error) {
      if (!(error instanceof ExpressionError)) throw error;
      jacobianTerms = null;
    }
    this.jacobianMethod = jacobianTerms ? 'symbolic' : 'finite-difference';
    this.jacobianFn = jacobianTerms ? compileVector(jacobianTerms, this.slotNames) : null;
  }

  /** Parse a flow expression, substitute rate names (refusing cycles) and check its symbols. */
  private flowTerm(input: ValueInput, where: string, path: readonly string[]): Term {
    const term = parseTerm(input, where, this.declared);
    const allowed = new Set([...this.couplings, ...Object.keys(this.spec.parameters), ...this.rateNames]);
    requireKnown(term, String(input), where, allowed, this.origin);
    const used = [...symbolsOf(term)].filter((name) => this.rateNames.includes(name));
    if (used.length === 0) return term;
    const replace = new Map<string, Term>();
    for (const name of used) {
      if (path.includes(name)) {
        throw new ClaimInputError(`flow.rates.${name}`, `flow.rates.${name}: the rates refer to each other in a circle (${[...path, name].join(' -> ')})`);
      }
      replace.set(name, this.resolveRate(name, [...path, name]));
    }
    return substitute(term, replace);
  }

  private resolveRate(name: string, path: readonly string[]): Term {
    const known = this.rateTerms.get(name);
    if (known instanceof Error) throw known;
    if (known) return known;
    try {
      const term = this.flowTerm(this.spec.rates![name]!, `flow.rates.${name}`, path);
      this.rateTerms.set(name, term);
      return term;
    } catch (error) {
      if (error instanceof ExpressionError || error instanceof ClaimInputError) this.rateTerms.set(name, error);
      throw error;
    }
  }

  rateTerm(name: string): Term {
    if (!this.rateNames.includes(name)) {
      throw new ClaimInputError('rate', `"${name}" is not a rate of this flow (rates: ${listOf(this.rateNames)})`);
    }
    return this.resolveRate(name, [name]);
  }

  private rateFunctions(name: string): { whole: ScalarFunction; anomalous: ScalarFunction; zero: ScalarFunction } {
    let fns = this.rateFns.get(name);
    if (!fns) {
      const term = this.rateTerm(name);
      const split = splitAtZero(term, new Set(this.couplings));
      fns = {
        whole: compileScalar(term, this.slotNames),
        anomalous: compileScalar(split.delta ?? num(0), this.slotNames),
        zero: compileScalar(split.base, this.slotNames),
      };
      this.rateFns.set(name, fns);
    }
    return fns;
  }

  private taylorFunctions(target: TaylorTarget, coupling: string, order: number): ScalarFunction[] {
    const index = this.couplings.indexOf(coupling);
    if (index < 0) throw new ClaimInputError('coupling', `"${coupling}" is not a coupling (couplings: ${listOf(this.couplings)})`);
    const key = `${'field' in target ? `f:${target.field}` : `r:${target.rate}`}\u0000${coupling}`;
    let fns = this.taylorFns.get(key);
    if (!fns || fns.length <= order) {
      let term: Term;
      if ('field' in target) {
        const i = this.couplings.indexOf(target.field);
        if (i < 0) throw new ClaimInputError('coupling', `"${target.field}" is not a coupling`);
        term = this.fieldTerms[i]!;
      } else {
        term = this.rateTerm(target.rate);
      }
      fns = [];
      for (let k = 0; k <= order; k++) {
        fns.push(compileScalar(differentiateTimes(term, coupling, k, this.declared, 'flow'), this.slotNames));
      }
      this.taylorFns.set(key, fns);
    }
    return fns;
  }

  evaluateParameters(overrides: Readonly<Record<string, number>>): Record<string, number> {
    for (const name of Object.keys(overrides)) {
      if (!this.parameterNames.includes(name)) {
        throw new ClaimInputError('parameter', `"${name}" is not a parameter of this flow (parameters: ${listOf(this.parameterNames)})`);
      }
    }
    const slots = new Float64Array(this.slotNames.length);
    const values: Record<string, number> = {};
    this.parameterNames.forEach((name, i) => {
      const override = overrides[name];
      const value = override ?? this.parameterFns[i]!(slots);
      if (!Number.isFinite(value)) throw new ClaimInputError(`flow.parameters.${name}`, `flow.parameters.${name}: the value is not a finite number`);
      slots[this.dimension + i] = value;
      values[name] = value;
    });
    return values;
  }

  at(overrides: Readonly<Record<string, number>> = {}): ModelPoint {
    const parameters = Object.keys(overrides).length === 0 ? this.parameters : this.evaluateParameters(overrides);
    const n = this.dimension;
    const slots = new Float64Array(this.slotNames.length);
    this.parameterNames.forEach((name, i) => (slots[n + i] = parameters[name]!));
    const load = (g: ArrayLike<number>): void => {
      for (let i = 0; i < n; i++) slots[i] = g[i]!;
    };
    const field = (g: ArrayLike<number>, out: Float64Array): void => {
      load(g);
      this.fieldFn(slots, out);
    };
    const jacobianFn = this.jacobianFn;
    const fieldJacobian = jacobianFn
      ? (g: ArrayLike<number>, out: Float64Array): void => {
          load(g);
          jacobianFn(slots, out);
        }
      : finiteDifferenceJacobian(field, n);
    const rateCache = new Map<string, RateFunctions>();
    const model = this;
    return {
      parameters,
      slots,
      field,
      fieldJacobian,
      stabilityMatrix(g, out) {
        fieldJacobian(g, out);
        if (model.convention === 'map') for (let i = 0; i < n; i++) out[i * n + i]! += 1;
      },
      step(g, out) {
        if (!model.stepFn) throw new ClaimInputError('flow.convention', 'a discrete step exists only for convention "map"');
        load(g);
        model.stepFn(slots, out);
      },
      rate(name) {
        let fns = rateCache.get(name);
        if (!fns) {
          const compiled = model.rateFunctions(name);
          const zeroSlots = Float64Array.from(slots);
          zeroSlots.fill(0, 0, n);
          const atZero = compiled.zero(zeroSlots);
          fns = {
            whole: (g) => (load(g), compiled.whole(slots)),
            anomalous: (g) => (load(g), compiled.anomalous(slots)),
            atZero,
          };
          rateCache.set(name, fns);
        }
        return fns;
      },
      evaluate(quantity, g) {
        load(g);
        return quantity.fn(slots);
      },
      taylor(target, coupling, order) {
        const fns = model.taylorFunctions(target, coupling, order);
        const zeroSlots = Float64Array.from(slots);
        zeroSlots.fill(0, 0, n);
        let factorial = 1;
        const coefficients: number[] = [];
        for (let k = 0; k <= order; k++) {
          if (k > 0) factorial *= k;
          coefficients.push(fns[k]!(zeroSlots) / factorial);
        }
        return coefficients;
      },
    };
  }

  quantity(source: ValueInput, where: string): CompiledQuantity {
    const key = `${where}\u0000${String(source)}`;
    let compiled = this.quantities.get(key);
    if (!compiled) {
      const term = this.flowTerm(source, where, []);
      compiled = { source: String(source), term, fn: compileScalar(term, this.slotNames) };
      this.quantities.set(key, compiled);
    }
    return compiled;
  }
}

function finiteDifferenceJacobian(field: (g: ArrayLike<number>, out: Float64Array) => void, n: number) {
  const plus = new Float64Array(n);
  const minus = new Float64Array(n);
  const probe = new Float64Array(n);
  return (g: ArrayLike<number>, out: Float64Array): void => {
    for (let j = 0; j < n; j++) {
      for (let i = 0; i < n; i++) probe[i] = g[i]!;
      const h = 1e-6 * (1 + Math.abs(g[j]!));
      probe[j] = g[j]! + h;
      field(probe, plus);
      probe[j] = g[j]! - h;
      field(probe, minus);
      for (let i = 0; i < n; i++) out[i * n + j] = (plus[i]! - minus[i]!) / (2 * h);
    }
  };
}

const models = new BoundedCache<string, CompiledModel>(64);

/** Compile a flow (cached per flow content). Throws ExpressionError or ClaimInputError naming the field. */
export function compileModel(spec: FlowSpec): CompiledModel {
  const key = JSON.stringify(spec);
  let model = models.get(key);
  if (!model) {
    model = new Model(spec);
    models.set(key, model);
  }
  return model;
}

/** Only the parameter values of a flow (for claims that need no couplings when beta is unusable). */
export function evaluateFlowParameters(spec: FlowSpec): Record<string, number> {
  const names = Object.keys(spec.parameters);
  for (const name of names) checkName(name, `flow.parameters.${name}`, 'parameter');
  const declared = new Set([...spec.couplings, ...names, ...Object.keys(spec.rates ?? {})]);
  const { order, terms } = parameterOrder(spec, declared);
  const slots = new Float64Array(order.length);
  const values: Record<string, number> = {};
  order.forEach((name, i) => {
    const value = compileScalar(terms.get(name)!, order)(slots);
    if (!Number.isFinite(value)) throw new ClaimInputError(`flow.parameters.${name}`, `flow.parameters.${name}: the value is not a finite number`);
    slots[i] = value;
    values[name] = value;
  });
  return values;
}
