import { describe, expect, it } from 'vitest';
import { gamma as mathGamma } from 'mathjs';
import { one } from './helpers';

const EULER = 0.5772156649015329; // gamma_E: NIST DLMF 5.2.3 (REFERENCES.md)
const WITH_EULER = { parameters: { gammaE: EULER } };

describe('handbook values: the Gamma function near zero', () => {
  // Gamma(eps) = 1/eps - gamma_E + (gamma_E^2/2 + pi^2/12) eps + O(eps^2): NIST DLMF ch. 5; Abramowitz and Stegun ch. 6.
  const expansion = '1/x - gammaE + (gammaE^2/2 + pi^2/12)*x';

  it('Gamma(x) = 1/x - gamma_E + (gamma_E^2/2 + pi^2/12) x + O(x^2) holds; order 3 and a wrong term fail', () => {
    expect(one(WITH_EULER, { kind: 'order', lhs: 'gamma(x)', rhs: expansion, variable: 'x', order: 2 }).status).toBe('holds');
    expect(one(WITH_EULER, { kind: 'order', lhs: 'gamma(x)', rhs: expansion, variable: 'x', order: 3 }).status).toBe('fails');
    expect(one(WITH_EULER, { kind: 'order', lhs: 'gamma(x)', rhs: '1/x - gammaE + (gammaE^2/2 + pi^2/13)*x', variable: 'x', order: 2 }).status).toBe('fails');
  });

  it('the x coefficient of x Gamma(x) is -gamma_E, cross-checked against mathjs gamma directly', () => {
    const result = one(WITH_EULER, { kind: 'coefficient', of: 'x*gamma(x)', variable: 'x', power: 1, value: '-gammaE' });
    expect(result.status).toBe('holds');
    // independent: (Gamma(1+h) - Gamma(1-h)) / (2h) by mathjs
    const h = 1e-5;
    expect(((mathGamma(1 + h) as number) - (mathGamma(1 - h) as number)) / (2 * h)).toBeCloseTo(result.measured as number, 8);
  });

  it('Gamma(x + 1) = x Gamma(x) holds at random points and a 1e-7 change fails with a counterexample', () => {
    expect(one(undefined, { kind: 'identity', lhs: 'gamma(x + 1)', rhs: 'x*gamma(x)' }).status).toBe('holds');
    const wrong = one(undefined, { kind: 'identity', lhs: 'gamma(x + 1)', rhs: '(1 + 1e-7)*x*gamma(x)' });
    expect(wrong.status).toBe('fails');
    expect(Object.keys(wrong.evidence.counterexample!)).toEqual(['x']);
  });
});

describe('handbook values: series', () => {
  // ln(1+x) = x - x^2/2 + x^3/3 - ...; (1+x)^a binomial series (any handbook).
  it('ln(1+x) = x - x^2/2 + x^3/3 + O(x^4), not O(x^5)', () => {
    expect(one(undefined, { kind: 'order', lhs: 'ln(1+x)', rhs: 'x - x^2/2 + x^3/3', variable: 'x', order: 4 }).status).toBe('holds');
    expect(one(undefined, { kind: 'order', lhs: 'ln(1+x)', rhs: 'x - x^2/2 + x^3/3', variable: 'x', order: 5 }).status).toBe('fails');
  });

  it('the x^k coefficient of ln(1+x) is (-1)^(k+1)/k for k = 1..6; 1/k with the wrong sign fails', () => {
    for (let k = 1; k <= 6; k++) {
      expect(one(undefined, { kind: 'coefficient', of: 'ln(1+x)', variable: 'x', power: k, value: `(-1)^(${k}+1)/${k}` }).status).toBe('holds');
    }
    expect(one(undefined, { kind: 'coefficient', of: 'ln(1+x)', variable: 'x', power: 2, value: '1/2' }).status).toBe('fails');
  });

  it('the binomial series (1+x)^a = 1 + a x + a(a-1)/2 x^2 + O(x^3), and its x^3 coefficient for every a', () => {
    expect(one(undefined, { kind: 'order', lhs: '(1+x)^a', rhs: '1 + a*x + a*(a-1)/2*x^2', variable: 'x', order: 3 }).status).toBe('holds');
    expect(one(undefined, { kind: 'coefficient', of: '(1+x)^a', variable: 'x', power: 3, value: 'a*(a-1)*(a-2)/6' }).status).toBe('holds');
    const wrong = one(undefined, { kind: 'coefficient', of: '(1+x)^a', variable: 'x', power: 3, value: 'a*(a-1)*(a-2)/5' });
    expect(wrong.status).toBe('fails');
    expect(wrong.evidence.counterexample).toHaveProperty('a');
  });

  it('a coefficient at a removable singularity (sin(x)/x at 0) comes from interpolation: -1/6 for x^2', () => {
    const result = one(undefined, { kind: 'coefficient', of: 'sin(x)/x', variable: 'x', power: 2, value: '-1/6' });
    expect(result.status).toBe('holds');
    expect(result.method).toContain('interpolation');
  });
});

describe('handbook values: integrals', () => {
  // Standard tables (REFERENCES.md): int_0^inf x/(e^x-1) dx = pi^2/6, int_0^1 ln x ln(1-x) dx = 2 - pi^2/6.
  it('x/(e^x - 1) on [0, inf) is pi^2/6, with an error estimate that covers the true error', () => {
    const result = one(undefined, { kind: 'integral', integrand: 'x/(exp(x) - 1)', variable: 'x', from: 0, to: 'Infinity', value: 'pi^2/6' });
    expect(result.status).toBe('holds');
    expect(Math.abs((result.measured as number) - Math.PI ** 2 / 6)).toBeLessThanOrEqual(result.uncertainty!);
  });

  it('ln(x) ln(1 - x) on [0, 1] is 2 - pi^2/6 despite the logarithmic end-point singularities', () => {
    const result = one(undefined, { kind: 'integral', integrand: 'ln(x)*ln(1-x)', variable: 'x', from: 0, to: 1, value: '2 - pi^2/6' });
    expect(result.status).toBe('holds');
    expect(Math.abs((result.measured as number) - (2 - Math.PI ** 2 / 6))).toBeLessThanOrEqual(result.uncertainty!);
  });

  it('wrong values fail: pi^2/6 + 1e-6 and 2 - pi^2/6 - 1e-6', () => {
    expect(one(undefined, { kind: 'integral', integrand: 'x/(exp(x) - 1)', variable: 'x', from: 0, to: 'Infinity', value: 'pi^2/6 + 1e-6' }).status).toBe('fails');
    expect(one(undefined, { kind: 'integral', integrand: 'ln(x)*ln(1-x)', variable: 'x', from: 0, to: 1, value: '2 - pi^2/6 - 1e-6' }).status).toBe('fails');
  });

  it('x^3/(e^x - 1) on [0, inf) is pi^4/15 and exp(-x^2) on the whole line is sqrt(pi) (standard tables)', () => {
    expect(one(undefined, { kind: 'integral', integrand: 'x^3/(exp(x)-1)', variable: 'x', from: 0, to: 'Infinity', value: 'pi^4/15' }).status).toBe('holds');
    expect(one(undefined, { kind: 'integral', integrand: 'exp(-x^2)', variable: 'x', from: '-Infinity', to: 'Infinity', value: 'sqrt(pi)' }).status).toBe('holds');
  });

  it('a divergent integral fails instead of returning a number', () => {
    const result = one(undefined, { kind: 'integral', integrand: '1/x', variable: 'x', from: 0, to: 1, value: 1 });
    expect(result.status).toBe('fails');
    expect(result.message).toContain('diverges');
  });
});

describe('identities', () => {
  it('a polynomial identity is settled by exact algebra', () => {
    const result = one(undefined, { kind: 'identity', lhs: '(a + b)^4', rhs: 'a^4 + 4a^3 b + 6a^2 b^2 + 4a b^3 + b^4' });
    expect(result.status).toBe('holds');
    expect(result.method).toContain('exact algebra');
  });

  it('a difference below double rounding is found in high precision and names the point', () => {
    const result = one(undefined, { kind: 'identity', lhs: 'sin(2x)', rhs: '2*sin(x)*cos(x) + 1e-20' });
    expect(result.status).toBe('fails');
    expect(result.message).toMatch(/x = [\d.]+/);
    expect(result.message).toContain('40-digit');
  });

  it('a trigonometric identity exact algebra cannot settle holds at random points in high precision', () => {
    const result = one(undefined, { kind: 'identity', lhs: 'sin(x)^2 + cos(x)^2', rhs: '1' });
    expect(result.status).toBe('holds');
    expect(result.stats.precision).toBe('high precision');
  });

  it('a domain restricts the sampling (sqrt(x^2) = x only for x > 0)', () => {
    expect(one(undefined, { kind: 'identity', lhs: 'sqrt(x^2)', rhs: 'x', domain: { x: [-2, -0.1] } }).status).toBe('fails');
    expect(one(undefined, { kind: 'identity', lhs: 'sqrt(x^2)', rhs: 'x', domain: { x: [0.1, 3] } }).status).toBe('holds');
  });
});
