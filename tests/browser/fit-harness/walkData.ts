// Invented walk sizes for the fit's browser test: R² = 1.3 T (ln T)^(1/4) with 0.5% Gaussian
// noise from a fixed random start, T spread geometrically from 10 to 10^6. The page and the test
// build the same numbers from the same start.
import type { SeriesInput } from '../../../components/datasets/series';
import { generator } from '../../../flow/numerics/random';

export const LAW = { A: 1.3, a: 1, p: 0.25 };

export function walkSeries(rows: number): SeriesInput {
  const uniform = generator(7);
  const x = new Array<number>(rows);
  const y = new Array<number>(rows);
  const sigma = new Array<number>(rows);
  for (let i = 0; i < rows; i++) {
    const T = 10 * Math.pow(1e5, i / (rows - 1));
    const truth = LAW.A * Math.pow(T, LAW.a) * Math.pow(Math.log(T), LAW.p);
    const s = truth * 0.005;
    const normal = Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
    x[i] = T;
    y[i] = truth + s * normal;
    sigma[i] = s;
  }
  return {
    name: 'walk sizes',
    x: { quantity: 'walk length T', unit: 'steps', values: x },
    y: { quantity: 'mean-square end-to-end distance', unit: '', values: y },
    sigma: { values: sigma },
  };
}
