export { PlotFrame } from './LazyPlotFrame';
export type { PlotFrameProps } from './PlotFrame';
export { PLOT_ACCENT, PLOT_INK } from './colours';
export type { AxisScale, MarkerShape, PlotAxis, PlotMarker, PlotPoint, PlotSeries, ReadoutEntry, SeriesLook } from './types';
export { decadeLabel, decadeTicks, domainOf, readoutNumber, tickLabel, type Domain } from './axes';
export { standaloneSvg, svgFileName, downloadText } from './svgFile';
export { evidencePlot } from './evidence';
