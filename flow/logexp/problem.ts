// Reading a log-exponent claim against a compiled flow: the flow at the marginal dimension, the
// scaling variable and the observable split into their values at zero couplings and their
// anomalous parts (separated symbolically by the model), the start point and the claimed values.

import { ClaimInputError } from '../errors';
import type { CompiledModel, ModelPoint } from '../model';
import { dependsOn } from '../expr';
import type { LogExponentClaim, ValueInput } from '../types';

/** Fields a log-exponent claim may carry beyond the ones every claim has. */
const OWN_FIELDS = new Set(['id', 'kind', 'tolerance', 'settings', 'note', 'scaling', 'observable', 'start', 'value', 'power', 'parameter']);

export type ObservableForm =
  | { kind: 'rate'; name: string; atZero: number; anomalous: (g: ArrayLike<number>) => number }
  | {
      kind: 'integral';
      /** Weight per rate name: O = int_0^l* exp(sum_r w_r int_0^l (rate_r - rate_r(0))) dl. */
      weights: { name: string; weight: number; anomalous: (g: ArrayLike<number>) => number }[];
      anomalous: (g: ArrayLike<number>) => number;
    };

export interface LogExponentProblem {
  model: CompiledModel;
  point: ModelPoint;
  /** Parameters overridden to reach the marginal dimension, e.g. { eps: 0 }. */
  overrides: Record<string, number>;
  expansionParameter: string;
  couplings: readonly string[];
  start: Float64Array;
  scaling: { name: string; atZero: number; anomalous: (g: ArrayLike<number>) => number };
  observable: ObservableForm;
  /** x = y_O / y_t exactly (0 for an integral along the flow). */
  exactPower: number;
  claimedValue: number | null;
  claimedPower: number | null;
  /** Human-readable observable, for messages. */
  observableLabel: string;
}

/** A number, or an expression in the parameters (evaluated at the marginal dimension). */
function constantValue(model: CompiledModel, point: ModelPoint, input: ValueInput, where: string): number {
  const quantity = model.quantity(input, where);
  if (dependsOn(quantity.term, new Set(model.couplings))) {
    throw new ClaimInputError(where, `${where}: must be a number or depend on the parameters only, not on the couplings`);
  }
  const value = point.evaluate(quantity, new Float64Array(model.dimension));
  if (!Number.isFinite(value)) throw new ClaimInputError(where, `${where}: "${String(input)}" is not a finite number`);
  return value;
}

function rateOf(model: CompiledModel, point: ModelPoint, name: string, where: string) {
  if (!model.rateNames.includes(name)) {
    const known = model.rateNames.length ? model.rateNames.join(', ') : 'none';
    throw new ClaimInputError(where, `${where}: "${name}" is not a rate of this flow (rates: ${known})`);
  }
  const fns = point.rate(name);
  return { name, atZero: fns.atZero, anomalous: fns.anomalous };
}

/** `where` names the claim in messages, e.g. "claims[3]". */
export function readProblem(claim: LogExponentClaim, model: CompiledModel, where = 'claim'): LogExponentProblem {
  const at = (field: string): string => `${where}.${field}`;
  for (const key of Object.keys(claim)) {
    if (!OWN_FIELDS.has(key)) {
      throw new ClaimInputError(at(key), `${at(key)}: unknown field of a log-exponent claim (fields: scaling, observable, start, value, power, parameter, tolerance, settings, note)`);
    }
  }
  if (claim.value === undefined && claim.power === undefined) {
    throw new ClaimInputError(at('value'), `${at('value')}: missing; a log-exponent claim states value (the exponent p of |ln t0|) and/or power (the exponent x of t0)`);
  }
  const expansionParameter = typeof claim.parameter === 'string' ? claim.parameter : 'eps';
  if (claim.parameter !== undefined && !model.parameterNames.includes(expansionParameter)) {
    throw new ClaimInputError(at('parameter'), `${at('parameter')}: "${expansionParameter}" is not a parameter of this flow (parameters: ${model.parameterNames.join(', ') || 'none'})`);
  }
  const overrides: Record<string, number> = model.parameterNames.includes(expansionParameter) ? { [expansionParameter]: 0 } : {};
  const point = model.at(overrides);
  if (model.dimension === 0) throw new ClaimInputError(at('start'), `${at('start')}: the flow has no couplings, so there is nothing to integrate`);

  const start = new Float64Array(model.dimension);
  for (const name of Object.keys(claim.start)) {
    if (!model.couplings.includes(name)) {
      throw new ClaimInputError(at(`start.${name}`), `${at(`start.${name}`)}: "${name}" is not a coupling (couplings: ${model.couplings.join(', ')})`);
    }
  }
  model.couplings.forEach((name, i) => {
    const input = claim.start[name];
    if (input === undefined) throw new ClaimInputError(at(`start.${name}`), `${at(`start.${name}`)}: missing (the start needs a value for every coupling)`);
    start[i] = constantValue(model, point, input, at(`start.${name}`));
  });

  if (start.every((v) => v === 0)) {
    throw new ClaimInputError(at('start'), `${at('start')}: every coupling is zero, so the flow stays at the Gaussian fixed point and has no log correction to measure`);
  }
  const scaling = rateOf(model, point, claim.scaling, at('scaling'));
  if (!(scaling.atZero > 0)) {
    throw new ClaimInputError(
      at('scaling'),
      `${at('scaling')}: the rate of "${claim.scaling}" at zero couplings is ${scaling.atZero}; the scaling variable must be relevant (a positive rate y_t) so that t(l*) = 1 is reached`,
    );
  }

  let observable: ObservableForm;
  let exactPower: number;
  let observableLabel: string;
  if (typeof claim.observable === 'string') {
    const rate = rateOf(model, point, claim.observable, at('observable'));
    observable = { kind: 'rate', ...rate };
    exactPower = rate.atZero / scaling.atZero;
    observableLabel = claim.observable;
  } else {
    const entries = Object.entries(claim.observable.integral);
    if (entries.length === 0) throw new ClaimInputError(at('observable.integral'), `${at('observable.integral')}: give at least one rate name with its weight`);
    const weights = entries.map(([name, w]) => {
      const rate = rateOf(model, point, name, at(`observable.integral.${name}`));
      return { name, weight: constantValue(model, point, w, at(`observable.integral.${name}`)), anomalous: rate.anomalous };
    });
    const anomalous = (g: ArrayLike<number>): number => {
      let sum = 0;
      for (const w of weights) sum += w.weight * w.anomalous(g);
      return sum;
    };
    observable = { kind: 'integral', weights, anomalous };
    exactPower = 0;
    observableLabel = `the integral of exp(${weights.map((w) => `${w.weight} * int (${w.name} - ${w.name}(0))`).join(' + ')})`;
  }

  const claimedValue = claim.value === undefined ? null : constantValue(model, point, claim.value, at('value'));
  const claimedPower = claim.power === undefined ? null : constantValue(model, point, claim.power, at('power'));
  return {
    model,
    point,
    overrides,
    expansionParameter,
    couplings: model.couplings,
    start,
    scaling,
    observable,
    exactPower,
    claimedValue,
    claimedPower,
    observableLabel,
  };
}
