import { describe, expect, it } from 'vitest';
import { compileModel } from '../../../flow/model';
import type { FlowSpec } from '../../../flow/types';

// Two-loop O(n) RG functions, Kleinert and Schulte-Frohlinde (2001), via REFERENCES.md (from memory).
const ON: FlowSpec = {
  couplings: ['g'],
  parameters: { n: 1, eps: 0.1 },
  convention: 'uv',
  beta: { g: '-eps*g + (n+8)/3*g^2 - (3*n+14)/3*g^3' },
  rates: { t: '2 - ((n+2)/3*g - 5*(n+2)/18*g^2)', chi: '2 - (n+2)/18*g^2' },
};

describe('a compiled flow', () => {
  it('gives the infrared velocity dg/dl = -beta for a flow written as mu dg/dmu', () => {
    const point = compileModel(ON).at();
    const out = new Float64Array(1);
    const g = 0.07;
    point.field([g], out);
    expect(out[0]).toBeCloseTo(-(-0.1 * g + 3 * g * g - (17 / 3) * g ** 3), 15);
  });

  it('takes the entries as dg/dl in the infrared convention and as the next step for a map', () => {
    const ir = compileModel({ ...ON, convention: 'ir' }).at();
    const map = compileModel({ couplings: ['g'], parameters: {}, convention: 'map', beta: { g: 'g - g^2' } }).at();
    const out = new Float64Array(1);
    ir.field([0.07], out);
    expect(out[0]).toBeCloseTo(-0.1 * 0.07 + 3 * 0.07 ** 2 - (17 / 3) * 0.07 ** 3, 15);
    map.field([0.3], out);
    expect(out[0]).toBeCloseTo(-0.09, 15);
    map.step([0.3], out);
    expect(out[0]).toBeCloseTo(0.21, 15);
    const matrix = new Float64Array(1);
    map.stabilityMatrix([0.3], matrix);
    expect(matrix[0]).toBeCloseTo(1 - 0.6, 15);
  });

  it('has a symbolic Jacobian that agrees with central differences (two couplings)', () => {
    // one-loop anisotropic flow, Aharony (1973) via REFERENCES.md (from memory)
    const model = compileModel({
      couplings: ['u', 'v'],
      parameters: { n: 3, eps: 1 },
      convention: 'uv',
      beta: { u: '-eps*u + (n+8)/3*u^2 + 2*u*v', v: '-eps*v + 3*v^2 + 4*u*v' },
    });
    expect(model.jacobianMethod).toBe('symbolic');
    const point = model.at();
    const g = [0.21, 0.13];
    const jacobian = new Float64Array(4);
    point.fieldJacobian(g, jacobian);
    const plus = new Float64Array(2);
    const minus = new Float64Array(2);
    const h = 1e-6;
    for (let j = 0; j < 2; j++) {
      const gp = [...g];
      const gm = [...g];
      gp[j]! += h;
      gm[j]! -= h;
      point.field(gp, plus);
      point.field(gm, minus);
      for (let i = 0; i < 2; i++) expect(jacobian[i * 2 + j]).toBeCloseTo((plus[i]! - minus[i]!) / (2 * h), 8);
    }
  });

  it('gives the Taylor coefficients of beta and the rates at zero coupling', () => {
    const point = compileModel(ON).at({ eps: 0 });
    // infrared velocity -beta: 0, +eps (= 0), -(n+8)/3, +(3n+14)/3
    const field = point.taylor({ field: 'g' }, 'g', 3);
    expect(field[1]).toBeCloseTo(0, 15);
    expect(field[2]).toBeCloseTo(-3, 14);
    expect(field[3]).toBeCloseTo(17 / 3, 14);
    expect(point.taylor({ rate: 't' }, 'g', 2)).toEqual([2, -1, expect.closeTo(5 / 6, 14)]);
  });

  it('overrides parameters per evaluation, and parameters defined from others follow', () => {
    const model = compileModel({ couplings: ['g'], parameters: { eps: 0.5, d: '4 - eps' }, convention: 'ir', beta: { g: '(d - 4)*g' } });
    expect(model.parameters).toEqual({ eps: 0.5, d: 3.5 });
    const out = new Float64Array(1);
    model.at({ eps: 0.25 }).field([1], out);
    expect(out[0]).toBeCloseTo(-0.25, 15);
    expect(() => model.at({ delta: 1 })).toThrow(/"delta" is not a parameter/);
  });

  it('evaluates rates whole, at zero, and as their anomalous part', () => {
    const rate = compileModel(ON).at().rate('t');
    expect(rate.atZero).toBe(2);
    expect(rate.whole([0.03])).toBeCloseTo(2 - (0.03 - (5 / 6) * 0.0009), 15);
    expect(rate.anomalous([1e-200])).toBe(-1e-200);
  });

  it('lets a quantity use rate names (nu = 1/t at the fixed point)', () => {
    const model = compileModel(ON);
    const nu = model.quantity('1/t', 'claims[0].quantity');
    expect(model.at().evaluate(nu, [0.03])).toBeCloseTo(1 / (2 - 0.03 + (5 / 6) * 0.0009), 15);
  });

  it('refuses malformed flows with the field named', () => {
    const bad = (patch: Partial<FlowSpec>) => () => compileModel({ ...ON, ...patch });
    expect(bad({ beta: {} })).toThrow(/flow\.beta\.g: missing/);
    expect(bad({ beta: { g: 'g', h: 'g' } })).toThrow(/flow\.beta\.h: "h" is not a coupling/);
    expect(bad({ beta: { g: 'g*x' } })).toThrow(/unknown symbol "x".*couplings \(g\), the parameters \(n, eps\)/);
    expect(bad({ parameters: { a: 'b', b: 'a' } })).toThrow(/in a circle/);
    expect(bad({ couplings: ['sin'], beta: { sin: '1' } })).toThrow(/name of a function/);
    expect(bad({ parameters: { g: 1 } })).toThrow(/already used as a coupling/);
    expect(bad({ rates: { a: 'b', b: 'a' }, beta: { g: 'a' } })).toThrow(/rates refer to each other in a circle/);
  });
});
