/** Helpers shared by the checks: reading values and points, verdicts, number formatting. */
import { ClaimInputError, ExpressionError } from '../errors';
import { compileScalar, parseTerm, requireKnown, symbolsOf, type Term } from '../expr';
import type { CompiledModel, ModelPoint } from '../model';
import type { CouplingPoint, Status, ValueInput } from '../types';

// Numbers in messages come from the one formatting module (full precision stays in the JSON fields).
import { formatNumber as fmt } from '../format';
export { fmt };
export { formatUncertainty as fmtUncertainty, formatMeasurement as fmtMeasurement } from '../format';

/**
 * holds when |measured - expected| + uncertainty <= tolerance, fails when
 * |measured - expected| - uncertainty > tolerance, inconclusive in between.
 */
export function verdict(difference: number, uncertainty: number, tolerance: number): Status {
  const d = Math.abs(difference);
  if (!Number.isFinite(d) || !Number.isFinite(uncertainty)) return 'inconclusive';
  if (d + uncertainty <= tolerance) return 'holds';
  if (d - uncertainty > tolerance) return 'fails';
  return 'inconclusive';
}

/** A value (number or expression in the flow's parameters), evaluated at the given parameter values. */
export function parameterValue(input: ValueInput, where: string, parameters: Readonly<Record<string, number>>): number {
  const names = Object.keys(parameters);
  const term = parseTerm(input, where, new Set(names));
  requireKnown(term, String(input), where, new Set(names), `a value may use numbers, constants (pi, e) and the parameters (${names.join(', ') || 'none'})`);
  const value = compileScalar(term, names)(names.map((name) => parameters[name]!));
  if (Number.isNaN(value)) throw new ClaimInputError(where, `${where}: "${String(input)}" is not a number at the flow's parameters`);
  return value;
}

/** A parsed value with the parameters it uses (so callers know whether it varies with eps). */
export interface ParameterExpression {
  term: Term;
  uses: ReadonlySet<string>;
  at(parameters: Readonly<Record<string, number>>): number;
}

export function parameterExpression(input: ValueInput, where: string, model: CompiledModel): ParameterExpression {
  const names = model.parameterNames;
  const term = parseTerm(input, where, model.declared);
  requireKnown(term, String(input), where, new Set(names), `a value may use numbers, constants (pi, e) and the parameters (${names.join(', ') || 'none'})`);
  const fn = compileScalar(term, names);
  return {
    term,
    uses: symbolsOf(term),
    at: (parameters) => fn(names.map((name) => parameters[name]!)),
  };
}

/** A point in coupling space from a claim, one expression per coupling (all couplings, no others). */
export function couplingPoint(input: CouplingPoint, where: string, model: CompiledModel): ParameterExpression[] {
  for (const name of Object.keys(input)) {
    if (!model.couplings.includes(name)) {
      throw new ClaimInputError(`${where}.${name}`, `${where}.${name}: "${name}" is not a coupling (couplings: ${model.couplings.join(', ') || 'none'})`);
    }
  }
  return model.couplings.map((name) => {
    if (!(name in input)) throw new ClaimInputError(`${where}.${name}`, `${where}.${name}: missing (give a value for every coupling)`);
    return parameterExpression(input[name]!, `${where}.${name}`, model);
  });
}

export function evaluatePoint(expressions: readonly ParameterExpression[], point: ModelPoint): Float64Array {
  return Float64Array.from(expressions.map((expression) => expression.at(point.parameters)));
}

export function positionRecord(model: CompiledModel, x: ArrayLike<number>): Record<string, number> {
  const record: Record<string, number> = {};
  model.couplings.forEach((name, i) => (record[name] = x[i]!));
  return record;
}

export function describePosition(model: CompiledModel, x: ArrayLike<number>): string {
  return model.couplings.map((name, i) => `${name} = ${fmt(x[i]!)}`).join(', ');
}

export function requireParameter(model: CompiledModel, name: string, where: string): void {
  if (!model.parameterNames.includes(name)) {
    throw new ClaimInputError(where, `${where}: "${name}" is not a parameter of the flow (parameters: ${model.parameterNames.join(', ') || 'none'})`);
  }
}

export { ExpressionError };
