/**
 * Taylor coefficients at x = 0 of a function known only by its values (a quantity at the fixed
 * point as eps varies): polynomial interpolation at Chebyshev nodes on [-h, h], with an error
 * estimate from comparing degrees and radii plus the propagated rounding noise.
 */

export interface SeriesFit {
  coefficients: number[];
  uncertainties: number[];
  /** Half-width of the sampled interval (two-sided) or its width (one-sided). */
  radius: number;
  degree: number;
  twoSided: boolean;
  /** The sampled points of the best fit, for a plot. */
  samples: Array<[number, number]>;
  evaluations: number;
}

export interface SeriesOptions {
  radius: number;
  /** Extra interpolation degree beyond the highest wanted power. */
  extraDegree: number;
  checkpoint?: () => void;
  /** Rounding errors per value, in units of the value's ulp (default 64, for values from an iterative solve). */
  noiseFactor?: number;
  /** Stop trying smaller radii once the highest coefficient's uncertainty is below this. */
  goodEnough?: number;
}

type Sampler = (x: number) => number | null;

interface Fit {
  coefficients: number[];
  noise: number[];
  samples: Array<[number, number]>;
}

const EPSILON = 2.220446049250313e-16;
/** Values from an iterative solve carry more than one rounding error. */
const NOISE_FACTOR = 64;

/** Monomial coefficients of the Chebyshev polynomials T_0..T_{m-1} (exact integers for m <= 30). */
function chebyshevMonomials(m: number): number[][] {
  const rows: number[][] = [[1], [0, 1]];
  for (let k = 2; k < m; k++) {
    const previous = rows[k - 1]!;
    const before = rows[k - 2]!;
    const row = new Array<number>(k + 1).fill(0);
    for (let j = 0; j < previous.length; j++) row[j + 1]! += 2 * previous[j]!;
    for (let j = 0; j < before.length; j++) row[j]! -= before[j]!;
    rows.push(row);
  }
  return rows.slice(0, m);
}

/**
 * Interpolate at the Chebyshev points of [-h, h] (two-sided) or [0, 2h] (one-sided). The
 * Chebyshev coefficients come from a cosine sum (perfectly conditioned), and are converted to
 * monomials exactly term by term, so a large constant part never leaks into higher coefficients.
 */
function fitAt(sample: Sampler, degree: number, h: number, twoSided: boolean, maxPower: number, cache: Map<number, number | null>, noiseFactor: number): Fit | null {
  const count = degree + 1;
  const angles = Array.from({ length: count }, (_, j) => (Math.PI * (j + 0.5)) / count);
  const ts = angles.map(Math.cos);
  const xs = ts.map((t) => (twoSided ? h * t : h * (1 + t)));
  const ys: number[] = [];
  for (const x of xs) {
    let y = cache.get(x);
    if (y === undefined) {
      y = sample(x);
      cache.set(x, y);
    }
    if (y === null || !Number.isFinite(y)) return null;
    ys.push(y);
  }
  // Chebyshev coefficients b_m and a bound on their rounding noise.
  const noiseY = ys.reduce((sum, y) => sum + noiseFactor * EPSILON * Math.abs(y), 0);
  const b: number[] = [];
  for (let m = 0; m < count; m++) {
    let sum = 0;
    for (let j = 0; j < count; j++) sum += ys[j]! * Math.cos(m * angles[j]!);
    b.push(((m === 0 ? 1 : 2) / count) * sum);
  }
  const bNoise = (2 / count) * noiseY;
  const T = chebyshevMonomials(count);
  // Monomial coefficients in t, with noise bounds.
  let a = new Array<number>(count).fill(0);
  let aNoise = new Array<number>(count).fill(0);
  for (let m = 0; m < count; m++) {
    T[m]!.forEach((c, k) => {
      a[k]! += b[m]! * c;
      aNoise[k]! += bNoise * Math.abs(c) + 4 * EPSILON * Math.abs(b[m]! * c);
    });
  }
  if (!twoSided) {
    // p(t) with t = s - 1, s = x/h: Taylor shift (synthetic division), noise through |.|.
    const shift = (coefficients: number[], absolute: boolean): number[] => {
      const c = [...coefficients];
      for (let i = 0; i < count; i++) {
        for (let k = count - 2; k >= i; k--) c[k] = absolute ? c[k]! + c[k + 1]! : c[k]! - c[k + 1]!;
      }
      return c;
    };
    const shifted = shift(a, false);
    aNoise = shift(aNoise.map((v, k) => v + 4 * EPSILON * Math.abs(a[k]!)), true);
    a = shifted;
  }
  const coefficients: number[] = [];
  const noise: number[] = [];
  for (let k = 0; k <= maxPower; k++) {
    const factor = Math.pow(h, k);
    coefficients.push(a[k]! / factor);
    noise.push(aNoise[k]! / factor);
  }
  return { coefficients, noise, samples: xs.map((x, i) => [x, ys[i]!]) };
}

function estimate(sample: Sampler, maxPower: number, h: number, twoSided: boolean, extra: number, cache: Map<number, number | null>, noiseFactor: number): SeriesFit | null {
  let degree = maxPower + extra;
  if (twoSided && degree % 2 === 0) degree += 1; // an even node count keeps x = 0 out
  const best = fitAt(sample, degree, h, twoSided, maxPower, cache, noiseFactor);
  const lower = fitAt(sample, degree - 2, h, twoSided, maxPower, cache, noiseFactor);
  const narrower = fitAt(sample, degree, 0.6 * h, twoSided, maxPower, cache, noiseFactor);
  if (!best || !lower || !narrower) return null;
  const uncertainties = best.coefficients.map(
    (c, k) => Math.abs(c - lower.coefficients[k]!) + Math.abs(c - narrower.coefficients[k]!) + best.noise[k]! + narrower.noise[k]!,
  );
  return { coefficients: best.coefficients, uncertainties, radius: h, degree, twoSided, samples: best.samples, evaluations: 0 };
}

/**
 * Coefficients c_0..c_maxPower of f(x) = sum c_k x^k. Tries the radius, then smaller ones, and
 * returns the fit with the smallest uncertainty of the highest wanted coefficient. Falls back to
 * one-sided sampling (x > 0) when f is undefined for x < 0. Null when no fit could be made.
 */
export function expandAtZero(sample: Sampler, maxPower: number, options: SeriesOptions): SeriesFit | null {
  let evaluations = 0;
  const counted: Sampler = (x) => {
    options.checkpoint?.();
    evaluations++;
    return sample(x);
  };
  const cache = new Map<number, number | null>();
  let best: SeriesFit | null = null;
  for (const twoSided of [true, false]) {
    for (const shrink of [1, 0.4, 0.16]) {
      const extra = twoSided ? options.extraDegree : Math.max(4, options.extraDegree - 4);
      const fit = estimate(counted, maxPower, options.radius * shrink, twoSided, extra, cache, options.noiseFactor ?? NOISE_FACTOR);
      if (fit && (!best || fit.uncertainties[maxPower]! < best.uncertainties[maxPower]!)) best = fit;
      if (best && options.goodEnough !== undefined && best.uncertainties[maxPower]! <= options.goodEnough) break;
    }
    if (best) break;
  }
  if (best) best.evaluations = evaluations;
  return best;
}
