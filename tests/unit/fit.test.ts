// The fit of data to A x^a |ln x|^p (flow/fit.ts): against NIST's certified values for a power
// law, against chi-square tables, and against data drawn from a known law with Gaussian noise from
// a fixed random start, repeated over many draws so that the reported uncertainties are tested too.
import { describe, expect, test } from 'vitest';
import { agreesWithExponent, chiSquareSurvival, evaluateFit, fitPowerLog, FitInputError, powerLog } from '../../flow/fit';
import { generator } from '../../flow/numerics/random';
import { datasetVerdicts, guessAbscissa, lawsFromResult } from '../../components/datasets/attach';
import type { ClaimResult } from '../../flow/types';

/** Standard normal deviates by Box–Muller from a fixed random start. */
function normals(start: number): () => number {
  const uniform = generator(start);
  return () => {
    const u = 1 - uniform();
    const v = uniform();
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
  };
}

const geometric = (from: number, to: number, count: number) =>
  Array.from({ length: count }, (_, i) => from * Math.pow(to / from, i / (count - 1)));

/** Points of y = A x^a |ln x|^p with Gaussian error bars of a fixed relative size. */
function drawn(law: { A: number; a: number; p: number }, xs: number[], relative: number, normal: () => number) {
  const truth = xs.map((x) => powerLog(law, x));
  const sigma = truth.map((y) => Math.abs(y) * relative);
  return { x: xs, y: truth.map((y, i) => y + sigma[i]! * normal()), sigma };
}

describe('a published worked example', () => {
  // NIST Statistical Reference Datasets, nonlinear regression, "DanWood" (lower difficulty):
  // y = b1 x^b2, data from Daniel and Wood, Fitting Equations to Data, 2nd ed. (1980), pp. 428-431.
  // Certified values: b1 = 7.6886226176E-01 (sd 1.8281973860E-02), b2 = 3.8604055871E+00
  // (sd 5.1726610913E-02), residual sum of squares 4.3173084083E-03, 4 degrees of freedom.
  const x = [1.309, 1.471, 1.49, 1.565, 1.611, 1.68];
  const y = [2.138, 3.421, 3.597, 4.34, 4.882, 5.66];

  test('the power law fitted without error bars gives NIST certified parameters and standard deviations', () => {
    const fit = fitPowerLog({ x, y }, { p: 0, scale: 'linear' });
    expect(fit.converged).toBe(true);
    expect(fit.A.value).toBeCloseTo(7.6886226176e-1, 8);
    expect(fit.a.value).toBeCloseTo(3.8604055871, 8);
    expect(fit.A.uncertainty / 1.828197386e-2).toBeCloseTo(1, 7);
    expect(fit.a.uncertainty / 5.1726610913e-2).toBeCloseTo(1, 7);
    expect(fit.chi2 / 4.3173084083e-3).toBeCloseTo(1, 8);
    expect(fit.dof).toBe(4);
    expect(fit.pValue).toBeNull(); // no error bars: no goodness-of-fit probability
    expect(fit.p).toEqual({ value: 0, uncertainty: 0, held: true });
  });

  test('with error bars equal to the certified residual deviation, the same values come out and chi² equals the degrees of freedom', () => {
    const sigma = x.map(() => 3.2853114039e-2); // NIST: residual standard deviation
    const fit = fitPowerLog({ x, y, sigma }, { p: 0 });
    expect(fit.a.value).toBeCloseTo(3.8604055871, 8);
    expect(fit.a.uncertainty / 5.1726610913e-2).toBeCloseTo(1, 6);
    expect(fit.chi2).toBeCloseTo(4, 6);
    expect(fit.reducedChi2).toBeCloseTo(1, 6);
    expect(fit.pValue).toBeCloseTo(chiSquareSurvival(4, 4), 6);
  });
});

describe('exact enumerations with a known growth law', () => {
  // Square-lattice self-avoiding walks: c_T ~ A mu^T T^(gamma - 1) with gamma = 43/32 (Nienhuis,
  // PRL 49, 1062 (1982)); counts c_T from OEIS A001411 and mu = 2.638158530 (series analyses by
  // I. Jensen), both from memory (REFERENCES.md). Short walks carry corrections to scaling, so the
  // exponent fitted from T >= T0 creeps up towards 11/32 as T0 grows.
  const counts = [1, 4, 12, 36, 100, 284, 780, 2172, 5916, 16268, 44100, 120292, 324932, 881500, 2374444, 6416596];
  const mu = 2.63815853;

  test('the fitted power of c_T / mu^T rises towards gamma - 1 = 11/32 as the shortest walks are left out', () => {
    const exponents = [4, 6, 8, 10].map((from) => {
      const T = counts.map((_, t) => t).filter((t) => t >= from);
      const fit = fitPowerLog({ x: T, y: T.map((t) => counts[t]! / mu ** t) }, { p: 0 });
      expect(fit.scale).toBe('log');
      return fit.a.value;
    });
    for (let i = 1; i < exponents.length; i++) expect(exponents[i]!).toBeGreaterThan(exponents[i - 1]!);
    expect(11 / 32 - exponents.at(-1)!).toBeGreaterThan(0);
    expect(11 / 32 - exponents.at(-1)!).toBeLessThan(0.04);
  });
});

describe('goodness of fit', () => {
  // Critical values of the chi-square distribution at the 5% and 1% levels, as tabulated in
  // M. Abramowitz and I. A. Stegun, Handbook of Mathematical Functions, Table 26.8 (from memory, 3 decimals).
  const table: [number, number, number][] = [
    [1, 3.841, 6.635],
    [2, 5.991, 9.21],
    [5, 11.07, 15.086],
    [10, 18.307, 23.209],
    [30, 43.773, 50.892],
  ];
  test.each(table)('with %i degrees of freedom the tabulated 5%% and 1%% points give p-values 0.05 and 0.01', (dof, five, one) => {
    expect(chiSquareSurvival(five, dof)).toBeCloseTo(0.05, 3);
    expect(chiSquareSurvival(one, dof)).toBeCloseTo(0.01, 3);
  });

  test('for two degrees of freedom the p-value is exp(-chi²/2) exactly (common practice)', () => {
    for (const chi2 of [0.1, 1, 4, 12, 40]) expect(chiSquareSurvival(chi2, 2) / Math.exp(-chi2 / 2)).toBeCloseTo(1, 12);
  });
});

describe('data drawn from a known law with noise', () => {
  // The O(n) susceptibility at d = 4 grows like t^-1 |ln t|^((n+2)/(n+8)); for n = 0 the log
  // exponent is 1/4 (Wegner and Riedel 1973, REFERENCES.md; from memory). Here it is the known law.
  const law = { A: 0.8, a: -1, p: 0.25 };
  const ts = geometric(1e-8, 1e-2, 24);

  test('holding a = -1, the fitted log exponent falls within its reported uncertainty in about 68% of 400 draws', () => {
    const normal = normals(20_240_601);
    const draws = 400;
    let within1 = 0;
    let within2 = 0;
    let chi2Sum = 0;
    let smallP = 0;
    for (let k = 0; k < draws; k++) {
      const data = drawn(law, ts, 0.02, normal);
      const fit = fitPowerLog(data, { a: -1 });
      expect(fit.converged).toBe(true);
      const z = Math.abs(fit.p.value - law.p) / fit.p.uncertainty;
      if (z <= 1) within1++;
      if (z <= 2) within2++;
      chi2Sum += fit.reducedChi2;
      if (fit.pValue! < 0.05) smallP++;
    }
    // Gaussian coverage of one and two standard deviations: 68.3% and 95.4% (common practice);
    // with 400 draws the binomial spread is about 2.3% and 1.0%.
    expect(within1 / draws).toBeGreaterThan(0.61);
    expect(within1 / draws).toBeLessThan(0.76);
    expect(within2 / draws).toBeGreaterThan(0.92);
    expect(within2 / draws).toBeLessThan(0.985);
    // chi²/dof averages 1 and 5% of draws fall below p = 0.05 when the law and error bars are right.
    expect(chi2Sum / draws).toBeGreaterThan(0.9);
    expect(chi2Sum / draws).toBeLessThan(1.1);
    expect(smallP / draws).toBeGreaterThan(0.02);
    expect(smallP / draws).toBeLessThan(0.09);
  });

  test('with both exponents free, the power a is recovered within its uncertainty about 68% of the time', () => {
    const normal = normals(77);
    const draws = 300;
    let within1 = 0;
    for (let k = 0; k < draws; k++) {
      const fit = fitPowerLog(drawn(law, ts, 0.01, normal));
      if (Math.abs(fit.a.value - law.a) <= fit.a.uncertainty) within1++;
    }
    expect(within1 / draws).toBeGreaterThan(0.6);
    expect(within1 / draws).toBeLessThan(0.77);
  });

  test('mean-square size of walks, D T (ln T)^(1/4): one draw gives a and p near 1 and 1/4, and the curve passes through the data', () => {
    // Walks at d = 4: mean-square end-to-end distance ~ D T (ln T)^(1/4) (REFERENCES.md, from memory).
    const walk = { A: 1.3, a: 1, p: 0.25 };
    const data = drawn(walk, geometric(1e2, 1e7, 30), 0.002, normals(4));
    const fit = fitPowerLog(data);
    expect(Math.abs(fit.a.value - 1)).toBeLessThan(3 * fit.a.uncertainty);
    expect(Math.abs(fit.p.value - 0.25)).toBeLessThan(3 * fit.p.uncertainty);
    expect(fit.p.uncertainty).toBeLessThan(0.1);
    expect(evaluateFit(fit, 1e4) / powerLog(walk, 1e4)).toBeCloseTo(1, 2);
  });
});

describe('agreement with a claimed exponent', () => {
  const law = { A: 0.8, a: -1, p: 0.25 };
  const ts = geometric(1e-10, 1e-2, 30);

  test('data drawn with |ln t|^(1/4) agree with the claimed 1/4 and disagree with no log correction at all', () => {
    const data = drawn(law, ts, 0.005, normals(11));
    const right = agreesWithExponent(data, 'p', 0.25, { other: -1 });
    expect(right.verdict).toBe('agrees');
    expect(Math.abs(right.deviation)).toBeLessThan(2);
    expect(right.reason).toMatch(/within the 2 that count as agreement/);
    const none = agreesWithExponent(data, 'p', 0, { other: -1 });
    expect(none.verdict).toBe('disagrees');
    expect(none.held.chi2).toBeGreaterThan(none.free.chi2);
    // The held fit is worse by about the squared deviation (a likelihood-ratio check, common practice).
    const ratio = (none.held.chi2 - none.free.chi2) / none.deviation ** 2;
    expect(ratio).toBeGreaterThan(0.85);
    expect(ratio).toBeLessThan(1.15);
  });

  test('when the law does not describe the data within their error bars, no verdict is given', () => {
    const xs = geometric(1e-6, 1e-1, 25);
    const y = xs.map((t) => Math.pow(t, -1) * (1 + 30 * Math.sqrt(t)));
    const sigma = y.map((v) => v * 0.001);
    const result = agreesWithExponent({ x: xs, y, sigma }, 'p', 0, { other: -1 });
    expect(result.verdict).toBe('undetermined');
    expect(result.reason).toMatch(/does not describe these data/);
  });

  test('data without error bars are judged by their scatter, and about 95% of 300 draws from the law agree at two standard deviations', () => {
    const normal = normals(5);
    const draws = 300;
    let agree = 0;
    for (let k = 0; k < draws; k++) {
      const data = drawn(law, ts, 0.005, normal);
      const result = agreesWithExponent({ x: data.x, y: data.y }, 'p', 0.25, { other: -1 });
      expect(result.free.weighted).toBe(false);
      expect(result.free.scale).toBe('log');
      expect(result.free.pValue).toBeNull();
      expect(result.reason).toMatch(/scatter/);
      if (result.verdict === 'agrees') agree++;
    }
    // Two standard deviations of a t-distribution with 28 degrees of freedom cover about 94.5% (common practice).
    expect(agree / draws).toBeGreaterThan(0.9);
    expect(agree / draws).toBeLessThan(0.98);
  });
});

describe('data the law cannot take', () => {
  test('a non-positive x, x = 1 with a log exponent, a sign change in y and a zero error bar are refused, naming the point', () => {
    const expectRefusal = (fn: () => unknown, pattern: RegExp, index: number | null) => {
      try {
        fn();
        expect.unreachable('the fit should have been refused');
      } catch (error) {
        expect(error).toBeInstanceOf(FitInputError);
        expect((error as FitInputError).message).toMatch(pattern);
        expect((error as FitInputError).index).toBe(index);
      }
    };
    expectRefusal(() => fitPowerLog({ x: [1, -2, 3], y: [1, 2, 3] }, { p: 0 }), /positive.*point 2/, 1);
    expectRefusal(() => fitPowerLog({ x: [0.5, 1, 2, 3], y: [1, 2, 3, 4] }), /x = 1 \(point 2\)/, 1);
    expectRefusal(() => fitPowerLog({ x: [2, 3, 4], y: [1, -2, 3] }, { p: 0 }), /changes sign at point 2/, 1);
    expectRefusal(() => fitPowerLog({ x: [2, 3, 4], y: [1, 2, 3], sigma: [0.1, 0, 0.1] }, { p: 0 }), /greater than zero; point 2/, 1);
    expectRefusal(() => fitPowerLog({ x: [2, 3], y: [1, 2] }, { p: 0 }), /needs at least 3 points without error bars/, null);
    expectRefusal(() => fitPowerLog({ x: [2, 2, 2, 2], y: [1, 1.1, 0.9, 1] }), /cannot/, null);
  });
});

describe('a log-exponent claim judged by an attached dataset', () => {
  // The claim reads O ~ t^-x |ln t|^p; for the n = 0 susceptibility x = 1 and p = 1/4 (REFERENCES.md,
  // Wegner and Riedel 1973; from memory). Data drawn from that law, with 0.5% error bars.
  const ts = geometric(1e-9, 1e-2, 28);
  const data = drawn({ A: 2, a: -1, p: 0.25 }, ts, 0.005, normals(99));
  const series = {
    name: 'susceptibility',
    x: { quantity: 'reduced temperature t', unit: '', values: data.x },
    y: { quantity: 'susceptibility', unit: '', values: data.y },
    sigma: { values: data.sigma },
  };

  test('the claimed x = 1 and p = 1/4 both agree, each tested with the other held at its claimed value', () => {
    const verdicts = datasetVerdicts(series, { power: 1, logPower: 0.25 });
    expect(verdicts.error).toBeNull();
    expect(verdicts.agreements.map((v) => [v.parameter, v.claimed, v.verdict])).toEqual([
      ['p', 0.25, 'agrees'],
      ['a', -1, 'agrees'],
    ]);
    expect(verdicts.claimedFit?.A.value).toBeCloseTo(2, 1);
  });

  test('a claimed p = 1/2 disagrees with the same data; a claim of x alone leaves p free', () => {
    expect(datasetVerdicts(series, { power: 1, logPower: 0.5 }).agreements[0]!.verdict).toBe('disagrees');
    const xOnly = datasetVerdicts(series, { power: 1 });
    expect(xOnly.agreements).toHaveLength(1);
    expect(xOnly.agreements[0]!.free.p.held).toBe(false);
  });

  test('data the law cannot take are reported, not thrown', () => {
    const bad = { ...series, x: { ...series.x, values: [-1, ...series.x.values.slice(1)] } };
    expect(datasetVerdicts(bad, { logPower: 0.25 }).error).toMatch(/positive/);
  });
});

describe('reading a log-exponent check result for the dataset comparison', () => {
  const result = (expected: ClaimResult['expected'], measured: ClaimResult['measured'], xMeasured: number) =>
    ({ expected, measured, evidence: { values: { 'x, measured': xMeasured } } }) as unknown as ClaimResult;

  test('a claim of both exponents, of p alone and of x alone gives the claimed and the measured law', () => {
    expect(lawsFromResult(result({ p: 0.25, x: 1 }, { p: 0.2499, x: 1 }, 1), { value: true, power: true })).toEqual({
      claimed: { logPower: 0.25, power: 1 },
      measured: { logPower: 0.2499, power: 1 },
    });
    expect(lawsFromResult(result(0.25, 0.251, 1), { value: true, power: false })?.claimed).toEqual({ logPower: 0.25, power: null });
    expect(lawsFromResult(result(1, 1.0001, 1.0001), { value: false, power: true })?.claimed).toEqual({ logPower: null, power: 1 });
    expect(lawsFromResult(null, { value: true, power: true })).toBeNull();
  });

  test('walk sizes against T ~ 1/t agree with x = 1 read as T^(+1); the same claim read against t itself disagrees', () => {
    // R² ~ T (ln T)^(1/4) for chains at d = 4 (REFERENCES.md, from memory); T plays 1/t.
    const walks = drawn({ A: 1.3, a: 1, p: 0.25 }, geometric(1e2, 1e7, 20), 0.004, normals(8));
    const series = {
      name: 'walks',
      x: { quantity: 'walk length T', unit: '', values: walks.x },
      y: { quantity: 'size', unit: '', values: walks.y },
      sigma: { values: walks.sigma },
    };
    expect(guessAbscissa(series)).toBe('inverse');
    const asInverse = datasetVerdicts(series, { power: 1, logPower: 0.25 }, 'inverse');
    expect(asInverse.agreements.map((v) => v.verdict)).toEqual(['agrees', 'agrees']);
    const asT = datasetVerdicts(series, { power: 1, logPower: 0.25 }, 't');
    expect(asT.agreements.find((v) => v.parameter === 'a')?.verdict).not.toBe('agrees');
  });
});
