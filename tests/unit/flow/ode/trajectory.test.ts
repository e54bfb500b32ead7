import { describe, expect, it } from 'vitest';
import { traceTrajectory, type Trajectory } from '@/flow/trajectory';
import type { FlowSpec } from '@/flow/types';

function trace(spec: FlowSpec, options: Parameters<typeof traceTrajectory>[1]): Trajectory {
  const r = traceTrajectory(spec, options);
  if (!r.ok) throw new Error(r.error);
  return r.trajectory;
}

// Two-loop O(n) beta function (Kleinert and Schulte-Frohlinde 2001, via REFERENCES.md; from memory).
const on = (n: number, eps: number): FlowSpec => ({
  couplings: ['g'],
  parameters: { n, eps },
  convention: 'uv',
  beta: { g: '-eps*g + (n+8)/3*g^2 - (3*n+14)/3*g^3' },
});

// One-loop cubic anisotropy (Aharony 1973, via REFERENCES.md; from memory).
const cubic = (n: number, eps: number): FlowSpec => ({
  couplings: ['u', 'v'],
  parameters: { n, eps },
  convention: 'uv',
  beta: { u: '-eps*u + (n+8)/3*u^2 + 2*u*v', v: '-eps*v + 3*v^2 + 4*u*v' },
});

describe('trajectories for the trajectory plots', () => {
  it('follows the one-loop marginal flow on its closed form g0 / (1 + b g0 l)', () => {
    // At eps = 0 and one loop, dg/dl = -(n+8)/3 g^2 (common practice).
    const spec: FlowSpec = { couplings: ['g'], parameters: { n: 1 }, convention: 'uv', beta: { g: '(n+8)/3*g^2' } };
    const t = trace(spec, { start: { g: 0.5 }, maxTime: 1e4, samples: 200 });
    const points = t.infrared!.points;
    expect(points[0]!.l).toBe(0);
    expect(points.length).toBeGreaterThanOrEqual(200);
    for (const p of points) {
      const exact = 0.5 / (1 + 3 * 0.5 * p.l);
      expect(Math.abs(p.couplings.g! - exact) / exact).toBeLessThan(1e-7);
    }
    // Increasing RG time, spaced uniformly in ln l from 1e-3 on: every one of the seven decades
    // up to 1e4 holds at least its share of the 200 samples.
    for (let i = 1; i < points.length; i++) expect(points[i]!.l).toBeGreaterThan(points[i - 1]!.l);
    const inDecade = (a: number) => points.filter((p) => p.l >= a && p.l < 10 * a).length;
    for (const a of [1e-3, 1e-2, 0.1, 1, 10, 100, 1000]) expect(inDecade(a)).toBeGreaterThanOrEqual(Math.floor(200 / 7) - 1);
    expect(t.infrared!.end).toEqual({ kind: 'bound', l: 1e4 });
  });

  it('settles on the Wilson–Fisher fixed point and shows both fixed points in view', () => {
    // The two-loop zero: (n+8)/3 g - (3n+14)/3 g^2 = eps, the smaller root (closed form).
    const n = 1;
    const eps = 0.1;
    const gStar = (n + 8 - Math.sqrt((n + 8) ** 2 - 12 * (3 * n + 14) * eps)) / (2 * (3 * n + 14));
    const t = trace(on(n, eps), { start: { g: 0.01 }, direction: 'both' });
    const ir = t.infrared!;
    expect(ir.end.kind).toBe('fixed-point');
    if (ir.end.kind === 'fixed-point') expect(ir.end.position.g).toBeCloseTo(gStar, 12);
    expect(ir.summary).toMatch(/settles on the fixed point \(g = 0\.0357471\)/);
    // In the ultraviolet direction the flow returns to the Gaussian fixed point.
    const uv = t.ultraviolet!;
    expect(uv.points.every((p) => p.l <= 0)).toBe(true);
    expect(uv.end.kind).toBe('fixed-point');
    const [gaussian, wf] = [...t.fixedPoints].sort((a, b) => a.position.g! - b.position.g!);
    expect(gaussian!.position.g).toBeCloseTo(0, 12);
    expect(gaussian!.eigenvalues[0]!.re).toBeCloseTo(eps, 12); // relevant with eigenvalue eps
    expect(gaussian!.classification).toEqual(['relevant']);
    expect(wf!.position.g).toBeCloseTo(gStar, 12);
    expect(wf!.classification).toEqual(['irrelevant']);
  });

  it('runs to the isotropic fixed point for n = 2 and to the cubic one for n = 5', () => {
    // Isotropic (3 eps/(n+8), 0) is stable for n < 4, cubic (eps/n, (n-4) eps/(3n)) for n > 4.
    const eps = 0.1;
    const two = trace(cubic(2, eps), { start: { u: 0.01, v: 0.01 }, maxTime: 1e5 });
    expect(two.infrared!.end.kind).toBe('fixed-point');
    if (two.infrared!.end.kind === 'fixed-point') {
      expect(two.infrared!.end.position.u).toBeCloseTo((3 * eps) / 10, 10);
      expect(two.infrared!.end.position.v).toBeCloseTo(0, 10);
    }
    const five = trace(cubic(5, eps), { start: { u: 0.01, v: 0.01 }, maxTime: 1e5 });
    expect(five.infrared!.end.kind).toBe('fixed-point');
    if (five.infrared!.end.kind === 'fixed-point') {
      expect(five.infrared!.end.position.u).toBeCloseTo(eps / 5, 10);
      expect(five.infrared!.end.position.v).toBeCloseTo(eps / 15, 10);
    }
    const stable = five.fixedPoints.find((f) => f.relevant === 0);
    expect(stable?.position.u).toBeCloseTo(eps / 5, 10);
  });

  it('says where a flow escapes to infinity', () => {
    // dg/dl = g^2 from g0 = 1: |g| = 1e6 at l = 1 - 1e-6 (closed form).
    const t = trace({ couplings: ['g'], parameters: {}, convention: 'ir', beta: { g: 'g^2' } }, { start: { g: 1 }, samples: 50 });
    expect(t.infrared!.end.kind).toBe('escaped');
    expect(Math.abs(t.infrared!.end.l - (1 - 1e-6))).toBeLessThan(1e-9);
    expect(t.infrared!.summary).toMatch(/^escapes to infinity at RG time 0\.999999/);
  });

  it('spaces the samples uniformly for a linear axis', () => {
    const t = trace(on(1, 0), { start: { g: 0.2 }, maxTime: 100, samples: 100, axis: 'linear' });
    const ls = t.infrared!.points.map((p) => p.l);
    for (let k = 1; k <= 100; k++) expect(ls).toContain(k);
  });

  it('gives the iterates of a map and no ultraviolet branch', () => {
    // g_{j+1} = g_j / (1 + g_j) has g_j = g0 / (1 + g0 j) (common practice).
    const spec: FlowSpec = { couplings: ['g'], parameters: {}, convention: 'map', beta: { g: 'g / (1 + g)' } };
    const t = trace(spec, { start: { g: 1 }, direction: 'both', maxTime: 5000 });
    for (const p of t.infrared!.points) {
      expect(Number.isInteger(p.l)).toBe(true);
      expect(p.couplings.g).toBeCloseTo(1 / (1 + p.l), 13);
    }
    expect(t.infrared!.points.slice(0, 5).map((p) => p.l)).toEqual([0, 1, 2, 3, 4]);
    expect(t.infrared!.end).toEqual({ kind: 'bound', l: 5000 });
    expect(t.ultraviolet).toBeUndefined();
    expect(t.notes[0]).toMatch(/no ultraviolet direction/);
  });

  it('comes back with a message naming the field for a bad start, without throwing', () => {
    const missing = traceTrajectory(on(1, 0), { start: {} });
    expect(missing).toEqual({ ok: false, error: 'start.g: missing (the start needs a value for every coupling)', field: 'start.g' });
    const unknown = traceTrajectory(on(1, 0), { start: { g: 0.1, h: 2 } });
    expect(unknown.ok).toBe(false);
    const broken = traceTrajectory({ ...on(1, 0), beta: { g: '(n+8)/3*g^' } }, { start: { g: 0.1 } });
    expect(broken.ok).toBe(false);
    if (!broken.ok) expect(broken.field).toBe('flow.beta.g');
  });
});
