import { describe, expect, it } from 'vitest';
import { integrate, type Jacobian, type Rhs } from '@/flow/ode';

// Robertson's chemical kinetics, the standard stiff test problem.
// Reference values: E. Hairer and G. Wanner, Solving Ordinary Differential Equations II (1996),
// sec. IV.10, and the Test Set for IVP Solvers (F. Mazzia et al., problem ROBER); from memory.
// Cross-checked here against SciPy 1.10's Radau at rtol 1e-12 (agrees to 1e-12 relative) and, at
// t = 40, inside the test against the explicit method run to completion.
const robertson: Rhs = (_t, y, d) => {
  d[0] = -0.04 * y[0] + 1e4 * y[1] * y[2];
  d[2] = 3e7 * y[1] * y[1];
  d[1] = -d[0] - d[2];
};
const robertsonJacobian: Jacobian = (_t, y, j) => {
  j[0] = -0.04;
  j[1] = 1e4 * y[2];
  j[2] = 1e4 * y[1];
  j[6] = 0;
  j[7] = 6e7 * y[1];
  j[8] = 0;
  j[3] = -j[0] - j[6];
  j[4] = -j[1] - j[7];
  j[5] = -j[2] - j[8];
};
const ROBERTSON_40 = [0.7158270687193246, 9.185534764e-6, 0.2841637457];
const ROBERTSON_1E11 = [2.083340149701255e-8, 8.333360770334713e-14, 0.999999979166505];

function relativeError(got: ArrayLike<number>, want: readonly number[]): number {
  let worst = 0;
  for (let i = 0; i < want.length; i++) worst = Math.max(worst, Math.abs(got[i] - want[i]) / Math.abs(want[i]));
  return worst;
}

describe('implicit method (RODAS4) on stiff problems', () => {
  it('reproduces Robertson at t = 40 with a difference Jacobian', () => {
    const r = integrate(robertson, 0, [1, 0, 0], 40, { method: 'implicit', rtol: 1e-9, atol: 1e-17 });
    expect(r.outcome).toBe('reached');
    expect(r.method).toBe('implicit (RODAS4)');
    expect(relativeError(r.y, ROBERTSON_40)).toBeLessThan(1e-8);
    // Mass is conserved exactly by the kinetics (common practice).
    expect(Math.abs(r.y[0] + r.y[1] + r.y[2] - 1)).toBeLessThan(1e-12);
  });

  it('agrees at t = 40 with the explicit method run to completion', () => {
    const implicit = integrate(robertson, 0, [1, 0, 0], 40, { method: 'implicit', rtol: 1e-10, atol: 1e-17, jacobian: robertsonJacobian });
    const explicit = integrate(robertson, 0, [1, 0, 0], 40, { method: 'explicit', rtol: 1e-10, atol: 1e-17, maxSteps: 1e6 });
    expect(explicit.outcome).toBe('reached');
    expect(explicit.method).toBe('explicit (odex)');
    expect(relativeError(implicit.y, Array.from(explicit.y))).toBeLessThan(1e-8);
  });

  it('follows Robertson to t = 1e11 with the analytic Jacobian', () => {
    const r = integrate(robertson, 0, [1, 0, 0], 1e11, {
      method: 'implicit',
      rtol: 1e-8,
      atol: 1e-20,
      jacobian: robertsonJacobian,
    });
    expect(r.outcome).toBe('reached');
    expect(relativeError(r.y, ROBERTSON_1E11)).toBeLessThan(1e-7);
    expect(r.stats.jacobians).toBe(r.stats.accepted);
  });

  it('switches from explicit to implicit by itself on Robertson and says why', () => {
    const r = integrate(robertson, 0, [1, 0, 0], 1e11, { rtol: 1e-8, atol: 1e-20 });
    expect(r.outcome).toBe('reached');
    expect(r.method).toBe('explicit (odex), then implicit (RODAS4)');
    expect(r.switchReason).toBe('stiffness');
    expect(r.switchedAt).toBeGreaterThan(0);
    expect(r.switchedAt).toBeLessThan(1);
    expect(relativeError(r.y, ROBERTSON_1E11)).toBeLessThan(1e-6);
  });

  it('solves a linear stiff system with eigenvalues -1, -1e3, -1e6 to its closed form', () => {
    // y' = A y with A = P diag(-1, -1e3, -1e6) P^-1 and P = [[1,1,0],[0,1,1],[1,0,1]] (common practice).
    const lambda = [-1, -1e3, -1e6];
    const P = [
      [1, 1, 0],
      [0, 1, 1],
      [1, 0, 1],
    ];
    const Pinv = [
      [0.5, -0.5, 0.5],
      [0.5, 0.5, -0.5],
      [-0.5, 0.5, 0.5],
    ];
    const A = P.map((row, i) => row.map((_, j) => P[i].reduce((s, pik, k) => s + pik * lambda[k] * Pinv[k][j], 0)));
    const f: Rhs = (_t, y, d) => {
      for (let i = 0; i < 3; i++) d[i] = A[i][0] * y[0] + A[i][1] * y[1] + A[i][2] * y[2];
    };
    const y0 = [1, 2, 3];
    const exact = (t: number): number[] => {
      const c = Pinv.map((row) => row.reduce((s, v, j) => s + v * y0[j], 0));
      return P.map((row) => row.reduce((s, v, k) => s + v * c[k] * Math.exp(lambda[k] * t), 0));
    };
    for (const method of ['implicit', 'auto'] as const) {
      const r = integrate(f, 0, y0, 3, { method, rtol: 1e-10, atol: 1e-12 });
      expect(r.outcome).toBe('reached');
      const want = exact(3);
      for (let i = 0; i < 3; i++) expect(Math.abs(r.y[i] - want[i])).toBeLessThan(1e-9);
      expect(r.stats.steps).toBeLessThan(3000);
    }
  });

  it('keeps a non-autonomous stiff solution on its closed form (Prothero–Robinson, lambda = -1e6)', () => {
    // y' = lambda (y - cos t) - sin t, y(0) = 1 has y = cos t for every lambda (common practice).
    const f: Rhs = (t, y, d) => {
      d[0] = -1e6 * (y[0] - Math.cos(t)) - Math.sin(t);
    };
    const r = integrate(f, 0, [1], 10, { method: 'implicit', rtol: 1e-10, atol: 1e-12 });
    expect(r.outcome).toBe('reached');
    expect(Math.abs(r.y[0] - Math.cos(10))).toBeLessThan(1e-9);
  });

  it('converges with order 4 at fixed steps (RODAS4 is a fourth-order method)', () => {
    // Hairer and Wanner (1996), sec. IV.7: RODAS is of order 4 with an embedded order-3 estimate.
    const f: Rhs = (t, y, d) => {
      d[0] = -2 * y[0] + Math.cos(t);
    };
    const exact = (2 * Math.cos(2) + Math.sin(2)) / 5 - (2 / 5) * Math.exp(-4);
    const errors = [0.2, 0.1, 0.05].map((h) => {
      const r = integrate(f, 0, [0], 2, { method: 'implicit', rtol: 1e3, atol: 1e3, initialStep: h, maxStep: h });
      return Math.abs(r.y[0] - exact);
    });
    const orders = [Math.log2(errors[0] / errors[1]), Math.log2(errors[1] / errors[2])];
    for (const p of orders) {
      expect(p).toBeGreaterThan(3.8);
      expect(p).toBeLessThan(4.3);
    }
  });

  it('gives errors that shrink with the tolerance', () => {
    const f: Rhs = (_t, y, d) => {
      d[0] = -y[0] * y[0];
    };
    const err = (rtol: number): number =>
      Math.abs(integrate(f, 0, [1], 10, { method: 'implicit', rtol, atol: rtol }).y[0] - 1 / 11);
    expect(err(1e-6)).toBeGreaterThan(err(1e-9));
    expect(err(1e-9)).toBeLessThan(1e-8);
  });

  it('times the relaxation oscillation of Van der Pol at mu = 1000 to the asymptotic period', () => {
    // Period (3 - 2 ln 2) mu + 3 a mu^(-1/3) - (2/3) ln(mu) / mu + O(1/mu), a = 2.338107410459767
    // the first zero of Ai(-x) (A. A. Dorodnitsyn 1947; Airy zero from NIST DLMF 9.9; from memory).
    const mu = 1000;
    const f: Rhs = (_t, y, d) => {
      d[0] = y[1];
      d[1] = mu * (1 - y[0] * y[0]) * y[1] - y[0];
    };
    const settle = integrate(f, 0, [2, 0], 3 * mu, { rtol: 1e-10, atol: 1e-10, maxSteps: 1e6 });
    const nextZero = (t: number, y: Float64Array) =>
      integrate(f, t, y, t + 3 * mu, { rtol: 1e-10, atol: 1e-10, maxSteps: 1e6, event: (_t, yy) => yy[0] });
    const a = nextZero(settle.t, settle.y);
    const b = nextZero(a.t, a.y);
    const c = nextZero(b.t, b.y);
    expect([a.outcome, b.outcome, c.outcome]).toEqual(['event', 'event', 'event']);
    expect(a.method).toContain('implicit');
    const period = c.t - a.t;
    const asymptotic = (3 - 2 * Math.log(2)) * mu + 3 * 2.338107410459767 * Math.pow(mu, -1 / 3) - ((2 / 3) * Math.log(mu)) / mu;
    expect(Math.abs(period - asymptotic) / asymptotic).toBeLessThan(1e-5);
  });

  it('solves stiff Van der Pol (eps = 1e-6) to the value an independent library gives', () => {
    // y1' = y2, y2' = ((1 - y1^2) y2 - y1) / eps, y(0) = (2, -0.66), at t = 2. Reference computed
    // with SciPy 1.10 Radau at rtol = atol = 1e-12: (1.706167437543236, -0.8928100165510559).
    const eps = 1e-6;
    const f: Rhs = (_t, y, d) => {
      d[0] = y[1];
      d[1] = ((1 - y[0] * y[0]) * y[1] - y[0]) / eps;
    };
    const r = integrate(f, 0, [2, -0.66], 2, { rtol: 1e-10, atol: 1e-10, maxSteps: 1e6 });
    expect(r.outcome).toBe('reached');
    expect(r.method).toContain('implicit');
    expect(Math.abs(r.y[0] - 1.706167437543236)).toBeLessThan(1e-8);
    expect(Math.abs(r.y[1] - -0.8928100165510559)).toBeLessThan(1e-7);
  });
});
