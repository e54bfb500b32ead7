import { describe, expect, it } from 'vitest';
import type { FlowSpec } from '../../../flow/types';
import { one } from './helpers';

/**
 * A discrete RG step with scale factor 2: g_{j+1} = 2^eps g_j - A g_j^2. Derived by hand (common
 * practice): fixed point g* = (2^eps - 1)/A, eigenvalue F'(g*) = 2 - 2^eps; at the Gaussian point
 * F'(0) = 2^eps, so y = eps ln 2.
 */
function map(eps: number, a = 1.5): FlowSpec {
  return { couplings: ['g'], parameters: { eps, A: a }, convention: 'map', beta: { g: '2^eps*g - A*g^2' } };
}

describe('a discrete RG map', () => {
  const eps = 0.5;
  const gStar = (Math.pow(2, eps) - 1) / 1.5;
  const lambda = 2 - Math.pow(2, eps);

  it('has its fixed point at (2^eps - 1)/A; a wrong position fails', () => {
    expect(one(map(eps), { kind: 'fixed-point', near: { g: 0.3 }, value: { g: '(2^eps - 1)/A' }, tolerance: 1e-12 }).status).toBe('holds');
    expect(one(map(eps), { kind: 'fixed-point', near: { g: 0.3 }, value: { g: gStar + 1e-4 } }).status).toBe('fails');
  });

  it('has the eigenvalue 2 - 2^eps there (irrelevant, |lambda| < 1), also as y = ln|lambda|', () => {
    const byLambda = one(map(eps), { kind: 'stability', near: { g: 0.3 }, eigenvalues: ['2 - 2^eps'], relevant: 0 });
    expect(byLambda.status).toBe('holds');
    expect(byLambda.measured).toEqual([expect.closeTo(lambda, 12)]);
    const byY = one(map(eps), { kind: 'stability', near: { g: 0.3 }, eigenvalues: ['log(2 - 2^eps)'], form: 'y' });
    expect(byY.status).toBe('holds');
    expect(byY.evidence.fixedPoints!.find((p) => Math.abs(p.position.g! - gStar) < 1e-9)!.exponents![0]).toBeCloseTo(Math.log(lambda), 12);
    expect(one(map(eps), { kind: 'stability', near: { g: 0.3 }, eigenvalues: [lambda + 1e-3] }).status).toBe('fails');
  });

  it('counts the Gaussian point as relevant with y = eps ln 2', () => {
    const result = one(map(eps), { kind: 'stability', near: { g: 0 }, eigenvalues: ['eps*log(2)'], form: 'y', relevant: 1 });
    expect(result.status).toBe('holds');
  });

  it('flags a map whose quadratic term makes the coupling grow at marginality', () => {
    const good = one(map(0), { kind: 'fixed-point', near: { g: 0 } });
    expect(good.sanity.find((f) => f.check === 'marginal-sign')!.ok).toBe(true);
    const bad = one({ ...map(0), beta: { g: '2^eps*g + A*g^2' } }, { kind: 'fixed-point', near: { g: 0 } });
    const flag = bad.sanity.find((f) => f.check === 'marginal-sign')!;
    expect(flag.ok).toBe(false);
    expect(flag.message).toContain('grows in the infrared');
  });
});
