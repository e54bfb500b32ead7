/**
 * The claim file, the result of one check, the check report, and the signature every check
 * function has. This module is the contract between flow/ and its callers (editor worker,
 * server at lock time, command line) and between the check modules inside flow/.
 */

/** A number, or an expression in mathjs syntax that evaluates to one ("2/5", "pi^4/15", "3*eps/(n+8)"). */
export type ValueInput = number | string;

/**
 * How the entries of `beta` are meant:
 * - "uv": beta_g = mu dg/dmu; the infrared flow in RG time l = -ln mu is dg/dl = -beta_g.
 * - "ir": the entries already are dg/dl.
 * - "map": the entries give g_{j+1} from g_j (one discrete RG step); RG time counts steps.
 */
export type Convention = 'uv' | 'ir' | 'map';

export interface FlowSpec {
  couplings: string[];
  /** Parameter values; an expression may use constants and other parameters (no cycles). */
  parameters: Record<string, ValueInput>;
  convention: Convention;
  /** One entry per coupling. */
  beta: Record<string, ValueInput>;
  /** d ln X / dl along the infrared flow (for a map: ln X_{j+1} - ln X_j), by name. */
  rates?: Record<string, ValueInput>;
}

export const CLAIM_KINDS = [
  'identity',
  'order',
  'coefficient',
  'integral',
  'fixed-point',
  'stability',
  'epsilon-coefficient',
  'log-exponent',
] as const;
export type ClaimKind = (typeof CLAIM_KINDS)[number];

/** Per-claim solver settings (names depend on the kind; see each check's defaults). */
export type SettingsInput = Record<string, number>;

export interface ClaimBase {
  id: string;
  /** Absolute tolerance; every kind has a sensible default. */
  tolerance?: number;
  /** Overrides of the kind's solver settings, e.g. { "points": 24 }. */
  settings?: SettingsInput;
  /** Free text shown beside the claim. */
  note?: string;
}

/** Sampling interval per free variable, e.g. { "x": [0, 1] }. */
export type Domain = Record<string, [ValueInput, ValueInput]>;

export interface IdentityClaim extends ClaimBase {
  kind: 'identity';
  lhs: ValueInput;
  rhs: ValueInput;
  domain?: Domain;
}

/** lhs = rhs + O(variable^order) as variable -> 0 (from above). */
export interface OrderClaim extends ClaimBase {
  kind: 'order';
  lhs: ValueInput;
  rhs: ValueInput;
  variable: string;
  order: number;
  domain?: Domain;
}

/** The variable^power Taylor coefficient of `of` at `at` equals `value`. */
export interface CoefficientClaim extends ClaimBase {
  kind: 'coefficient';
  of: ValueInput;
  variable: string;
  at?: ValueInput;
  power: number;
  value: ValueInput;
  domain?: Domain;
}

export interface IntegralClaim extends ClaimBase {
  kind: 'integral';
  integrand: ValueInput;
  variable: string;
  /** May be "-Infinity" / "Infinity". */
  from: ValueInput;
  to: ValueInput;
  value: ValueInput;
}

/** A point in coupling space: a number or an expression (may use parameters) per coupling. */
export type CouplingPoint = Record<string, ValueInput>;

export interface FixedPointClaim extends ClaimBase {
  kind: 'fixed-point';
  near: CouplingPoint;
  /** Claimed position; possibly a series in the expansion parameter. */
  value?: CouplingPoint;
  /** The claimed order of the series in `value`: checked as the expansion parameter varies. */
  order?: number;
  /** The expansion parameter (default "eps"). */
  parameter?: string;
}

/** A claimed eigenvalue: real (number or expression) or complex. */
export type EigenvalueInput = ValueInput | { re: ValueInput; im: ValueInput };

export interface StabilityClaim extends ClaimBase {
  kind: 'stability';
  near: CouplingPoint;
  /** Infrared convention (positive = relevant). For a map: the map's eigenvalues lambda, or y = ln|lambda| with form "y". */
  eigenvalues?: EigenvalueInput[];
  /** Number of relevant directions. */
  relevant?: number;
  /** For maps only: whether `eigenvalues` lists lambda (default) or y = ln|lambda|. */
  form?: 'lambda' | 'y';
}

export interface EpsilonCoefficientClaim extends ClaimBase {
  kind: 'epsilon-coefficient';
  /** Expression in couplings, parameters and rate names, evaluated at the fixed point. */
  quantity: ValueInput;
  near: CouplingPoint;
  power: number;
  value: ValueInput;
  /** The expansion parameter (default "eps"). */
  parameter?: string;
}

/**
 * An observable that is an integral along the flow rather than a rate:
 * O(l*) = integral_0^{l*} exp( sum_r w_r * integral_0^l (rate_r - rate_r(0)) dl' ) dl,
 * with weights w_r per rate name (the specific heat: { "t": 2 }).
 */
export interface IntegralObservable {
  integral: Record<string, ValueInput>;
}

export interface LogExponentClaim extends ClaimBase {
  kind: 'log-exponent';
  /** Rate name of the scaling variable t. */
  scaling: string;
  /** Rate name, or an integral along the flow. */
  observable: string | IntegralObservable;
  /** Initial couplings. */
  start: CouplingPoint;
  /** Claimed p in O ~ t0^-x |ln t0|^p. */
  value?: ValueInput;
  /** Claimed x in O ~ t0^-x |ln t0|^p. */
  power?: ValueInput;
  /** Further fields are the log-exponent module's own. */
  [extra: string]: unknown;
}

export type Claim =
  | IdentityClaim
  | OrderClaim
  | CoefficientClaim
  | IntegralClaim
  | FixedPointClaim
  | StabilityClaim
  | EpsilonCoefficientClaim
  | LogExponentClaim;

export type ClaimOfKind<K extends ClaimKind> = Extract<Claim, { kind: K }>;

export interface ClaimFile {
  flow: FlowSpec;
  /** Each claim is validated on its own: one malformed claim does not stop the others. */
  claims: readonly unknown[];
}

// ---------------------------------------------------------------------------------------------
// Results

export type Status = 'holds' | 'fails' | 'inconclusive' | 'invalid';

export interface Complex {
  re: number;
  im: number;
}

/** What a check measured: a number, a point in coupling space, or a list of (complex) eigenvalues. */
export type Measured = number | Record<string, number> | Array<number | Complex>;

export type Classification = 'relevant' | 'irrelevant' | 'marginal';

export interface FixedPointInfo {
  position: Record<string, number>;
  /** Infrared convention for flows; the map's Jacobian eigenvalues lambda for maps. */
  eigenvalues: Complex[];
  /** Maps only: y = ln|lambda| per eigenvalue. */
  exponents?: number[];
  classification: Classification[];
  relevant: number;
  /** Max norm of the flow (or map displacement) at the point. */
  residual: number;
}

export interface PlotSeries {
  name: string;
  points: Array<[number, number]>;
  style?: 'line' | 'points';
}

export interface PlotData {
  title: string;
  xLabel: string;
  yLabel: string;
  xScale?: 'linear' | 'log';
  yScale?: 'linear' | 'log';
  series: PlotSeries[];
}

export interface Evidence {
  /** Convergence plots, fits against eps, residual scaling. */
  plots?: PlotData[];
  fixedPoints?: FixedPointInfo[];
  /** Complex fixed points when no real one exists. */
  complexFixedPoints?: Array<Record<string, Complex>>;
  /** A point where a claimed identity is false. */
  counterexample?: Record<string, number>;
  /** Extracted expansion coefficients with their uncertainties. */
  coefficients?: Array<{ power: number; value: number; uncertainty: number; of?: string }>;
  /** Further named values worth showing (e.g. the analytic leading-order exponent). */
  values?: Record<string, number>;
}

export interface SanityFlag {
  /** Short stable name, e.g. "marginal-sign", "finite", "solver". */
  check: string;
  ok: boolean;
  message: string;
}

/** Solver settings and statistics: small named values. */
export type SettingsRecord = Record<string, number | string | boolean>;

export interface ClaimResult {
  id: string;
  kind: string;
  status: Status;
  measured: Measured | null;
  uncertainty: number | null;
  expected: Measured | null;
  tolerance: number | null;
  message: string;
  method: string;
  /** Solver settings used. */
  settings: SettingsRecord;
  /** The solver's own statistics (iterations, evaluations, outcome). */
  stats: SettingsRecord;
  ms: number;
  sanity: SanityFlag[];
  evidence: Evidence;
}

export interface ReportSummary {
  holds: number;
  fails: number;
  inconclusive: number;
  invalid: number;
}

export interface Report {
  claims: ClaimResult[];
  summary: ReportSummary;
}

/** A field of the input and what is wrong with it, e.g. { field: "claims[2].near", message: "..." }. */
export interface FieldError {
  field: string;
  message: string;
}

// ---------------------------------------------------------------------------------------------
// The check-function contract

/** What a check function returns; the runner adds id, kind and ms and fills omitted fields. */
export interface CheckOutcome {
  status: Status;
  message: string;
  method: string;
  measured?: Measured | null;
  uncertainty?: number | null;
  expected?: Measured | null;
  tolerance?: number | null;
  settings?: SettingsRecord;
  stats?: SettingsRecord;
  sanity?: SanityFlag[];
  evidence?: Evidence;
}

/** Handed to every check by the runner. */
export interface CheckContext {
  /** The claim's place in the file, for messages: "claims[3]". */
  where: string;
  /** Throws a stop signal when the time bound is reached or the caller cancelled; call it inside loops. */
  checkpoint(): void;
  /** Milliseconds left before the time bound. */
  remainingMs(): number;
  /** Parameter values of the flow (the flow's expressions evaluated). */
  parameters: Readonly<Record<string, number>>;
  /** The claim's settings merged over the given defaults; unknown names are refused as invalid input. */
  settings<T extends Record<string, number>>(defaults: T): T;
  /** True when the caller asked for tighter settings (e.g. a reviewer re-running a check). */
  tight: boolean;
  /** A reproducible uniform generator in [0, 1) (fixed random start per claim). */
  random(): number;
}

/**
 * A check of a claim kind that needs no flow (identity, order, coefficient, integral).
 * It may throw ClaimInputError (-> invalid) or let the runner's stop signal pass; anything else
 * it throws is caught by the runner and reported, never propagated.
 */
export type PlainCheck<C extends Claim> = (claim: C, ctx: CheckContext) => CheckOutcome;

/**
 * A check of a claim kind that needs the compiled flow (fixed point, stability, epsilon coefficient,
 * log exponent). `model` is the type exported by flow/model.ts (kept generic here so this file has
 * no imports).
 */
export type FlowCheck<C extends Claim, M> = (claim: C, model: M, ctx: CheckContext) => CheckOutcome;
