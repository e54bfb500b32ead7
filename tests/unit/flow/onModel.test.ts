import { describe, expect, it } from 'vitest';
import { one, onFlow, run } from './helpers';

const NEAR = { g: '3*eps/(n+8)' };
const NS = [0, 1, 2, 3, 4];

/**
 * Epsilon expansion of the O(n) exponents at order eps^2.
 * Source: K. G. Wilson, PRL 28, 548 (1972); Kleinert and Schulte-Frohlinde (2001); via REFERENCES.md (from memory).
 */
const published = {
  inverseNu: (n: number) => -((n + 2) * (13 * n + 44)) / (2 * (n + 8) ** 3),
  nu: (n: number) => ((n + 2) * (n * n + 23 * n + 60)) / (8 * (n + 8) ** 3),
  gamma: (n: number) => ((n + 2) * (n * n + 22 * n + 52)) / (4 * (n + 8) ** 3),
  eta: (n: number) => (n + 2) / (2 * (n + 8) ** 2),
};
/** The quantity each exponent is at the fixed point, from the rates t = d ln t/dl and chi = d ln chi/dl. */
const quantities = { inverseNu: 't', nu: '1/t', gamma: 'chi/t', eta: '2 - chi' } as const;

describe('O(n) model: the two-loop RG functions reproduce the published eps^2 coefficients', () => {
  for (const n of NS) {
    for (const name of Object.keys(published) as Array<keyof typeof published>) {
      it(`${name} at eps^2 for n = ${n} comes out within 1e-6, its uncertainty covers the true error, and 1e-3 off fails`, () => {
        const exact = published[name](n);
        const claim = { kind: 'epsilon-coefficient', quantity: quantities[name], near: NEAR, power: 2 };
        const right = one(onFlow(n, 0.1), { ...claim, value: exact });
        expect(right.status).toBe('holds');
        const error = Math.abs((right.measured as number) - exact);
        expect(error).toBeLessThan(1e-6);
        expect(right.uncertainty!).toBeGreaterThanOrEqual(error);
        expect(right.uncertainty!).toBeLessThan(1e-6);
        const wrong = one(onFlow(n, 0.1), { ...claim, value: exact + 1e-3 });
        expect(wrong.status).toBe('fails');
      });
    }
  }

  it('gamma = nu (2 - eta) holds between the measured coefficients (an independent relation)', () => {
    // Coefficients of nu = 1/2 + a1 eps + a2 eps^2 and eta = e2 eps^2 give gamma_2 = 2 a2 - e2/2 (common practice).
    for (const n of NS) {
      const report = run(onFlow(n, 0.1), [
        { id: 'nu2', kind: 'epsilon-coefficient', quantity: '1/t', near: NEAR, power: 2, value: 0, tolerance: 1 },
        { id: 'eta2', kind: 'epsilon-coefficient', quantity: '2 - chi', near: NEAR, power: 2, value: 0, tolerance: 1 },
        { id: 'gamma2', kind: 'epsilon-coefficient', quantity: 'chi/t', near: NEAR, power: 2, value: 0, tolerance: 1 },
      ]);
      const [nu2, eta2, gamma2] = report.claims.map((c) => c.measured as number);
      expect(gamma2).toBeCloseTo(2 * nu2! - eta2! / 2, 8);
    }
  });

  it('the eps^1 coefficients of nu and gamma match Wilson (1972): (n+2)/(4(n+8)) and (n+2)/(2(n+8))', () => {
    for (const n of NS) {
      const report = run(onFlow(n, 0.1), [
        { id: 'nu1', kind: 'epsilon-coefficient', quantity: '1/t', near: NEAR, power: 1, value: '(n+2)/(4*(n+8))' },
        { id: 'gamma1', kind: 'epsilon-coefficient', quantity: 'chi/t', near: NEAR, power: 1, value: '(n+2)/(2*(n+8))' },
      ]);
      expect(report.summary.holds).toBe(2);
    }
  });

  it('n = 0 (self-avoiding walks): gamma = 1 + eps/8 + 13 eps^2/256 and nu = 1/2 + eps/16 + 15 eps^2/512', () => {
    // REFERENCES.md, O(n) exponents at n = 0 (from memory)
    const report = run(onFlow(0, 0.1), [
      { id: 'g0', kind: 'epsilon-coefficient', quantity: 'chi/t', near: NEAR, power: 0, value: 1 },
      { id: 'g1', kind: 'epsilon-coefficient', quantity: 'chi/t', near: NEAR, power: 1, value: '1/8' },
      { id: 'g2', kind: 'epsilon-coefficient', quantity: 'chi/t', near: NEAR, power: 2, value: '13/256' },
      { id: 'n2', kind: 'epsilon-coefficient', quantity: '1/t', near: NEAR, power: 2, value: '15/512' },
    ]);
    expect(report.claims.map((c) => c.status)).toEqual(['holds', 'holds', 'holds', 'holds']);
  });

  it('the coefficient extraction does not depend on the eps at which the file is written', () => {
    const exact = published.nu(1);
    for (const eps of [0, 0.5, 1]) {
      const result = one(onFlow(1, eps), { kind: 'epsilon-coefficient', quantity: '1/t', near: NEAR, power: 2, value: exact });
      expect(result.status).toBe('holds');
    }
  });
});

describe('O(n) model: the Wilson–Fisher fixed point', () => {
  // g* = 3 eps/(n+8) + 9(3n+14)/(n+8)^3 eps^2 + O(eps^3): REFERENCES.md (Kleinert and Schulte-Frohlinde, from memory)
  const series = { g: '3*eps/(n+8) + 9*(3*n+14)/(n+8)^3*eps^2' };

  for (const n of NS) {
    it(`n = ${n}: the eps^2 series holds at order 2; a wrong eps^2 term and a claim of order 3 fail`, () => {
      const flow = onFlow(n, 0.1);
      expect(one(flow, { kind: 'fixed-point', near: NEAR, value: series, order: 2 }).status).toBe('holds');
      const wrong = one(flow, { kind: 'fixed-point', near: NEAR, value: { g: '3*eps/(n+8) + 9.1*(3*n+14)/(n+8)^3*eps^2' }, order: 2 });
      expect(wrong.status).toBe('fails');
      expect(wrong.message).toContain('eps^2 coefficient of g');
      expect(one(flow, { kind: 'fixed-point', near: NEAR, value: series, order: 3 }).status).toBe('fails');
    });
  }

  it('the located fixed point at finite eps equals the root of the two-loop quadratic (closed form by hand)', () => {
    for (const n of NS) {
      const eps = 0.3;
      const a = (n + 8) / 3;
      const b = (3 * n + 14) / 3;
      // beta/g = -eps + a g - b g^2 = 0, the smaller root (common practice)
      const root = (2 * eps) / (a + Math.sqrt(a * a - 4 * b * eps));
      const result = one(onFlow(n, eps), { kind: 'fixed-point', near: NEAR, value: { g: root } , tolerance: 1e-12 });
      expect(result.status).toBe('holds');
      expect((result.measured as Record<string, number>).g).toBeCloseTo(root, 14);
    }
  });

  it('reports every fixed point with its classification: the Gaussian is relevant, Wilson–Fisher irrelevant', () => {
    const result = one(onFlow(1, 0.1), { kind: 'fixed-point', near: NEAR });
    expect(result.status).toBe('holds');
    const points = result.evidence.fixedPoints!;
    const gaussian = points.find((p) => Math.abs(p.position.g!) < 1e-12)!;
    expect(gaussian.classification).toEqual(['relevant']);
    expect(gaussian.eigenvalues[0]!.re).toBeCloseTo(0.1, 12);
    const wf = points.find((p) => Math.abs(p.position.g! - 0.0357) < 1e-3)!;
    expect(wf.classification).toEqual(['irrelevant']);
  });

  it('at eps = 1 the two-loop flow has no real fixed point: the check says so and shows the complex pair', () => {
    const n = 1;
    const result = one(onFlow(n, 1), { kind: 'fixed-point', near: { g: 0.3 } });
    expect(result.status).toBe('fails');
    expect(result.message).toContain('no real fixed point');
    // The roots of b g^2 - a g + eps = 0 by the quadratic formula (common practice).
    const a = (n + 8) / 3;
    const b = (3 * n + 14) / 3;
    const re = a / (2 * b);
    const im = Math.sqrt(4 * b - a * a) / (2 * b);
    const pair = result.evidence.complexFixedPoints!.map((p) => p.g!);
    expect(pair).toHaveLength(2);
    for (const z of pair) {
      expect(z.re).toBeCloseTo(re, 10);
      expect(Math.abs(z.im)).toBeCloseTo(im, 10);
    }
  });
});

describe('O(n) model: stability', () => {
  it('the Wilson–Fisher eigenvalue equals -beta\'(g*) from the closed-form root; a wrong one fails', () => {
    const n = 2;
    const eps = 0.2;
    const a = (n + 8) / 3;
    const b = (3 * n + 14) / 3;
    const g = (2 * eps) / (a + Math.sqrt(a * a - 4 * b * eps));
    const slope = -(-eps + 2 * a * g - 3 * b * g * g); // infrared eigenvalue, derived by hand
    const flow = onFlow(n, eps);
    expect(one(flow, { kind: 'stability', near: NEAR, eigenvalues: [slope], relevant: 0, tolerance: 1e-10 }).status).toBe('holds');
    expect(one(flow, { kind: 'stability', near: NEAR, eigenvalues: [slope + 1e-3] }).status).toBe('fails');
    expect(one(flow, { kind: 'stability', near: NEAR, relevant: 1 }).status).toBe('fails');
  });

  it('the Gaussian fixed point at eps = 0 is marginal, and a claim of one relevant direction there is inconclusive', () => {
    const result = one(onFlow(1, 0), { kind: 'stability', near: { g: 0 }, relevant: 1 });
    expect(result.status).toBe('inconclusive');
    expect(result.evidence.fixedPoints![0]!.classification).toEqual(['marginal']);
  });
});
