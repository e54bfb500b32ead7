// The integrator: explicit extrapolation (odex) with an automatic switch to RODAS4 on stiffness.
export { integrate } from './integrate';
export { luFactor, luSolve } from './linalg';
export type {
  Rhs,
  Jacobian,
  IntegrateOptions,
  IntegrateResult,
  IntegrateOutcome,
  IntegrateStats,
  IntegrationMethod,
  Tolerance,
} from './types';
export { EXPLICIT_NAME, IMPLICIT_NAME } from './types';
