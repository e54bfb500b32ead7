// What a trajectory plot block draws, from real trajectories of flow/trajectory.ts: fixed points
// classified in words, the view it falls back to, samples that a logarithmic axis cannot show,
// an escaping flow kept from squashing the picture, and the block's settings read safely.
import { describe, expect, test } from 'vitest';
import { traceTrajectory, type FlowSpec } from '../../flow';
import { defaultPlotSettings, describeFixedPointInWords, plotPicture, resolveAxes, traceOptions, withOverlay, type PlotSettings } from '../../editor/blocks/plotData';
import { plotBlockNode, plotFieldsOf, plotSettingsOf } from '../../editor/blocks/plotNodes';

// Isotropic plus cubic anisotropy at one loop (A. Aharony, Phys. Rev. B 8, 4270 (1973);
// REFERENCES.md, from memory): the isotropic point (3 eps/(n+8), 0) is stable for n < 4, the
// cubic point (eps/n, (n-4) eps/(3n)) for n > 4.
const cubic = (n: number): FlowSpec => ({
  couplings: ['u', 'v'],
  parameters: { n, eps: 0.1 },
  convention: 'uv',
  beta: { u: '-eps*u + (n+8)/3*u^2 + 2*u*v', v: '-eps*v + 3*v^2 + 4*u*v' },
});

function picture(spec: FlowSpec, starts: Record<string, number>[], settings: Partial<PlotSettings> = {}) {
  const full = { ...defaultPlotSettings, ...settings };
  const results = traceOptions(full, starts, spec.convention, spec.couplings).map((options) => traceTrajectory(spec, options));
  return plotPicture(full, spec.couplings, spec.convention, starts.map((s) => JSON.stringify(s)), results);
}

const near = (a: number, b: number) => Math.abs(a - b) < 1e-9;

describe('fixed points in words', () => {
  test('for n = 2 the isotropic point is marked attractive, and the Ising point (0, eps/3) a saddle', () => {
    const drawn = picture(cubic(2), [{ u: 0.01, v: 0.005 }, { u: 0.001, v: 0.05 }]);
    const isotropic = drawn.markers.find((m) => near(m.x, 0.03) && near(m.y, 0));
    const ising = drawn.markers.find((m) => near(m.x, 0) && near(m.y, 0.1 / 3));
    expect(isotropic?.label).toBe('attractive fixed point');
    expect(isotropic?.shape).toBe('disc');
    expect(ising?.label).toBe('saddle fixed point (1 relevant)');
    expect(ising?.shape).toBe('square');
  });

  test('for n = 5 the cubic point is attractive and the isotropic one a saddle', () => {
    const drawn = picture(cubic(5), [{ u: 0.01, v: 0.005 }, { u: 0.05, v: 0.001 }]);
    const cubicPoint = drawn.markers.find((m) => near(m.x, 0.02) && near(m.y, 0.1 / 15));
    const isotropic = drawn.markers.find((m) => near(m.x, 0.3 / 13) && near(m.y, 0));
    expect(cubicPoint?.label).toBe('attractive fixed point');
    expect(isotropic?.label).toBe('saddle fixed point (1 relevant)');
    // At the isotropic point the v direction has eigenvalue eps (n-4)/(n+8) = 0.1/13 > 0: relevant.
    expect(isotropic?.detail).toContain(String(Number((0.1 / 13).toPrecision(4))));
  });

  test('a fixed point of a map is classified by |lambda| against 1 and shows y = ln|lambda|', () => {
    // g' = 2^eps g - A g^2 (flow/examples/discrete-map.json): lambda = 2^eps at g = 0 and
    // 2 - 2^eps at g* = (2^eps - 1)/A (derivable; common practice).
    const eps = 0.2;
    const gStar = (2 ** eps - 1) / 0.5;
    const words = describeFixedPointInWords({ position: { g: gStar }, eigenvalues: [{ re: 2 - 2 ** eps, im: 0 }], exponents: [Math.log(2 - 2 ** eps)], classification: ['irrelevant'], relevant: 0, residual: 0 }, 'map');
    expect(words.label).toBe('attractive fixed point');
    expect(words.detail).toContain('eigenvalues of the map λ');
    const gaussian = describeFixedPointInWords({ position: { g: 0 }, eigenvalues: [{ re: 2 ** eps, im: 0 }], exponents: [eps * Math.log(2)], classification: ['relevant'], relevant: 1, residual: 0 }, 'map');
    expect(gaussian.label).toBe('repulsive fixed point');
    expect(gaussian.shape).toBe('ring');
  });

  test('a fixed point with a marginal direction says so', () => {
    const words = describeFixedPointInWords({ position: { g: 0 }, eigenvalues: [{ re: 0, im: 0 }], classification: ['marginal'], relevant: 0, residual: 0 }, 'uv');
    expect(words.label).toBe('marginal fixed point');
    expect(words.detail).toContain('1 marginal direction');
  });
});

describe('axes and samples', () => {
  // The O(n) two-loop flow (Kleinert and Schulte-Frohlinde 2001; REFERENCES.md, from memory).
  const chain: FlowSpec = { couplings: ['g'], parameters: { n: 0, eps: 0.1 }, convention: 'uv', beta: { g: '-eps*g + (n+8)/3*g^2 - (3*n+14)/3*g^3' } };

  test('a flow with one coupling is drawn against RG time, and the plot says why', () => {
    expect(resolveAxes({ ...defaultPlotSettings, view: 'plane' }, ['g'])).toMatchObject({ view: 'time', y: 'g' });
    const drawn = picture(chain, [{ g: 0.2 }]);
    expect(drawn.x.label).toBe('RG time l');
    expect(drawn.notes[0]).toBe('The flow has one coupling, so it is drawn against RG time.');
  });

  test('on a logarithmic RG-time axis RG time 0 and the ultraviolet branches are left out, and said to be', () => {
    const drawn = picture(chain, [{ g: 0.2 }], { view: 'time', timeScale: 'log', direction: 'both' });
    expect(drawn.series).toHaveLength(1);
    expect(drawn.series[0]!.points.every((p) => p.x > 0)).toBe(true);
    expect(drawn.notes).toContain('The ultraviolet branches are drawn on a linear RG-time axis only.');
    const linear = picture(chain, [{ g: 0.2 }], { view: 'time', timeScale: 'linear', direction: 'both', span: 30 });
    expect(linear.series.map((s) => s.name)).toEqual(['start 1 ({"g":0.2}), infrared', 'start 1 ({"g":0.2}), ultraviolet']);
  });

  test('every sample reads its RG time and couplings', () => {
    const drawn = picture(cubic(2), [{ u: 0.01, v: 0.005 }]);
    const point = drawn.series[0]!.points[5]!;
    expect(point.readout!.map((r) => r.name)).toEqual(['RG time', 'u', 'v']);
    expect(point.readout![1]!.value).toBe(point.x);
    expect(point.readout![2]!.value).toBe(point.y);
  });

  test('a flow escaping to infinity does not squash the view around its start', () => {
    // dg/dl = g^2 from g = 0.5 blows up at l = 2 (g = 1/(2 - l); common practice).
    const escaping: FlowSpec = { couplings: ['g'], parameters: {}, convention: 'ir', beta: { g: 'g^2' } };
    const drawn = picture(escaping, [{ g: 0.5 }], { view: 'time', timeScale: 'linear', span: 10 });
    expect(drawn.notes.some((n) => /escapes to infinity/.test(n))).toBe(true);
    expect(drawn.y.domain![1]).toBeLessThan(2);
    expect(drawn.y.domain![0]).toBeLessThanOrEqual(0.5);
  });

  test('a start the solver refuses is reported against its number', () => {
    const results = [traceTrajectory(chain, { start: { g: 'sqrt(-1)' } })];
    const drawn = plotPicture({ ...defaultPlotSettings, view: 'time' }, ['g'], 'uv', ['g = sqrt(-1)'], results);
    expect(drawn.problems).toHaveLength(1);
    expect(drawn.problems[0]!.start).toBe(0);
    expect(drawn.series).toHaveLength(0);
  });

  test('a dataset laid over the plot widens the view to show every point with its error bar', () => {
    const drawn = picture(cubic(2), [{ u: 0.01, v: 0.005 }]);
    const data = { id: 'dataset-1', name: 'invented measurements', look: 'points' as const, points: [{ x: 0.2, y: 0.05, sigma: 0.01 }] };
    const laid = withOverlay(drawn, [data]);
    expect(laid.series.at(-1)).toBe(data);
    expect(laid.x.domain![1]).toBeGreaterThanOrEqual(0.2);
    expect(laid.y.domain![1]).toBeGreaterThanOrEqual(0.06);
    expect(laid.x.domain![0]).toBe(drawn.x.domain![0]);
  });

  test('a map is followed into the infrared only, over its own number of steps', () => {
    const options = traceOptions({ ...defaultPlotSettings, direction: 'both' }, [{ g: 0.1 }], 'map', ['g']);
    expect(options[0]).toMatchObject({ direction: 'ir', maxTime: 1e4 });
  });
});

describe('the block in the document', () => {
  test('its settings come from its attributes, unknown values falling back to the defaults', () => {
    expect(plotSettingsOf({ view: 'sideways', timeScale: 'log', valueScale: 'cubic', direction: 'both', span: '250' })).toEqual({
      ...defaultPlotSettings,
      view: 'plane',
      timeScale: 'log',
      direction: 'both',
      span: 250,
    });
    expect(plotSettingsOf({ span: -3 }).span).toBeNull();
  });

  test('its caption and starting points are text fields of their own', () => {
    const block = plotBlockNode({ caption: 'The chain coupling', starts: ['g = 0.001', 'g = 0.2'] });
    expect(plotFieldsOf(block)).toEqual({ caption: 'The chain coupling', starts: ['g = 0.001', 'g = 0.2'] });
    expect(block.content!.map((c) => c.attrs!.field)).toEqual(['caption', 'start', 'start']);
  });
});
