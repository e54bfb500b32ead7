/**
 * Which function checks which claim kind. Flow kinds receive the compiled model; the others
 * only the context. To wire the log-exponent module: import its check here and put it in the
 * 'log-exponent' entry (signature FlowCheck<LogExponentClaim, CompiledModel> from types.ts).
 */
import type { CompiledModel } from './model';
import type { CheckOutcome, ClaimKind, ClaimOfKind, FlowCheck, PlainCheck } from './types';

export type RegistryEntry<K extends ClaimKind = ClaimKind> =
  | { flow: false; check: PlainCheck<ClaimOfKind<K>> }
  | { flow: true; check: FlowCheck<ClaimOfKind<K>, CompiledModel> };

const unavailable = (what: string) => (): CheckOutcome => ({
  status: 'invalid',
  message: `${what} checks are not available in this build`,
  method: 'none',
});

export const REGISTRY: { [K in ClaimKind]: RegistryEntry<K> } = {
  identity: { flow: false, check: unavailable('identity') },
  order: { flow: false, check: unavailable('order') },
  coefficient: { flow: false, check: unavailable('coefficient') },
  integral: { flow: false, check: unavailable('integral') },
  'fixed-point': { flow: true, check: unavailable('fixed-point') },
  stability: { flow: true, check: unavailable('stability') },
  'epsilon-coefficient': { flow: true, check: unavailable('epsilon-coefficient') },
  'log-exponent': { flow: true, check: unavailable('log-exponent') },
};
