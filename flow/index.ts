/**
 * Marginalia's solver: read a flow and its claims, check every claim, return a report.
 * Pure and isomorphic (runs in a Web Worker and in Node).
 */
export * from './types';
export { checkClaims, checkClaimsAsync, checkClaimFile, DEFAULT_TIME_LIMIT_MS, type CheckOptions, type FileCheck } from './runner';
export { parseClaimFile, parseClaim, type FileParse, type ClaimParse } from './claimFile';
export { compileModel, type CompiledModel, type ModelPoint, type RateFunctions, type CompiledQuantity, type TaylorTarget } from './model';
export { ExpressionError, ClaimInputError, CheckStopped } from './errors';
export {
  traceTrajectory,
  type Trajectory,
  type TrajectoryBranch,
  type TrajectoryEnd,
  type TrajectoryOptions,
  type TrajectoryPoint,
  type TrajectoryResult,
} from './trajectory';
export { integrate, type IntegrateOptions, type IntegrateResult, type Rhs, type Jacobian } from './ode';
