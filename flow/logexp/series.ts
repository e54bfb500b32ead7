// Truncated power series in one variable (coefficients c_0..c_K of g^0..g^K), for the far
// infrared of a discrete RG map: the interpolating vector field V with exp(V d/dg) g = F(g)
// (a formal series; the map is the time-one map of V) and the Euler–Maclaurin boundary terms
// that turn a sum over steps into an integral along that flow.

export type Series = Float64Array;

export function multiply(a: Series, b: Series): Series {
  const k = a.length;
  const out = new Float64Array(k);
  for (let i = 0; i < k; i++) {
    if (a[i] === 0) continue;
    for (let j = 0; i + j < k; j++) out[i + j]! += a[i]! * b[j]!;
  }
  return out;
}

export function derivative(a: Series): Series {
  const out = new Float64Array(a.length);
  for (let i = 1; i < a.length; i++) out[i - 1] = i * a[i]!;
  return out;
}

/** D p = V p' : the derivative along the flow of V. */
export function alongFlow(v: Series, p: Series): Series {
  return multiply(v, derivative(p));
}

/**
 * The field V = sum_{k>=2} v_k g^k whose time-one flow is g + displacement(g), for a map with
 * displacement F(g) - g = sum_{k>=2} d_k g^k. Order by order: [exp(D) g]_k = v_k + (terms with
 * v_2..v_{k-1} only), so v_k = d_k minus those terms.
 */
export function interpolatingField(displacement: Series): Series {
  const order = displacement.length;
  const v = new Float64Array(order);
  const identity = new Float64Array(order);
  if (order > 1) identity[1] = 1;
  for (let k = 2; k < order; k++) {
    // exp(D) g with v_k still zero, up to order k.
    let term: Series = identity;
    const flow = Float64Array.from(identity);
    let factorial = 1;
    for (let m = 1; m <= k; m++) {
      term = alongFlow(v, term);
      factorial *= m;
      for (let i = 0; i < order; i++) flow[i]! += term[i]! / factorial;
    }
    v[k] = displacement[k]! - (flow[k]! - identity[k]!);
  }
  return v;
}

// B_{2k} / (2k)! for k = 1..5 (Bernoulli numbers, any handbook).
const EULER_MACLAURIN = [1 / 12, -1 / 720, 1 / 30240, -1 / 1209600, 1 / 47900160];

/**
 * E(g) with sum_{i=a}^{b-1} R(g_i) = int_a^b R(g(l)) dl + E(g_b) - E(g_a) along the flow of V:
 * E = -R/2 + sum_k B_{2k}/(2k)! D^{2k-1} R.
 */
export function eulerMaclaurinBoundary(v: Series, r: Series): Series {
  const out = new Float64Array(r.length);
  for (let i = 0; i < r.length; i++) out[i] = -r[i]! / 2;
  let d = alongFlow(v, r); // D R
  for (let k = 0; k < EULER_MACLAURIN.length; k++) {
    for (let i = 0; i < r.length; i++) out[i]! += EULER_MACLAURIN[k]! * d[i]!;
    d = alongFlow(v, alongFlow(v, d)); // D^{2k+1} R
  }
  return out;
}

export function evaluate(a: Series, g: number): number {
  let s = 0;
  for (let i = a.length - 1; i >= 0; i--) s = s * g + a[i]!;
  return s;
}
