import { describe, expect, it } from 'vitest';
import type { FlowSpec } from '@/flow/types';
import { alongFlow, eulerMaclaurinBoundary, evaluate, interpolatingField } from '@/flow/logexp/series';
import { taylorSeries } from '@/flow/logexp/jets';
import { parseTerm } from '@/flow/expr';
import { checkOne, measuredP } from './support';

// A discrete RG map g_{j+1} = g_j / (1 + g_j) has the exact orbit g_j = g0 / (1 + g0 j): it is
// the time-one map of dg/dl = -g^2 (common practice). With ln t_{j+1} - ln t_j = 2 - g_j and a
// constant rate 2 for chi, |ln t0| = 2 j* - sum g_j, and the leading-order rule with RG time in
// steps gives p = (y_O c_t / y_t - c_O) / b = 1 (REFERENCES.md rule, common practice).
const exactMap: FlowSpec = {
  couplings: ['g'],
  parameters: {},
  convention: 'map',
  beta: { g: 'g / (1 + g)' },
  rates: { t: '2 - g', chi: '2', m: '1 - g/2 + g^2' },
};

describe('Taylor coefficients by series arithmetic', () => {
  it('expands quotients, exponentials, roots and sines to high order (handbook series)', () => {
    const series = (source: string, values: Record<string, number> = {}) =>
      Array.from(taylorSeries(parseTerm(source, 'test', new Set(['g', 'a'])), 'g', values, 10));
    // g/(1+g) = g - g^2 + g^3 - ...; exp(g) = sum g^k/k!; (1+g)^(1/2) binomial; sin g odd powers.
    series('g / (1 + g)').forEach((c, k) => expect(c).toBeCloseTo(k === 0 ? 0 : (-1) ** (k + 1), 14));
    let factorial = 1;
    series('exp(g)').forEach((c, k) => {
      if (k > 0) factorial *= k;
      expect(c).toBeCloseTo(1 / factorial, 15);
    });
    expect(series('sqrt(1 + g)').slice(0, 4)).toEqual([1, 0.5, -0.125, 0.0625]);
    const sine = series('sin(a*g)', { a: 2 });
    expect(sine[1]).toBeCloseTo(2, 15);
    expect(sine[3]).toBeCloseTo(-8 / 6, 15);
    expect(sine[2]).toBe(0);
    expect(series('log(1 + g)^2')[2]).toBeCloseTo(1, 15);
  });
});

describe('the interpolating flow of a map', () => {
  it('recovers dg/dl = -g^2 from the map g / (1 + g)', () => {
    // g/(1+g) - g = -g^2 + g^3 - g^4 + ...
    const displacement = Float64Array.from({ length: 11 }, (_, k) => (k >= 2 ? (k % 2 === 0 ? -1 : 1) : 0));
    const v = interpolatingField(displacement);
    expect(v[2]).toBeCloseTo(-1, 14);
    for (let k = 3; k < 11; k++) expect(Math.abs(v[k]!)).toBeLessThan(1e-12);
  });

  it('turns the sum of 1/(x + i) into its integral plus the digamma asymptotic terms', () => {
    // Along dg/dl = -g^2, sum_{i<j} g_i with g_i = 1/(x + i) is psi(x + j) - psi(x), and
    // psi(x) ~ ln x - 1/(2x) - 1/(12 x^2) + 1/(120 x^4) - ... (NIST DLMF 5.11.2), so
    // E(g) = -g/2 - g^2/12 + g^4/120 - g^6/252 + ...
    const v = Float64Array.from({ length: 9 }, (_, k) => (k === 2 ? -1 : 0));
    const r = Float64Array.from({ length: 9 }, (_, k) => (k === 1 ? 1 : 0));
    const e = eulerMaclaurinBoundary(v, r);
    expect(e[1]).toBeCloseTo(-1 / 2, 15);
    expect(e[2]).toBeCloseTo(-1 / 12, 15);
    expect(e[3]).toBeCloseTo(0, 15);
    expect(e[4]).toBeCloseTo(1 / 120, 15);
    expect(e[6]).toBeCloseTo(-1 / 252, 15);
    // D g = V g' = -g^2.
    expect(Array.from(alongFlow(v, r)).slice(0, 3)).toEqual([0, 0, -1]);
    expect(evaluate(Float64Array.of(1, 2, 3), 0.5)).toBe(2.75);
  });
});

describe('log exponents of discrete RG maps', () => {
  it('measures p = 1 for the map g/(1+g) and fails p = 1.001', () => {
    const holds = checkOne(exactMap, { scaling: 't', observable: 'chi', start: { g: 0.5 }, value: 1, power: 1 });
    expect(holds.status).toBe('holds');
    expect(Math.abs(measuredP(holds) - 1)).toBeLessThan(1e-8);
    expect(holds.uncertainty!).toBeGreaterThanOrEqual(Math.abs(measuredP(holds) - 1));
    expect(String(holds.stats.method)).toContain('interpolating flow');
    const fails = checkOne(exactMap, { scaling: 't', observable: 'chi', start: { g: 0.5 }, value: 1.001 });
    expect(fails.status).toBe('fails');
  });

  it('agrees at every decade it iterates with a direct sum over the exact orbit', () => {
    // p_eff(j) = -x A_t(g_j) / ln(1 + (2 + A_t(g_j)) / |ln t0|(j)) with A_t = -g and x = 1,
    // |ln t0|(j) = 2 j - sum_{i<j} g0 / (1 + g0 i), summed here term by term to 10^6.
    const g0 = 0.5;
    const r = checkOne(exactMap, { scaling: 't', observable: 'chi', start: { g: g0 }, value: 1 });
    const plot = r.evidence.plots!.find((p) => p.yLabel === 'effective exponent p')!;
    const points = plot.series.find((s) => s.name === 'effective exponent')!.points;
    let sum = 0;
    let next = 10;
    const direct: number[] = [];
    for (let j = 0; j <= 1_000_000; j++) {
      if (j === next) {
        const g = g0 / (1 + g0 * j);
        direct.push(g / Math.log1p((2 - g) / (2 * j - sum)));
        next *= 10;
      }
      sum += g0 / (1 + g0 * j);
    }
    // Decades 10..1e3 are iterated; 1e4..1e6 already come from the interpolating flow.
    direct.forEach((value, k) => expect(Math.abs(points[k]![1] - value)).toBeLessThan(1e-9));
  });

  it('measures p = 2 and x = 3 for g\' = g - g^2/2 with rates 1 - g and 3 - 2g', () => {
    // b = 1/2, y_t = 1, c_t = 1, y_O = 3, c_O = 2: p = (y_O c_t / y_t - c_O) / b = 2, x = y_O / y_t = 3
    // (leading-order rule with RG time counted in steps, common practice).
    const flow: FlowSpec = { couplings: ['g'], parameters: { b: 0.5 }, convention: 'map', beta: { g: 'g - b*g^2' }, rates: { t: '1 - g', O: '3 - 2*g' } };
    const r = checkOne(flow, { scaling: 't', observable: 'O', start: { g: 0.4 }, value: 2, power: 3 });
    expect(r.status).toBe('holds');
    expect(Math.abs(measuredP(r) - 2)).toBeLessThan(1e-8);
    const wrong = checkOne(flow, { scaling: 't', observable: 'O', start: { g: 0.4 }, value: 2.001 });
    expect(wrong.status).toBe('fails');
  });

  it('measures the exponent of a rate with a quadratic anomalous part', () => {
    // rate_m = 1 - g/2 + g^2: y_O = 1, c_O = 1/2, x = 1/2, c_t = 1, b = 1, so p = (1/2 - 1/2) / 1 = 0.
    const r = checkOne(exactMap, { scaling: 't', observable: 'm', start: { g: 0.5 }, value: 0, power: 0.5 });
    expect(r.status).toBe('holds');
  });

  it('measures an integral observable along the map', () => {
    // O_j = sum_{i<j} exp(2 sum_{m<i} A_t(g_m)) ~ j^(1 - 2 c_t / b) = j^-1: it converges, so p = 0;
    // with the weight 1/2 instead, O ~ j^(1/2) and p = 1/2 (common practice).
    const converging = checkOne(exactMap, { scaling: 't', observable: { integral: { t: 2 } }, start: { g: 0.5 }, value: 0 });
    expect(converging.status).toBe('holds');
    const growing = checkOne(exactMap, { scaling: 't', observable: { integral: { t: '1/2' } }, start: { g: 0.5 }, value: 0.5 });
    expect(growing.status).toBe('holds');
    expect(Math.abs(measuredP(growing) - 0.5)).toBeLessThan(1e-6);
  });

  it('handles a map with an irrelevant partner coupling by iterating it', () => {
    // g' = g - g^2 + g h, h' = h/2 + g^2: h follows 2 g^2, which leaves b = 1, so p = c_t / b = 1.
    const flow: FlowSpec = {
      couplings: ['g', 'h'],
      parameters: {},
      convention: 'map',
      beta: { g: 'g - g^2 + g*h', h: 'h/2 + g^2' },
      rates: { t: '2 - g', chi: '2' },
    };
    const r = checkOne(flow, { scaling: 't', observable: 'chi', start: { g: 0.2, h: 0.1 }, value: 1 });
    expect(r.status).toBe('holds');
    expect(Math.abs(measuredP(r) - 1)).toBeLessThan(1e-6);
    expect(r.uncertainty!).toBeGreaterThanOrEqual(Math.abs(measuredP(r) - 1));
    expect(String(r.stats.method)).toBe('map iteration');
  });
});
