/**
 * Fitting data (x, y, optional error bars sigma of y) to the law y = A x^a |ln x|^p, with a or p
 * held at a value or left free: weighted nonlinear least squares (Levenberg–Marquardt, started
 * from the linear fit of ln y), uncertainties from the covariance matrix, chi^2 per degree of
 * freedom and its p-value; and whether the data agree with a claimed exponent within their errors.
 * Pure and isomorphic: imports nothing.
 */

export interface FitData {
  /** Plain arrays or typed ones (a fit worker receives Float64Arrays). */
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  /** Error bars (one standard deviation) of y; omitted when the data carry none. */
  sigma?: ArrayLike<number> | null;
}

/** An exponent held at a number, or left free (null or omitted). */
export interface FitSpec {
  a?: number | null;
  p?: number | null;
  /**
   * 'linear' (the default with error bars): chi^2 of y itself, the right measure for Gaussian
   * error bars on y. 'log' (the default without): chi^2 of ln y with error sigma/y, or every ln y
   * weighing the same without error bars — a linear problem, and the usual choice for power-law
   * data spanning decades, where each point should weigh by its relative scatter.
   */
  scale?: 'linear' | 'log';
}

export interface FittedParameter {
  value: number;
  /** One standard deviation; 0 for a held parameter. */
  uncertainty: number;
  held: boolean;
}

export interface PowerLogFit {
  A: FittedParameter;
  a: FittedParameter;
  p: FittedParameter;
  scale: 'linear' | 'log';
  /** Whether error bars were given; without them the uncertainties come from the scatter. */
  weighted: boolean;
  points: number;
  freeParameters: number;
  dof: number;
  chi2: number;
  /** chi^2 / dof (without error bars: the residual variance). */
  reducedChi2: number;
  /** Probability of a chi^2 at least this large if the law and the error bars are right; null without error bars or dof. */
  pValue: number | null;
  /** Covariance of the free parameters, in the order of `parameterNames` (A, then a, then p). */
  covariance: number[][];
  parameterNames: ('A' | 'a' | 'p')[];
  converged: boolean;
  iterations: number;
}

export class FitInputError extends Error {
  constructor(
    message: string,
    /** 0-based index of the offending point, when one point is at fault. */
    readonly index: number | null = null,
  ) {
    super(message);
    this.name = 'FitInputError';
  }
}

/** The law's value at x for fitted (or any) parameters. */
export function powerLog(params: { A: number; a: number; p: number }, x: number): number {
  const L = Math.abs(Math.log(x));
  return params.A * Math.pow(x, params.a) * (params.p === 0 ? 1 : Math.pow(L, params.p));
}

export function evaluateFit(fit: Pick<PowerLogFit, 'A' | 'a' | 'p'>, x: number): number {
  return powerLog({ A: fit.A.value, a: fit.a.value, p: fit.p.value }, x);
}

// ---- input -----------------------------------------------------------------------------------

interface Prepared {
  lnx: Float64Array;
  lnL: Float64Array;
  y: Float64Array;
  lnY: Float64Array;
  s: Float64Array;
  sign: number;
  weighted: boolean;
}

function prepare(data: FitData, spec: FitSpec): Prepared {
  const n = data.x.length;
  if (data.y.length !== n) throw new FitInputError(`x has ${n} values but y has ${data.y.length}.`);
  if (data.sigma && data.sigma.length !== n) throw new FitInputError(`x has ${n} values but the error bars have ${data.sigma.length}.`);
  const usesLog = spec.p !== 0;
  const lnx = new Float64Array(n);
  const lnL = new Float64Array(n);
  const y = new Float64Array(n);
  const lnY = new Float64Array(n);
  const s = new Float64Array(n);
  let sign = 0;
  for (let i = 0; i < n; i++) {
    const xi = data.x[i]!;
    const yi = data.y[i]!;
    if (!Number.isFinite(xi) || !(xi > 0)) throw new FitInputError(`x must be a positive number for x^a; point ${i + 1} has x = ${xi}.`, i);
    if (!Number.isFinite(yi) || yi === 0) throw new FitInputError(`y must be a non-zero number; point ${i + 1} has y = ${yi}.`, i);
    const si = data.sigma ? data.sigma[i]! : 1;
    if (!Number.isFinite(si) || !(si > 0)) throw new FitInputError(`Error bars must be greater than zero; point ${i + 1} has ${si}.`, i);
    const ySign = Math.sign(yi);
    if (sign === 0) sign = ySign;
    else if (ySign !== sign) throw new FitInputError(`y changes sign at point ${i + 1}; the law A x^a |ln x|^p keeps one sign.`, i);
    lnx[i] = Math.log(xi);
    const L = Math.abs(lnx[i]!);
    if (usesLog && L === 0) throw new FitInputError(`|ln x| is zero at x = 1 (point ${i + 1}), where |ln x|^p is not defined.`, i);
    lnL[i] = L === 0 ? 0 : Math.log(L);
    y[i] = yi;
    lnY[i] = Math.log(Math.abs(yi));
    s[i] = si;
  }
  return { lnx, lnL, y, lnY, s, sign, weighted: !!data.sigma };
}

// ---- small dense linear algebra (at most 3 x 3) ------------------------------------------------

/** Solves M v = b by Gaussian elimination with partial pivoting; null if M is singular. */
function solve(M: number[][], b: number[]): number[] | null {
  const k = b.length;
  const a = M.map((row, i) => [...row, b[i]!]);
  for (let c = 0; c < k; c++) {
    let pivot = c;
    for (let r = c + 1; r < k; r++) if (Math.abs(a[r]![c]!) > Math.abs(a[pivot]![c]!)) pivot = r;
    if (!(Math.abs(a[pivot]![c]!) > 0)) return null;
    [a[c], a[pivot]] = [a[pivot]!, a[c]!];
    for (let r = c + 1; r < k; r++) {
      const f = a[r]![c]! / a[c]![c]!;
      for (let q = c; q <= k; q++) a[r]![q]! -= f * a[c]![q]!;
    }
  }
  const v = new Array<number>(k).fill(0);
  for (let r = k - 1; r >= 0; r--) {
    let sum = a[r]![k]!;
    for (let q = r + 1; q < k; q++) sum -= a[r]![q]! * v[q]!;
    v[r] = sum / a[r]![r]!;
  }
  return v.every(Number.isFinite) ? v : null;
}

/** Inverse of a symmetric positive definite matrix through its scaled form (keeps the digits when scales differ). */
function inverse(M: number[][]): number[][] | null {
  const k = M.length;
  const d = M.map((row, i) => Math.sqrt(Math.abs(row[i]!)) || 1);
  const scaled = M.map((row, i) => row.map((v, j) => v / (d[i]! * d[j]!)));
  const columns: number[][] = [];
  for (let j = 0; j < k; j++) {
    const e = new Array<number>(k).fill(0);
    e[j] = 1;
    const col = solve(scaled, e);
    if (!col) return null;
    columns.push(col);
  }
  return M.map((_, i) => M.map((__, j) => columns[j]![i]! / (d[i]! * d[j]!)));
}

// ---- the fit ---------------------------------------------------------------------------------

/** Free parameters are ln|A| (always), then a and p when not held. */
interface Layout {
  freeA: boolean;
  freeP: boolean;
  heldA: number;
  heldP: number;
}

function unpack(theta: readonly number[], layout: Layout): { lnA: number; a: number; p: number } {
  let i = 1;
  const a = layout.freeA ? theta[i++]! : layout.heldA;
  const p = layout.freeP ? theta[i++]! : layout.heldP;
  return { lnA: theta[0]!, a, p };
}

type Scale = 'linear' | 'log' | 'start';

/**
 * chi^2 at theta and, when asked, the normal equations JᵀWJ and JᵀW r, in one pass without
 * allocating per point (a dataset may hold a million rows). The observation in the fit's scale:
 * y itself ('linear'); ln|y| with error sigma/|y| ('log'), every ln y weighing the same without
 * error bars; 'start' is the log fit that starts a linear one, weighted as the linear fit will weigh.
 */
function accumulate(d: Prepared, theta: readonly number[], layout: Layout, scale: Scale, normal?: { JtJ: number[][]; Jtr: number[] }): number {
  const { lnA, a, p } = unpack(theta, layout);
  const k = theta.length;
  const g = new Float64Array(3);
  let chi2 = 0;
  for (let i = 0; i < d.y.length; i++) {
    const logValue = lnA + a * d.lnx[i]! + p * d.lnL[i]!;
    let value: number;
    let obs: number;
    let sigma: number;
    let scaleFactor = 1;
    if (scale === 'linear') {
      value = d.sign * Math.exp(logValue);
      scaleFactor = value;
      obs = d.y[i]!;
      sigma = d.s[i]!;
    } else {
      value = logValue;
      obs = d.lnY[i]!;
      sigma = scale === 'log' && !d.weighted ? 1 : d.s[i]! / Math.abs(d.y[i]!);
    }
    const w = 1 / (sigma * sigma);
    const r = obs - value;
    chi2 += w * r * r;
    if (!normal) continue;
    let j = 0;
    g[j++] = scaleFactor;
    if (layout.freeA) g[j++] = d.lnx[i]! * scaleFactor;
    if (layout.freeP) g[j++] = d.lnL[i]! * scaleFactor;
    for (let u = 0; u < k; u++) {
      const wu = w * g[u]!;
      normal.Jtr[u]! += wu * r;
      const row = normal.JtJ[u]!;
      for (let v = 0; v <= u; v++) row[v]! += wu * g[v]!;
    }
  }
  if (normal) for (let u = 0; u < k; u++) for (let v = u + 1; v < k; v++) normal.JtJ[u]![v] = normal.JtJ[v]![u]!;
  return chi2;
}

function chiSquareOf(d: Prepared, theta: readonly number[], layout: Layout, scale: Scale): number {
  return accumulate(d, theta, layout, scale);
}

/** JᵀWJ and JᵀW r at theta. */
function normalEquations(d: Prepared, theta: readonly number[], layout: Layout, scale: Scale) {
  const k = theta.length;
  const normal = { JtJ: Array.from({ length: k }, () => new Array<number>(k).fill(0)), Jtr: new Array<number>(k).fill(0) };
  accumulate(d, theta, layout, scale, normal);
  return normal;
}

const MAX_ITERATIONS = 200;

/** Fits y = A x^a |ln x|^p; throws FitInputError for data the law cannot take. */
export function fitPowerLog(data: FitData, spec: FitSpec = {}): PowerLogFit {
  const scale = spec.scale ?? (data.sigma ? 'linear' : 'log');
  for (const name of ['a', 'p'] as const) {
    const v = spec[name];
    if (v !== undefined && v !== null && !Number.isFinite(v)) throw new FitInputError(`The held value of ${name} must be a finite number.`);
  }
  const d = prepare(data, spec);
  const layout: Layout = {
    freeA: spec.a === undefined || spec.a === null,
    freeP: spec.p === undefined || spec.p === null,
    heldA: spec.a ?? 0,
    heldP: spec.p ?? 0,
  };
  const k = 1 + (layout.freeA ? 1 : 0) + (layout.freeP ? 1 : 0);
  const n = d.y.length;
  const needed = d.weighted ? k : k + 1;
  if (n < needed) {
    throw new FitInputError(
      `A fit with ${k} free ${k === 1 ? 'parameter' : 'parameters'} needs at least ${needed} points${d.weighted ? '' : ' without error bars'}; there ${n === 1 ? 'is' : 'are'} ${n}.`,
    );
  }

  // Start: the linear fit of ln|y|, weighted by the relative error bars.
  const start = normalEquations(d, new Array<number>(k).fill(0), layout, scale === 'linear' ? 'start' : 'log');
  const initial = solve(start.JtJ, start.Jtr);
  if (!initial) throw new FitInputError(degenerate(layout));
  let theta: number[] = initial;
  let iterations = 0;
  let converged = scale === 'log';
  if (scale === 'log') {
    // ln y is linear in the parameters: one more Newton step polishes the solution's last digits.
    const { JtJ, Jtr } = normalEquations(d, theta, layout, 'log');
    const step = solve(JtJ, Jtr);
    if (step) theta = theta.map((t, i) => t + step[i]!);
    iterations = 1;
  } else {
    let chi2 = chiSquareOf(d, theta, layout, scale);
    let lambda = 1e-3;
    while (iterations < MAX_ITERATIONS) {
      iterations++;
      const { JtJ, Jtr } = normalEquations(d, theta, layout, scale);
      const damped = JtJ.map((row, i) => row.map((v, j) => (i === j ? v * (1 + lambda) : v)));
      const step = solve(damped, Jtr);
      if (!step) {
        lambda *= 10;
        if (lambda > 1e16) break;
        continue;
      }
      const trial: number[] = theta.map((t, i) => t + step[i]!);
      const trialChi2 = chiSquareOf(d, trial, layout, scale);
      if (Number.isFinite(trialChi2) && trialChi2 <= chi2) {
        const small = step.every((s, i) => Math.abs(s) <= 1e-10 * (Math.abs(trial[i]!) + 1e-10));
        const flat = chi2 - trialChi2 <= 1e-14 * Math.max(chi2, 1e-300);
        theta = trial;
        chi2 = trialChi2;
        lambda = Math.max(lambda / 10, 1e-12);
        if (small || flat) {
          converged = true;
          break;
        }
      } else {
        lambda *= 10;
        if (lambda > 1e16) {
          converged = true; // no step lowers chi^2 any more: at the minimum to working precision
          break;
        }
      }
    }
  }

  const chi2 = chiSquareOf(d, theta, layout, scale);
  const dof = n - k;
  const { JtJ } = normalEquations(d, theta, layout, scale);
  const covariance = inverse(JtJ);
  if (!covariance) throw new FitInputError(degenerate(layout));
  // Without error bars every sigma was 1: the scatter itself estimates the variance.
  const variance = d.weighted ? 1 : dof > 0 ? chi2 / dof : NaN;
  const cov = covariance.map((row) => row.map((v) => v * variance));
  const { lnA, a, p } = unpack(theta, layout);
  const A = d.sign * Math.exp(lnA);
  const names: ('A' | 'a' | 'p')[] = ['A'];
  if (layout.freeA) names.push('a');
  if (layout.freeP) names.push('p');
  const sd = (name: 'a' | 'p') => Math.sqrt(Math.max(0, cov[names.indexOf(name)]![names.indexOf(name)]!));
  // Covariance in (ln|A|, a, p) turned into one for (A, a, p): dA = A d(ln|A|).
  const jac = names.map((nm) => (nm === 'A' ? Math.abs(A) : 1));
  const covariancePublic = cov.map((row, i) => row.map((v, j) => v * jac[i]! * jac[j]!));

  return {
    A: { value: A, uncertainty: Math.sqrt(Math.max(0, covariancePublic[0]![0]!)), held: false },
    a: { value: a, uncertainty: layout.freeA ? sd('a') : 0, held: !layout.freeA },
    p: { value: p, uncertainty: layout.freeP ? sd('p') : 0, held: !layout.freeP },
    scale,
    weighted: d.weighted,
    points: n,
    freeParameters: k,
    dof,
    chi2,
    reducedChi2: dof > 0 ? chi2 / dof : NaN,
    pValue: d.weighted && dof > 0 ? chiSquareSurvival(chi2, dof) : null,
    covariance: covariancePublic,
    parameterNames: names,
    converged,
    iterations,
  };
}

function degenerate(layout: Layout): string {
  return layout.freeA && layout.freeP
    ? 'The data cannot tell x^a from |ln x|^p apart (too few distinct x): hold one exponent at a value.'
    : 'The data cannot fix the parameters: they need at least two distinct x.';
}

// ---- goodness of fit -------------------------------------------------------------------------

/** ln Gamma(z) for z > 0 (Lanczos, g = 7, nine terms; about 15 digits). */
export function logGamma(z: number): number {
  const c = [
    0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
    12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
  ];
  if (z < 0.5) return Math.log(Math.PI / Math.abs(Math.sin(Math.PI * z))) - logGamma(1 - z);
  const x = z - 1;
  let sum = c[0]!;
  for (let i = 1; i < 9; i++) sum += c[i]! / (x + i);
  const t = x + 7.5;
  return 0.5 * Math.log(2 * Math.PI) + (x + 0.5) * Math.log(t) - t + Math.log(sum);
}

/** The regularized upper incomplete gamma function Q(s, x) = Gamma(s, x) / Gamma(s). */
export function upperGammaRegularized(s: number, x: number): number {
  if (!(s > 0) || x < 0 || !Number.isFinite(x)) return x === Infinity ? 0 : NaN;
  if (x === 0) return 1;
  const front = Math.exp(-x + s * Math.log(x) - logGamma(s));
  if (x < s + 1) {
    // Series for the lower function P, then Q = 1 - P.
    let term = 1 / s;
    let sum = term;
    for (let k = 1; k < 10_000; k++) {
      term *= x / (s + k);
      sum += term;
      if (Math.abs(term) < Math.abs(sum) * 1e-16) break;
    }
    return Math.max(0, 1 - sum * front);
  }
  // Continued fraction for Q (modified Lentz).
  const tiny = 1e-300;
  let b = x + 1 - s;
  let c = 1 / tiny;
  let dd = 1 / b;
  let h = dd;
  for (let k = 1; k < 10_000; k++) {
    const an = -k * (k - s);
    b += 2;
    dd = an * dd + b;
    if (Math.abs(dd) < tiny) dd = tiny;
    c = b + an / c;
    if (Math.abs(c) < tiny) c = tiny;
    dd = 1 / dd;
    const delta = dd * c;
    h *= delta;
    if (Math.abs(delta - 1) < 1e-16) break;
  }
  return Math.min(1, front * h);
}

/** P(chi^2_dof >= chi2): the p-value of a chi^2 with dof degrees of freedom. */
export function chiSquareSurvival(chi2: number, dof: number): number {
  return upperGammaRegularized(dof / 2, chi2 / 2);
}

// ---- agreement with a claimed exponent -------------------------------------------------------

export type AgreementVerdict = 'agrees' | 'disagrees' | 'undetermined';

export interface ExponentAgreement {
  verdict: AgreementVerdict;
  parameter: 'a' | 'p';
  claimed: number;
  /** The exponent fitted freely, with its uncertainty. */
  fitted: FittedParameter;
  /** (fitted - claimed) / uncertainty. */
  deviation: number;
  /** How many standard deviations still count as agreement. */
  level: number;
  /** The fit with the exponent free, and the fit with it held at the claimed value. */
  free: PowerLogFit;
  held: PowerLogFit;
  /** One sentence for the evidence panel. */
  reason: string;
}

export interface AgreementOptions {
  /** Standard deviations that still count as agreement (default 2, about 95% for Gaussian errors). */
  level?: number;
  /** The other exponent: held at a value, or free (null, the default). */
  other?: number | null;
  scale?: 'linear' | 'log';
  /** Below this p-value the law itself does not describe the data and no verdict is given (default 0.001). */
  minimumPValue?: number;
}

const fmt = (v: number) => (Math.abs(v) >= 1e4 || (Math.abs(v) < 1e-3 && v !== 0) ? v.toExponential(3) : Number(v.toPrecision(4)).toString());

/** Do the data agree with a claimed value of the exponent a (of x) or p (of |ln x|) within their errors? */
export function agreesWithExponent(
  data: FitData,
  parameter: 'a' | 'p',
  claimed: number,
  options: AgreementOptions = {},
): ExponentAgreement {
  if (!Number.isFinite(claimed)) throw new FitInputError('The claimed exponent must be a finite number.');
  const level = options.level ?? 2;
  const other = parameter === 'a' ? 'p' : 'a';
  const base: FitSpec = { scale: options.scale, [other]: options.other ?? null };
  const free = fitPowerLog(data, { ...base, [parameter]: null });
  const held = fitPowerLog(data, { ...base, [parameter]: claimed });
  const fitted = free[parameter];
  const deviation = (fitted.value - claimed) / fitted.uncertainty;
  const within = Math.abs(deviation) <= level;
  const minimumP = options.minimumPValue ?? 1e-3;
  const source = free.weighted ? 'their error bars' : 'their scatter (the data carry no error bars)';
  const measured = `${parameter} = ${fmt(fitted.value)} ± ${fmt(fitted.uncertainty)}`;
  let verdict: AgreementVerdict;
  let reason: string;
  if (!Number.isFinite(deviation)) {
    verdict = 'undetermined';
    reason = `The fit gives ${measured}, which cannot be compared with ${fmt(claimed)}.`;
  } else if (free.pValue !== null && free.pValue < minimumP) {
    verdict = 'undetermined';
    reason =
      `The law A x^a |ln x|^p does not describe these data within their error bars ` +
      `(chi²/dof = ${fmt(free.reducedChi2)}, p = ${fmt(free.pValue)}), so the fitted ${measured} says nothing firm about ${fmt(claimed)}.`;
  } else {
    verdict = within ? 'agrees' : 'disagrees';
    reason =
      `The fit gives ${measured} from ${source}: ${fmt(Math.abs(deviation))} standard deviations from the claimed ${fmt(claimed)}, ` +
      (within ? `within the ${fmt(level)} that count as agreement.` : `more than the ${fmt(level)} that count as agreement.`);
  }
  return { verdict, parameter, claimed, fitted, deviation, level, free, held, reason };
}
