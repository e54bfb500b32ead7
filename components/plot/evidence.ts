// A check's evidence plot (flow/ PlotData: convergence of an effective exponent, a fit against
// eps, a residual's scaling) in the plot frame's terms, for every place that shows evidence.
import type { PlotData } from '@/flow/types';
import type { PlotAxis, PlotSeries } from './types';

export function evidencePlot(plot: PlotData, key: string): { title: string; x: PlotAxis; y: PlotAxis; series: PlotSeries[] } {
  const series: PlotSeries[] = plot.series.map((s, i) => ({
    id: `${key}-${i}`,
    name: s.name,
    look: s.style === 'points' ? 'points' : undefined,
    points: s.points.map(([x, y]) => ({ x, y })),
  }));
  return { title: plot.title, x: { label: plot.xLabel, scale: plot.xScale ?? 'linear' }, y: { label: plot.yLabel, scale: plot.yScale ?? 'linear' }, series };
}
