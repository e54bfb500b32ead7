// What the plot frame draws. It computes nothing: every number, label and word comes from the
// caller (a trajectory from flow/trajectory.ts, a check's evidence, a dataset).

export type AxisScale = 'linear' | 'log';

export interface PlotAxis {
  /** Axis title, e.g. "RG time l" or "g". */
  label: string;
  scale?: AxisScale;
  /** Fixed range; by default it follows what is drawn. */
  domain?: [number, number];
}

/** One named value of the hover readout, e.g. { name: 'RG time', value: 3.21 }. */
export interface ReadoutEntry {
  name: string;
  value: number;
}

export interface PlotPoint {
  x: number;
  y: number;
  /** One standard deviation of y: drawn as an error bar (series of look 'points'). */
  sigma?: number | null;
  /** What the hover readout shows for this point; by default the two axis values. */
  readout?: ReadoutEntry[];
}

/**
 * How a series is drawn. Lines are told apart by dash pattern as well as colour; 'points' are
 * markers with optional error bars (data).
 */
export type SeriesLook = 'line' | 'dashed' | 'dotted' | 'dashdot' | 'points';

export interface PlotSeries {
  id: string;
  name: string;
  /** Default: lines in turn solid, dashed, dotted, dash-dot. */
  look?: SeriesLook;
  points: PlotPoint[];
}

/** Marker shapes, e.g. for fixed points: disc attractive, ring repulsive, square a saddle. */
export type MarkerShape = 'disc' | 'ring' | 'square' | 'diamond';

export interface PlotMarker {
  id: string;
  x: number;
  y: number;
  /** Short text drawn beside the marker, e.g. "fixed point: saddle". */
  label: string;
  /** A longer sentence for the readout and the key, e.g. the eigenvalues. */
  detail?: string;
  shape?: MarkerShape;
  readout?: ReadoutEntry[];
}
