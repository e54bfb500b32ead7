import { describe, expect, it } from 'vitest';
import type { FlowSpec } from '../../../flow/types';
import { one, run } from './helpers';

/**
 * Isotropic plus cubic coupling at one loop, same units as the O(n) flow.
 * Source: A. Aharony, PRB 8, 4270 (1973), via REFERENCES.md (from memory).
 */
function anisotropic(n: number, eps = 1): FlowSpec {
  return {
    couplings: ['u', 'v'],
    parameters: { n, eps },
    convention: 'uv',
    beta: { u: '-eps*u + (n+8)/3*u^2 + 2*u*v', v: '-eps*v + 3*v^2 + 4*u*v' },
  };
}

/** The four fixed points (REFERENCES.md, Aharony 1973, from memory). */
function published(n: number, eps = 1): Record<string, [number, number]> {
  return {
    gaussian: [0, 0],
    ising: [0, eps / 3],
    isotropic: [(3 * eps) / (n + 8), 0],
    cubic: [eps / n, ((n - 4) * eps) / (3 * n)],
  };
}

describe('anisotropic two-coupling flow', () => {
  for (const n of [2, 5]) {
    it(`n = ${n}: the search finds exactly the four published fixed points`, () => {
      const [u, v] = published(n).isotropic;
      const result = one(anisotropic(n), { kind: 'fixed-point', near: { u, v } });
      expect(result.status).toBe('holds');
      const found = result.evidence.fixedPoints!.map((p) => [p.position.u!, p.position.v!]);
      expect(found).toHaveLength(4);
      for (const [name, [pu, pv]] of Object.entries(published(n))) {
        const match = found.find(([fu, fv]) => Math.abs(fu! - pu) < 1e-12 && Math.abs(fv! - pv) < 1e-12);
        expect(match, `${name} fixed point`).toBeDefined();
      }
    });

    it(`n = ${n}: each fixed point is checked at its published position`, () => {
      const claims = Object.entries(published(n)).map(([name, [u, v]]) => ({
        id: name,
        kind: 'fixed-point',
        near: { u: u * 1.05 + 0.01, v: v * 1.05 - 0.01 },
        value: { u, v },
        tolerance: 1e-10,
      }));
      const report = run(anisotropic(n), claims);
      expect(report.claims.map((c) => [c.id, c.status])).toEqual(Object.keys(published(n)).map((id) => [id, 'holds']));
    });
  }

  it('n = 2: the isotropic fixed point is the stable one; the cubic perturbation is irrelevant with eigenvalue eps (n-4)/(n+8)', () => {
    const n = 2;
    const p = published(n);
    const report = run(anisotropic(n), [
      { id: 'isotropic', kind: 'stability', near: { u: p.isotropic[0], v: p.isotropic[1] }, relevant: 0, eigenvalues: ['-eps', 'eps*(n-4)/(n+8)'] },
      { id: 'cubic', kind: 'stability', near: { u: p.cubic[0], v: p.cubic[1] }, relevant: 1 },
      { id: 'ising', kind: 'stability', near: { u: p.ising[0], v: p.ising[1] }, relevant: 1 },
      { id: 'gaussian', kind: 'stability', near: { u: 0, v: 0 }, relevant: 2 },
    ]);
    expect(report.claims.map((c) => c.status)).toEqual(['holds', 'holds', 'holds', 'holds']);
  });

  it('n = 5: the cubic fixed point is the stable one and the isotropic one has a relevant direction eps/13', () => {
    const n = 5;
    const p = published(n);
    const report = run(anisotropic(n), [
      { id: 'cubic', kind: 'stability', near: { u: p.cubic[0], v: p.cubic[1] }, relevant: 0 },
      { id: 'isotropic', kind: 'stability', near: { u: p.isotropic[0], v: p.isotropic[1] }, relevant: 1, eigenvalues: ['eps*(n-4)/(n+8)'] },
      { id: 'wrong', kind: 'stability', near: { u: p.isotropic[0], v: p.isotropic[1] }, relevant: 0 },
    ]);
    expect(report.claims.map((c) => c.status)).toEqual(['holds', 'holds', 'fails']);
  });

  it('the eigenvalues do not depend on how u and v are normalised (v rescaled by 7)', () => {
    // REFERENCES.md: the eigenvalues do not depend on the normalisation of u and v.
    const n = 5;
    const rescaled: FlowSpec = { ...anisotropic(n), beta: { u: '-eps*u + (n+8)/3*u^2 + 2*u*v/7', v: '-eps*v + 3*v^2/7 + 4*u*v' } };
    const p = published(n).isotropic;
    const result = one(rescaled, { kind: 'stability', near: { u: p[0], v: p[1] }, eigenvalues: ['-eps', 'eps*(n-4)/(n+8)'] });
    expect(result.status).toBe('holds');
  });

  it('at n = 1, u + v flows like a single phi^4 coupling (the limit the one-loop functions are checked by)', () => {
    const result = one({ parameters: { eps: 1 } }, {
      kind: 'identity',
      lhs: '(-eps*u + (1+8)/3*u^2 + 2*u*v) + (-eps*v + 3*v^2 + 4*u*v)',
      rhs: '-eps*(u+v) + 3*(u+v)^2',
    });
    expect(result.status).toBe('holds');
  });
});
