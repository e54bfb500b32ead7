// Public types of the integrator. Everything works on Float64Array state vectors; the right-hand
// side writes into a caller-owned buffer so no step allocates.

/** y' = f(t, y): writes the derivative into `dydt` (length n). */
export type Rhs = (t: number, y: Float64Array, dydt: Float64Array) => void;

/** Jacobian df/dy at (t, y), written row-major: jac[i * n + j] = d f_i / d y_j. */
export type Jacobian = (t: number, y: Float64Array, jac: Float64Array) => void;

export type IntegrationMethod = 'auto' | 'explicit' | 'implicit';

/** A per-component tolerance may be given as a list. */
export type Tolerance = number | ArrayLike<number>;

export interface IntegrateOptions {
  /** Relative tolerance (default 1e-8). */
  rtol?: Tolerance;
  /** Absolute tolerance (default 1e-10). */
  atol?: Tolerance;
  /** Bound on steps, accepted and rejected, over both methods (default 100 000). */
  maxSteps?: number;
  /** 'auto' (default): explicit extrapolation, switching to the implicit method on stiffness. */
  method?: IntegrationMethod;
  /** Analytic Jacobian for the implicit method; otherwise forward differences. */
  jacobian?: Jacobian;
  /** performance.now() in ms after which the integration stops with outcome 'deadline'. */
  deadline?: number;
  /** Called after each accepted step; return false to stop (outcome 'stopped'). */
  onStep?: (t: number, y: Float64Array) => boolean | void;
  /** Stop at the first sign change of this function, located to the solver's accuracy. */
  event?: (t: number, y: Float64Array) => number;
  /** |y_i| beyond this counts as escape to infinity; the RG time of escape is located. */
  escape?: number;
  /** Only the first `escapeComponents` entries are watched for escape (default: all). */
  escapeComponents?: number;
  /**
   * Tolerances for the implicit method (after an 'auto' switch, or with method 'implicit');
   * default rtol and atol. RODAS4 is of order 4, so a tolerance that suits the high-order
   * explicit method can cost it many small steps.
   */
  implicitTolerance?: { rtol?: Tolerance; atol?: Tolerance };
  /** Accepted explicit steps after which 'auto' switches to the implicit method (default 2000). */
  explicitBudget?: number;
  /**
   * Times (in the order of integration, inside [t0, t1]) at which to report the state; they are
   * filled from the method's own continuous output and do not shorten the steps.
   */
  outputTimes?: ArrayLike<number>;
  /** Initial step size (default: estimated from the right-hand side). */
  initialStep?: number;
  /** Largest step size (default: the whole interval). */
  maxStep?: number;
}

export type IntegrateOutcome =
  | 'reached' // t1 reached
  | 'event' // the event function changed sign at t
  | 'stopped' // onStep returned false at t
  | 'escaped' // a watched component passed the escape bound at t
  | 'non-finite' // the solution or its derivative became NaN or infinite after t
  | 'max-steps' // the step bound was exhausted at t
  | 'stalled' // the step size fell below the rounding level at t
  | 'deadline'; // the time budget ran out at t

export interface IntegrateStats {
  steps: number;
  accepted: number;
  rejected: number;
  evaluations: number;
  jacobians: number;
}

export interface IntegrateResult {
  /** Where the integration ended (t1, the event, the escape, the last good point). */
  t: number;
  /** The state at t (the last finite state when the outcome is 'non-finite'). */
  y: Float64Array;
  outcome: IntegrateOutcome;
  /** 'explicit (odex)', 'implicit (RODAS4)', or 'explicit (odex), then implicit (RODAS4)'. */
  method: string;
  /** RG time at which 'auto' switched to the implicit method. */
  switchedAt?: number;
  /** Why it switched. */
  switchReason?: 'stiffness' | 'step budget' | 'non-finite trial step';
  stats: IntegrateStats;
  /** The state at each requested output time reached before the integration ended. */
  outputs: { t: number; y: Float64Array }[];
  /** Size of the last accepted step (signed; 0 if none): a good initialStep to continue from t. */
  lastStep?: number;
}

export const EXPLICIT_NAME = 'explicit (odex)';
export const IMPLICIT_NAME = 'implicit (RODAS4)';
