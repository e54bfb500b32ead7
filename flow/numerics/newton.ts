/** Damped Newton iteration for small systems F(x) = 0 with an analytic Jacobian. */
import { solveInPlace } from './linalg';

export interface NewtonSystem {
  n: number;
  f(x: ArrayLike<number>, out: Float64Array): void;
  jacobian(x: ArrayLike<number>, out: Float64Array): void;
}

export interface NewtonOptions {
  /** Stop when the step is below tolerance * (1 + |x|). */
  tolerance: number;
  maxIterations: number;
  /** Called once per iteration (time bound, cancellation). */
  checkpoint?: () => void;
}

export interface NewtonResult {
  converged: boolean;
  x: Float64Array;
  /** max |F(x)| at the end. */
  residual: number;
  iterations: number;
  evaluations: number;
  /** Why it stopped when it did not converge. */
  reason: string;
}

const maxAbs = (v: ArrayLike<number>): number => {
  let m = 0;
  for (let i = 0; i < v.length; i++) {
    const a = Math.abs(v[i]!);
    if (!(a <= m)) m = a; // NaN propagates as "large"
  }
  return m;
};

export function newton(system: NewtonSystem, start: ArrayLike<number>, options: NewtonOptions): NewtonResult {
  const { n } = system;
  const x = Float64Array.from(start);
  const fx = new Float64Array(n);
  const trial = new Float64Array(n);
  const ft = new Float64Array(n);
  const jac = new Float64Array(n * n);
  const step = new Float64Array(n);
  let evaluations = 1;
  system.f(x, fx);
  let residual = maxAbs(fx);
  const result = (converged: boolean, iterations: number, reason: string): NewtonResult => ({
    converged,
    x,
    residual,
    iterations,
    evaluations,
    reason,
  });
  if (!Number.isFinite(residual)) return result(false, 0, 'the flow is not finite at the start');
  for (let iteration = 1; iteration <= options.maxIterations; iteration++) {
    options.checkpoint?.();
    if (residual === 0) return result(true, iteration - 1, '');
    system.jacobian(x, jac);
    for (let i = 0; i < n; i++) step[i] = -fx[i]!;
    if (!solveInPlace(jac, step, n)) return result(false, iteration, 'the Jacobian is singular');
    // Backtracking: accept the first damping that lowers the residual (or the smallest one).
    let lambda = 1;
    for (;;) {
      for (let i = 0; i < n; i++) trial[i] = x[i]! + lambda * step[i]!;
      system.f(trial, ft);
      evaluations++;
      const r = maxAbs(ft);
      if ((Number.isFinite(r) && r <= (1 - 1e-4 * lambda) * residual) || lambda < 1 / 1024) {
        if (!Number.isFinite(r)) return result(false, iteration, 'the flow is not finite along the Newton step');
        break;
      }
      lambda /= 2;
    }
    const stepSize = lambda * maxAbs(step);
    x.set(trial);
    fx.set(ft);
    residual = maxAbs(fx);
    const scale = 1 + maxAbs(x);
    if (scale > 1e12) return result(false, iteration, 'the iteration ran away to infinity');
    if (stepSize <= options.tolerance * scale) return result(true, iteration, '');
  }
  return result(false, options.maxIterations, `no convergence in ${options.maxIterations} iterations`);
}
