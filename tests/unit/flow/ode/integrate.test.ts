import { describe, expect, it } from 'vitest';
import { integrate, luFactor, luSolve, type Rhs } from '@/flow/ode';

// y'' = -y: y = cos t, y' = -sin t from (1, 0) (closed form, common practice).
const oscillator: Rhs = (_t, y, d) => {
  d[0] = y[1];
  d[1] = -y[0];
};

describe('integrate: explicit extrapolation on smooth flows', () => {
  it('reproduces exponential decay to far below the tolerance', () => {
    // y' = -y, y(1) = e^-1 (closed form, common practice).
    const r = integrate((_t, y, d) => void (d[0] = -y[0]), 0, [1], 1, { rtol: 1e-12, atol: 1e-14 });
    expect(r.outcome).toBe('reached');
    expect(r.method).toBe('explicit (odex)');
    expect(Math.abs(r.y[0] - Math.exp(-1))).toBeLessThan(1e-12);
  });

  it('closes the Arenstorf orbit after one period without switching to the implicit method', () => {
    // Restricted three-body orbit with period T = 17.0652165601579625588917206249 (E. Hairer,
    // S. P. Norsett and G. Wanner, Solving Ordinary Differential Equations I, sec. II.0; from memory).
    const mu = 0.012277471;
    const mp = 1 - mu;
    const f: Rhs = (_t, y, d) => {
      const d1 = ((y[0] + mu) ** 2 + y[1] ** 2) ** 1.5;
      const d2 = ((y[0] - mp) ** 2 + y[1] ** 2) ** 1.5;
      d[0] = y[2];
      d[1] = y[3];
      d[2] = y[0] + 2 * y[3] - (mp * (y[0] + mu)) / d1 - (mu * (y[0] - mp)) / d2;
      d[3] = y[1] - 2 * y[2] - (mp * y[1]) / d1 - (mu * y[1]) / d2;
    };
    const y0 = [0.994, 0, 0, -2.00158510637908252240537862224];
    const r = integrate(f, 0, y0, 17.0652165601579625588917206249, { rtol: 1e-12, atol: 1e-12 });
    expect(r.outcome).toBe('reached');
    expect(r.method).toBe('explicit (odex)');
    expect(Math.hypot(r.y[0] - y0[0], r.y[1] - y0[1])).toBeLessThan(1e-6);
  });

  it('does not mistake a fast oscillation for stiffness', () => {
    // y'' = -100 y: y = cos(10 t) (closed form, common practice).
    const f: Rhs = (_t, y, d) => {
      d[0] = y[1];
      d[1] = -100 * y[0];
    };
    const r = integrate(f, 0, [1, 0], 100, { rtol: 1e-10, atol: 1e-12 });
    expect(r.method).toBe('explicit (odex)');
    expect(Math.abs(r.y[0] - Math.cos(1000))).toBeLessThan(1e-7);
  });

  it('integrates backwards in time', () => {
    const r = integrate(oscillator, Math.PI, [-1, 0], 0, { rtol: 1e-11, atol: 1e-12 });
    expect(r.outcome).toBe('reached');
    expect(r.t).toBe(0);
    expect(Math.abs(r.y[0] - 1)).toBeLessThan(1e-9);
    for (const method of ['implicit', 'explicit'] as const) {
      const back = integrate(oscillator, 1, [Math.cos(1), -Math.sin(1)], 0, { method, rtol: 1e-10, atol: 1e-12 });
      expect(Math.abs(back.y[0] - 1)).toBeLessThan(1e-8);
    }
  });

  it('reports the state at requested output times from both methods', () => {
    const times = [0, 0.5, 1, 2.5, 3];
    for (const method of ['explicit', 'implicit'] as const) {
      const r = integrate(oscillator, 0, [1, 0], 3, { method, rtol: 1e-11, atol: 1e-12, outputTimes: times });
      expect(r.outputs.map((o) => o.t)).toEqual(times);
      for (const o of r.outputs) {
        expect(Math.abs(o.y[0] - Math.cos(o.t))).toBeLessThan(1e-8);
        expect(Math.abs(o.y[1] + Math.sin(o.t))).toBeLessThan(1e-8);
      }
    }
  });
});

describe('integrate: events, escapes and limits', () => {
  it('stops at the first zero of cos t, located at pi/2 by both methods', () => {
    for (const method of ['explicit', 'implicit'] as const) {
      const r = integrate(oscillator, 0, [1, 0], 10, { method, rtol: 1e-11, atol: 1e-12, event: (_t, y) => y[0] });
      expect(r.outcome).toBe('event');
      expect(Math.abs(r.t - Math.PI / 2)).toBeLessThan(1e-8);
    }
  });

  it('reports where a flow escapes to infinity (dg/dl = g^2 blows up at l = 1/g0)', () => {
    // g(l) = g0 / (1 - g0 l): |g| = 1e8 at l = 1 - 1e-8 for g0 = 1 (closed form, common practice).
    const f: Rhs = (_t, y, d) => void (d[0] = y[0] * y[0]);
    for (const method of ['auto', 'explicit', 'implicit'] as const) {
      const r = integrate(f, 0, [1], 5, { method, rtol: 1e-10, atol: 1e-12, escape: 1e8 });
      expect(r.outcome).toBe('escaped');
      expect(Math.abs(r.t - (1 - 1e-8))).toBeLessThan(1e-9);
    }
  });

  it('watches only the requested components for escape', () => {
    // The second component grows without bound but is not a coupling.
    const f: Rhs = (_t, y, d) => {
      d[0] = -y[0];
      d[1] = 1e9;
    };
    const r = integrate(f, 0, [1, 0], 2, { escape: 1e6, escapeComponents: 1 });
    expect(r.outcome).toBe('reached');
  });

  it('returns the last good point instead of throwing when the flow turns NaN', () => {
    const f: Rhs = (t, y, d) => void (d[0] = t < 0.5 ? -y[0] : NaN);
    for (const method of ['auto', 'explicit', 'implicit'] as const) {
      const r = integrate(f, 0, [1], 1, { method });
      expect(r.outcome).toBe('non-finite');
      expect(r.t).toBeLessThanOrEqual(0.5);
      expect(Number.isFinite(r.y[0])).toBe(true);
    }
  });

  it('stops with outcome max-steps when the step bound is exhausted', () => {
    for (const method of ['auto', 'explicit', 'implicit'] as const) {
      const r = integrate(oscillator, 0, [1, 0], 1000, { method, maxSteps: 20, rtol: 1e-12, atol: 1e-12 });
      expect(r.outcome).toBe('max-steps');
      expect(r.t).toBeGreaterThan(0);
      expect(r.t).toBeLessThan(1000);
    }
  });

  it('stops with outcome deadline once the time budget has passed', () => {
    for (const method of ['auto', 'implicit'] as const) {
      const r = integrate(oscillator, 0, [1, 0], 1e6, { method, deadline: performance.now() - 1, rtol: 1e-12, atol: 1e-12 });
      expect(r.outcome).toBe('deadline');
      expect(r.t).toBeLessThan(1e6);
    }
  });

  it('stops where the step observer asks it to', () => {
    const seen: number[] = [];
    const r = integrate(oscillator, 0, [1, 0], 100, {
      onStep: (t) => {
        seen.push(t);
        return t < 3;
      },
    });
    expect(r.outcome).toBe('stopped');
    expect(r.t).toBe(seen[seen.length - 1]);
    expect(r.t).toBeGreaterThanOrEqual(3);
  });

  it('refuses malformed arguments with a message naming the problem', () => {
    expect(() => integrate(oscillator, 0, [1, 0], NaN)).toThrow(/finite ends/);
    expect(() => integrate(oscillator, 0, [1, 0], 1, { rtol: [1e-6] })).toThrow(/rtol has 1 entries for 2 components/);
    expect(() => integrate(oscillator, 0, [1, 0], 1, { rtol: 0, atol: 0 })).toThrow(/both 0/);
    expect(() => integrate(oscillator, 0, [1, 0], 1, { outputTimes: [0.5, 0.2] })).toThrow(/outputTimes\[1\]/);
  });
});

describe('dense LU used by the implicit method', () => {
  it('solves a linear system that needs pivoting and flags a singular matrix', () => {
    // A zero in the first pivot position forces a row exchange; the solution is checked by substitution.
    const a = Float64Array.from([0, 2, 1, 1, 1, 1, 2, 1, 0]);
    const original = Float64Array.from(a);
    const pivots = new Int32Array(3);
    expect(luFactor(a, 3, pivots)).toBe(true);
    const b = Float64Array.from([5, 6, 4]);
    luSolve(a, 3, pivots, b);
    for (let i = 0; i < 3; i++) {
      const row = original[i * 3] * b[0] + original[i * 3 + 1] * b[1] + original[i * 3 + 2] * b[2];
      expect(row).toBeCloseTo([5, 6, 4][i], 12);
    }
    expect(luFactor(Float64Array.from([1, 2, 2, 4]), 2, new Int32Array(2))).toBe(false);
  });
});
