// A dataset and its fit as series of the plot frame (components/plot): the data as points with
// error bars, the fitted law as a dashed curve. Any plot (a trajectory plot, a claim's evidence)
// lays a dataset over its own curves with these.
import { evaluateFit, type PowerLogFit } from '@/flow/fit';
import type { PlotPoint, PlotSeries } from '../plot';

export interface SeriesInput {
  name: string;
  x: { quantity: string; unit: string; values: number[] };
  y: { quantity: string; unit: string; values: number[] };
  sigma: { values: number[] } | null;
}

/** Most points a plot draws; a fit always uses every point. */
export const MAX_DRAWN = 2000;

export const axisLabel = (axis: { quantity: string; unit: string }) => (axis.unit ? `${axis.quantity} [${axis.unit}]` : axis.quantity);

/** Every k-th row once there are more than MAX_DRAWN, so that a large dataset still draws quickly. */
export function drawnStride(rows: number): number {
  return Math.max(1, Math.ceil(rows / MAX_DRAWN));
}

export function datasetPoints(series: SeriesInput): PlotPoint[] {
  const n = series.x.values.length;
  const step = drawnStride(n);
  const points: PlotPoint[] = [];
  for (let i = 0; i < n; i += step) points.push({ x: series.x.values[i]!, y: series.y.values[i]!, sigma: series.sigma?.values[i] ?? null });
  return points;
}

export function datasetPlotSeries(series: SeriesInput, id = 'dataset'): PlotSeries {
  return { id, name: series.name, look: 'points', points: datasetPoints(series) };
}

/** Sample points of a function, evenly spaced (geometrically on a log axis), for a smooth curve. */
export function sampleCurve(fn: (x: number) => number, from: number, to: number, log: boolean, count = 120): PlotPoint[] {
  const out: PlotPoint[] = [];
  for (let i = 0; i < count; i++) {
    const f = i / (count - 1);
    const x = log ? from * Math.pow(to / from, f) : from + (to - from) * f;
    const y = fn(x);
    if (Number.isFinite(y)) out.push({ x, y });
  }
  return out;
}

/** Smallest and largest value, by a loop (spreading a million values into Math.min overflows the stack). */
export function rangeOf(values: readonly number[]): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return [lo, hi];
}

/** The fitted law over the data's range of x, as a dashed curve. */
export function fitPlotSeries(fit: PowerLogFit, xs: readonly number[], log: boolean, id = 'fit'): PlotSeries {
  const [from, to] = rangeOf(xs);
  return { id, name: 'fit', look: 'dashed', points: sampleCurve((x) => evaluateFit(fit, x), from, to, log && from > 0) };
}
