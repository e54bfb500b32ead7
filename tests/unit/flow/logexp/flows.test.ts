import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import type { FlowSpec } from '@/flow/types';
import { checkOne, measuredP, onFlow } from './support';

describe('log exponents of flows with more than one coupling', () => {
  it('gets the right exponent through the implicit method when a fast irrelevant coupling makes the flow stiff', () => {
    // dg/dl = -3 g^2 + (17/3) g^3 + g w, dw/dl = -50 w + g^2 (n = 1 two-loop flow plus a fast
    // irrelevant partner). On the slow manifold w = g^2/50 + ..., which changes neither b nor c_t,
    // so p = c_t / b = 1/3 as for n = 1 (leading-order rule, common practice).
    const flow: FlowSpec = {
      couplings: ['g', 'w'],
      parameters: { n: 1 },
      convention: 'ir',
      beta: { g: '-(n+8)/3*g^2 + (3*n+14)/3*g^3 + g*w', w: '-50*w + g^2' },
      rates: { t: '2 - ((n+2)/3*g - 5*(n+2)/18*g^2)', chi: '2 - (n+2)/18*g^2 + w' },
    };
    const r = checkOne(flow, { scaling: 't', observable: 'chi', start: { g: 0.3, w: 0.5 }, value: '1/3' });
    expect(r.status).toBe('holds');
    expect(Math.abs(measuredP(r) - 1 / 3)).toBeLessThan(1e-8);
    expect(r.stats.method).toBe('explicit (odex), then implicit (RODAS4)');
    expect(Number(r.stats.switchedAt)).toBeGreaterThan(0);
    expect(r.sanity.find((f) => f.check === 'solver')?.message).toMatch(/switched to the implicit method at RG time .* \(stiffness\)/);
  });

  it('follows the marginal direction when an irrelevant coupling feeds the marginal one', () => {
    // dg/dl = -3 g^2 + 2 w, dw/dl = -50 w + g^2: the centre manifold w = g^2/50 gives
    // dg/dl = -(3 - 2/50) g^2 (u.B(v,v) with the left null vector u = (1, 2/50)), so
    // p = c_t / b = 1 / 2.96 (leading-order rule, common practice).
    const flow: FlowSpec = {
      couplings: ['g', 'w'],
      parameters: {},
      convention: 'ir',
      beta: { g: '-3*g^2 + 2*w', w: '-50*w + g^2' },
      rates: { t: '2 - g', chi: '2' },
    };
    const r = checkOne(flow, { scaling: 't', observable: 'chi', start: { g: 0.3, w: 0 }, value: '1/2.96' });
    expect(r.status).toBe('holds');
    expect(r.evidence.values?.['b in d xi/dl = -b xi^2']).toBeCloseTo(2.96, 12);
  });

  it('reduces two marginal couplings at n = 1 to the single-coupling exponent 1/3', () => {
    // Cubic anisotropy at eps = 0: beta_u = (n+8)/3 u^2 + 2uv, beta_v = 3v^2 + 4uv (Aharony 1973,
    // via REFERENCES.md, from memory). At n = 1, u + v flows like one phi^4 coupling:
    // d(u+v)/dl = -3 (u+v)^2, so with d ln t/dl = 2 - (u+v) the exponent of chi is 1/3.
    const flow: FlowSpec = {
      couplings: ['u', 'v'],
      parameters: { n: 1, eps: 0 },
      convention: 'uv',
      beta: { u: '-eps*u + (n+8)/3*u^2 + 2*u*v', v: '-eps*v + 3*v^2 + 4*u*v' },
      rates: { t: '2 - (n+2)/3*(u+v)', chi: '2' },
    };
    const r = checkOne(flow, { scaling: 't', observable: 'chi', start: { u: 0.2, v: 0.1 }, value: '1/3' });
    expect(r.status).toBe('holds');
    expect(r.sanity.find((f) => f.check === 'marginality')?.message).toContain('every coupling');
    // The analytic value along the attracting ray found from the flow.
    expect(r.evidence.values?.['p, analytic leading order']).toBeCloseTo(1 / 3, 10);
  });
});

describe('log-exponent sanity and bad input', () => {
  it('flags a flow typed in the wrong convention instead of converging onto a spurious zero', () => {
    // The O(n) beta function (mu dg/dmu) entered as dg/dl: g grows to the two-loop zero 9/17.
    const flow = { ...onFlow(1), convention: 'ir' as const };
    const r = checkOne(flow, { scaling: 't', observable: 'chi', start: { g: 0.1 }, value: '1/3' });
    expect(r.status).toBe('inconclusive');
    expect(r.message).toMatch(/do not flow to zero/);
    const marginality = r.sanity.find((f) => f.check === 'marginality');
    expect(marginality?.ok).toBe(false);
    expect(marginality?.message).toMatch(/marginally relevant/);
  });

  it('checks the flow at eps = 0 even when the file declares another eps', () => {
    const flow = { ...onFlow(1), parameters: { n: 1, eps: 0.5 } };
    const r = checkOne(flow, { scaling: 't', observable: 'chi', start: { g: 0.3 }, value: '1/3' });
    expect(r.status).toBe('holds');
    expect(r.sanity.find((f) => f.check === 'marginality')?.message).toContain('eps = 0');
  });

  it('refuses claims that are missing what they need, naming the field', () => {
    const flow = onFlow(1);
    const cases: [Record<string, unknown>, RegExp][] = [
      [{ scaling: 't', observable: 'chi', start: {}, value: 0.3 }, /start\.g: missing/],
      [{ scaling: 't', observable: 'chi', start: { g: 0 }, value: 0.3 }, /start: every coupling is zero/],
      [{ scaling: 't', observable: 'chi', start: { g: 0.3, h: 1 }, value: 0.3 }, /start\.h: "h" is not a coupling/],
      [{ scaling: 'T', observable: 'chi', start: { g: 0.3 }, value: 0.3 }, /scaling: "T" is not a rate of this flow \(rates: t, chi, xi\)/],
      [{ scaling: 't', observable: 'chi', start: { g: 0.3 } }, /value: missing/],
      [{ scaling: 't', observable: 'chi', start: { g: 'g/2' }, value: 0.3 }, /start\.g: must be a number or depend on the parameters only/],
      [{ scaling: 't', observable: 'chi', start: { g: 0.3 }, value: 0.3, valeu: 1 }, /valeu: unknown field/],
      [{ scaling: 't', observable: 'chi', start: { g: 0.3 }, value: 0.3, settings: { rtol: 1 } }, /settings\.rtol: must lie between/],
      [{ scaling: 't', observable: 'chi', start: { g: 0.3 }, value: 0.3, settings: { steps: 1 } }, /settings\.steps: unknown setting/],
      [{ scaling: 't', observable: { integral: { q: 2 } }, start: { g: 0.3 }, value: 0.3 }, /observable\.integral\.q: "q" is not a rate/],
      [{ scaling: 't', observable: 'chi', start: { g: 0.3 }, value: '1/(' }, /value/],
    ];
    for (const [claim, message] of cases) {
      const r = checkOne(flow, claim);
      expect(r.status, JSON.stringify(claim)).toBe('invalid');
      expect(r.message).toMatch(message);
    }
  });

  it('refuses a scaling variable that is not relevant at zero coupling', () => {
    const flow: FlowSpec = { ...onFlow(1), rates: { t: '-2 + g', chi: '2' } };
    const r = checkOne(flow, { scaling: 't', observable: 'chi', start: { g: 0.3 }, value: 0.3 });
    expect(r.status).toBe('invalid');
    expect(r.message).toMatch(/scaling: the rate of "t" at zero couplings is -2/);
  });

  it('comes back inconclusive, not hung, when the time bound is tiny', () => {
    const r = checkOne(onFlow(1), { scaling: 't', observable: 'chi', start: { g: 0.3 }, value: '1/3' }, { timeLimitMs: 0.01 });
    expect(r.status).toBe('inconclusive');
  });

  it('never throws or hangs on arbitrary starts, values and weights', () => {
    const flow = onFlow(2);
    fc.assert(
      fc.property(
        fc.double({ min: -5, max: 5, noNaN: true }),
        fc.oneof(fc.double({ noNaN: false }), fc.constantFrom('1/0', 'n/', 'g', 'pi', '(n+2)/(n+8)')),
        fc.oneof(fc.constant('chi' as unknown), fc.record({ integral: fc.record({ t: fc.double({ min: -4, max: 4, noNaN: true }) }) })),
        (g, value, observable) => {
          const r = checkOne(flow, { scaling: 't', observable, start: { g }, value }, { timeLimitMs: 500 });
          expect(['holds', 'fails', 'inconclusive', 'invalid']).toContain(r.status);
          expect(typeof r.message).toBe('string');
        },
      ),
      { numRuns: 40, seed: 7 },
    );
  });
});
