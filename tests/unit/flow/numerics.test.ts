import { describe, expect, it } from 'vitest';
import { det, multiply, trace } from 'mathjs';
import { eigenvalues, inverse } from '../../../flow/numerics/linalg';
import { polynomialRoots } from '../../../flow/numerics/polynomial';
import { integrate } from '../../../flow/numerics/quadrature';
import { expandAtZero } from '../../../flow/numerics/series';
import { newton } from '../../../flow/numerics/newton';
import { generator } from '../../../flow/numerics/random';

describe('eigenvalues of real nonsymmetric matrices', () => {
  it('reproduce trace, trace of the square and determinant (computed by mathjs) for 500 random matrices up to 8 x 8', () => {
    const random = generator(11);
    for (let trial = 0; trial < 500; trial++) {
      const n = 2 + (trial % 7);
      const flat = Array.from({ length: n * n }, () => 2 * random() - 1);
      const rows = Array.from({ length: n }, (_, i) => flat.slice(i * n, i * n + n));
      const values = eigenvalues(flat, n)!;
      expect(values).toHaveLength(n);
      const sum = values.reduce((s, z) => s + z.re, 0);
      const squares = values.reduce((s, z) => s + z.re * z.re - z.im * z.im, 0);
      let product = { re: 1, im: 0 };
      for (const z of values) product = { re: product.re * z.re - product.im * z.im, im: product.re * z.im + product.im * z.re };
      expect(sum).toBeCloseTo(trace(rows) as number, 10);
      expect(squares).toBeCloseTo(trace(multiply(rows, rows) as number[][]) as number, 9);
      expect(product.re).toBeCloseTo(det(rows) as number, 9);
    }
  });

  it('give a rotation its complex pair and a companion matrix its known roots', () => {
    const rotation = eigenvalues([0, -2, 2, 0], 2)!;
    expect(rotation.map((z) => [z.re, Math.abs(z.im)])).toEqual([
      [0, 2],
      [0, 2],
    ]);
    // companion matrix of (x - 1)(x - 2)(x - 3) = x^3 - 6x^2 + 11x - 6
    const companion = eigenvalues([6, -11, 6, 1, 0, 0, 0, 1, 0], 3)!;
    expect(companion.map((z) => z.re)).toEqual([expect.closeTo(3, 12), expect.closeTo(2, 12), expect.closeTo(1, 12)]);
  });

  it('inverse times the matrix is the identity', () => {
    const m = [4, 1, 2, 0, 3, 1, 1, 0, 2];
    const inv = inverse(m, 3)!;
    const product = multiply([m.slice(0, 3), m.slice(3, 6), m.slice(6)], [Array.from(inv.slice(0, 3)), Array.from(inv.slice(3, 6)), Array.from(inv.slice(6))]) as number[][];
    product.forEach((row, i) => row.forEach((v, j) => expect(v).toBeCloseTo(i === j ? 1 : 0, 14)));
    expect(inverse([1, 2, 2, 4], 2)).toBeNull();
  });
});

describe('polynomial roots', () => {
  it('finds real and complex roots: x (x - 1)(x^2 + 2x + 5)', () => {
    // x^4 + x^3 + 3x^2 - 5x: roots 0, 1, -1 +- 2i (common practice)
    const roots = polynomialRoots([0, -5, 3, 1, 1]);
    const real = roots.filter((z) => z.im === 0).map((z) => z.re).sort();
    expect(real).toEqual([0, expect.closeTo(1, 12)]);
    const complex = roots.filter((z) => z.im !== 0);
    for (const z of complex) {
      expect(z.re).toBeCloseTo(-1, 12);
      expect(Math.abs(z.im)).toBeCloseTo(2, 12);
    }
  });
});

describe('adaptive Gauss–Kronrod quadrature', () => {
  const options = { absoluteTolerance: 1e-13, relativeTolerance: 1e-12, maxIntervals: 2000 };
  it('integrates 1/sqrt(x) on [0, 1] to 2 with an error estimate covering the true error (end-point singularity)', () => {
    const result = integrate((x) => 1 / Math.sqrt(x), 0, 1, options);
    expect(result.converged).toBe(true);
    expect(Math.abs(result.value - 2)).toBeLessThanOrEqual(result.error);
  });
  it('handles an integrable singularity inside the range on a bisection point (ln|x - 1/2|)', () => {
    const result = integrate((x) => Math.log(Math.abs(x - 0.5)), 0, 1, options);
    expect(result.value).toBeCloseTo(-1 - Math.log(2), 11); // by hand: 2 * int_0^{1/2} ln u du
  });
  it('maps infinite ranges: exp(-x^2) on the whole line is sqrt(pi)', () => {
    expect(integrate((x) => Math.exp(-x * x), Number.NEGATIVE_INFINITY, Number.POSITIVE_INFINITY, options).value).toBeCloseTo(Math.sqrt(Math.PI), 12);
    expect(integrate((x) => Math.exp(-x), 1, Number.POSITIVE_INFINITY, options).value).toBeCloseTo(Math.exp(-1), 13);
    expect(integrate((x) => Math.exp(x), Number.NEGATIVE_INFINITY, 0, options).value).toBeCloseTo(1, 13);
  });
  it('reverses the sign for reversed limits', () => {
    expect(integrate((x) => x, 1, 0, options).value).toBeCloseTo(-0.5, 15);
  });
});

describe('Taylor coefficients from values', () => {
  it('recovers exp and ln(1+x) coefficients with uncertainties that cover the true error', () => {
    const exp = expandAtZero(Math.exp, 6, { radius: 1, extraDegree: 10 })!;
    let factorial = 1;
    exp.coefficients.forEach((c, k) => {
      if (k > 0) factorial *= k;
      expect(Math.abs(c - 1 / factorial)).toBeLessThanOrEqual(exp.uncertainties[k]!);
      expect(exp.uncertainties[k]!).toBeLessThan(1e-7);
    });
    const log = expandAtZero(Math.log1p, 4, { radius: 0.2, extraDegree: 10 })!;
    log.coefficients.forEach((c, k) => {
      const exact = k === 0 ? 0 : (k % 2 === 1 ? 1 : -1) / k;
      expect(Math.abs(c - exact)).toBeLessThanOrEqual(log.uncertainties[k]!);
    });
  });

  it('falls back to one-sided sampling where the function exists only for x > 0 (sqrt(x + x^2) / sqrt(x))', () => {
    const fit = expandAtZero((x) => (x > 0 ? Math.sqrt(x + x * x) / Math.sqrt(x) : null), 2, { radius: 0.1, extraDegree: 8 })!;
    expect(fit.twoSided).toBe(false);
    // sqrt(1 + x) = 1 + x/2 - x^2/8 + ...
    expect(Math.abs(fit.coefficients[2]! + 1 / 8)).toBeLessThanOrEqual(fit.uncertainties[2]!);
  });
});

describe('Newton iteration', () => {
  it('converges quadratically to sqrt(2) and reports a singular Jacobian instead of dividing by zero', () => {
    const system = { n: 1, f: (x: ArrayLike<number>, out: Float64Array) => (out[0] = x[0]! * x[0]! - 2), jacobian: (x: ArrayLike<number>, out: Float64Array) => (out[0] = 2 * x[0]!) };
    const result = newton(system, [1], { tolerance: 1e-15, maxIterations: 50 });
    expect(result.converged).toBe(true);
    expect(result.x[0]).toBeCloseTo(Math.SQRT2, 15);
    expect(result.iterations).toBeLessThan(8);
    const stuck = newton(system, [0], { tolerance: 1e-15, maxIterations: 50 });
    expect(stuck.converged).toBe(false);
    expect(stuck.reason).toContain('singular');
  });
});
