/**
 * Sanity flags shown beside every flow verdict. The main one: at marginality (field(0) = 0 and
 * a vanishing Jacobian at zero couplings) the quadratic term must make each coupling marginally
 * irrelevant, dg/dl = -b g^2 with b > 0. A flow typed in the wrong convention has the opposite
 * sign and otherwise runs silently onto a spurious zero.
 */
import type { CompiledModel } from './model';
import type { SanityFlag } from './types';

const SMALL = 1e-12;

function formatNumber(value: number): string {
  return Number.isInteger(value) ? String(value) : value.toPrecision(6);
}

/**
 * The marginal-sign flag, evaluated with the expansion parameter (if the flow has it) set to 0,
 * i.e. at the marginal dimension.
 */
export function marginalSignFlag(model: CompiledModel, expansionParameter = 'eps'): SanityFlag {
  const n = model.dimension;
  if (n === 0) return { check: 'marginal-sign', ok: true, message: 'the flow has no couplings' };
  const overrides = model.parameterNames.includes(expansionParameter) ? { [expansionParameter]: 0 } : {};
  const where = expansionParameter in overrides ? `at ${expansionParameter} = 0` : 'at the declared parameters';
  let point;
  try {
    point = model.at(overrides);
  } catch {
    point = model.at();
  }
  const zero = new Float64Array(n);
  const field = new Float64Array(n);
  const jacobian = new Float64Array(n * n);
  point.field(zero, field);
  point.fieldJacobian(zero, jacobian);
  const constant = Math.max(...Array.from(field, Math.abs));
  const linear = Math.max(...Array.from(jacobian, Math.abs));
  if (!(constant <= SMALL) || !(linear <= SMALL)) {
    return {
      check: 'marginal-sign',
      ok: true,
      message: `not at marginality ${where} (the flow at zero couplings has ${constant > SMALL ? 'a constant' : 'a linear'} term), so the marginal-sign check does not apply`,
    };
  }
  const wrong: string[] = [];
  const notes: string[] = [];
  for (const coupling of model.couplings) {
    let b: number;
    try {
      b = point.taylor({ field: coupling }, coupling, 2)[2]!;
    } catch {
      notes.push(`${coupling}: no symbolic second derivative`);
      continue;
    }
    if (b < -SMALL) notes.push(`${coupling}: d${coupling}/dl = -${formatNumber(-b)} ${coupling}^2 + ...`);
    else if (b > SMALL) wrong.push(`${coupling}: d${coupling}/dl = +${formatNumber(b)} ${coupling}^2 + ...`);
    else notes.push(`${coupling}: no ${coupling}^2 term`);
  }
  const step = model.convention === 'map' ? ' (per step)' : '';
  if (wrong.length > 0) {
    const advice =
      model.convention === 'uv'
        ? 'if the entries are dg/dl, set the convention to "ir"'
        : model.convention === 'ir'
          ? 'if the entries are mu dg/dmu, set the convention to "uv"'
          : 'check the sign of the quadratic term of the map';
    return {
      check: 'marginal-sign',
      ok: false,
      message: `${where} ${wrong.join('; ')}${step}: the coupling grows in the infrared (marginally relevant); ${advice}`,
    };
  }
  return { check: 'marginal-sign', ok: true, message: `${where} every coupling is marginally irrelevant or has no quadratic term (${notes.join('; ')})${step}` };
}
