/**
 * Which function checks which claim kind. Flow kinds receive the compiled model; the others
 * only the context (signatures FlowCheck and PlainCheck in types.ts).
 */
import { checkCoefficient } from './checks/coefficient';
import { checkEpsilonCoefficient } from './checks/epsilonCoefficient';
import { checkIdentity } from './checks/identity';
import { checkIntegral } from './checks/integral';
import { checkOrder } from './checks/order';
import { checkFixedPoint } from './checks/fixedPoint';
import { checkStability } from './checks/stability';
import { checkLogExponent } from './logExponent';
import type { CompiledModel } from './model';
import type { ClaimKind, ClaimOfKind, FlowCheck, PlainCheck } from './types';

export type RegistryEntry<K extends ClaimKind = ClaimKind> =
  | { flow: false; check: PlainCheck<ClaimOfKind<K>> }
  | { flow: true; check: FlowCheck<ClaimOfKind<K>, CompiledModel> };

export const REGISTRY: { [K in ClaimKind]: RegistryEntry<K> } = {
  identity: { flow: false, check: checkIdentity },
  order: { flow: false, check: checkOrder },
  coefficient: { flow: false, check: checkCoefficient },
  integral: { flow: false, check: checkIntegral },
  'fixed-point': { flow: true, check: checkFixedPoint },
  stability: { flow: true, check: checkStability },
  'epsilon-coefficient': { flow: true, check: checkEpsilonCoefficient },
  'log-exponent': { flow: true, check: checkLogExponent },
};
