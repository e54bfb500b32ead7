'use client';
// Data with their error bars, drawn beside curves (a fit, a flow's prediction) on linear or
// logarithmic axes, as SVG through recharts. `DataSeries` and `CurveSeries` also work inside any
// other recharts chart (e.g. a trajectory plot's frame), so a dataset can be laid over it.
import { useMemo } from 'react';
import { CartesianGrid, ErrorBar, Legend, ResponsiveContainer, Scatter, ScatterChart, Tooltip, XAxis, YAxis } from 'recharts';

export interface DataPoint {
  x: number;
  y: number;
  /** One standard deviation of y, when the data carry error bars. */
  sigma?: number | null;
}

export interface Curve {
  name: string;
  points: { x: number; y: number }[];
  /** 'fit' is dashed, 'prediction' solid: told apart by line and legend, not by colour alone. */
  kind: 'fit' | 'prediction';
}

export interface DataPlotProps {
  points: DataPoint[];
  curves?: Curve[];
  dataName?: string;
  xLabel: string;
  yLabel: string;
  logX?: boolean;
  logY?: boolean;
  height?: number;
  /** A sentence for screen readers describing what is drawn. */
  description?: string;
}

const INK = '#1d1b18';
const ACCENT = '#1f5f5b';
const SOFT = '#4a4640';

interface Plotted {
  x: number;
  y: number;
  /** [below, above]: clipped below on a log axis so that a bar never reaches zero. */
  bar?: [number, number];
  sigma?: number | null;
}

function plotted(points: DataPoint[], logY: boolean): Plotted[] {
  return points.map((p) => {
    if (p.sigma == null) return { x: p.x, y: p.y };
    const below = logY ? Math.min(p.sigma, p.y * 0.999) : p.sigma;
    return { x: p.x, y: p.y, sigma: p.sigma, bar: [below, p.sigma] };
  });
}

function domainOf(values: number[], log: boolean): [number, number] | ['auto', 'auto'] {
  const finite = values.filter((v) => Number.isFinite(v) && (!log || v > 0));
  if (finite.length === 0) return ['auto', 'auto'];
  const lo = Math.min(...finite);
  const hi = Math.max(...finite);
  if (log) return [10 ** Math.floor(Math.log10(lo)), 10 ** Math.ceil(Math.log10(hi))];
  const pad = (hi - lo) * 0.05 || Math.abs(hi) * 0.05 || 1;
  return [lo - pad, hi + pad];
}

const SUPERSCRIPT: Record<string, string> = { '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹' };

/** Ticks at whole decades on a log axis (the library's own log ticks land on odd values). */
function decadeTicks(domain: [number, number] | ['auto', 'auto']): number[] | undefined {
  if (typeof domain[0] !== 'number' || typeof domain[1] !== 'number') return undefined;
  const from = Math.round(Math.log10(domain[0]));
  const to = Math.round(Math.log10(domain[1]));
  const every = Math.max(1, Math.ceil((to - from) / 8));
  const ticks: number[] = [];
  for (let k = from; k <= to; k += every) ticks.push(10 ** k);
  return ticks;
}

const decade = (v: number) => {
  const k = Math.round(Math.log10(v));
  if (Math.abs(10 ** k - v) > 1e-9 * v) return tick(v);
  return k >= 0 && k <= 3 ? String(10 ** k) : `10${String(k).replace(/./g, (c) => SUPERSCRIPT[c] ?? c)}`;
};

const tick = (v: number) => {
  const a = Math.abs(v);
  return a !== 0 && (a >= 1e4 || a < 1e-2) ? v.toExponential(0) : String(Number(v.toPrecision(3)));
};

/** The data points with vertical error bars, for use inside a recharts chart. */
export function DataSeries({ points, name = 'data', logY = false }: { points: DataPoint[]; name?: string; logY?: boolean }) {
  const data = useMemo(() => plotted(points, logY), [points, logY]);
  return (
    <Scatter name={name} data={data} dataKey="y" fill={ACCENT} shape="circle" isAnimationActive={false}>
      {data.some((d) => d.bar) && <ErrorBar dataKey="bar" direction="y" stroke={ACCENT} width={4} strokeWidth={1.2} />}
    </Scatter>
  );
}

/** A curve drawn as a line without markers. */
export function CurveSeries({ curve }: { curve: Curve }) {
  return (
    <Scatter
      name={curve.name}
      data={curve.points}
      dataKey="y"
      line={{ stroke: curve.kind === 'fit' ? INK : SOFT, strokeWidth: 1.6, strokeDasharray: curve.kind === 'fit' ? '6 4' : undefined }}
      shape={() => <g />}
      legendType="line"
      fill={curve.kind === 'fit' ? INK : SOFT}
      isAnimationActive={false}
    />
  );
}

/** Evenly spaced sample points of a function (geometrically on a log axis) for a smooth curve. */
export function sampleCurve(fn: (x: number) => number, from: number, to: number, log: boolean, count = 120): { x: number; y: number }[] {
  const out: { x: number; y: number }[] = [];
  for (let i = 0; i < count; i++) {
    const f = i / (count - 1);
    const x = log ? from * Math.pow(to / from, f) : from + (to - from) * f;
    const y = fn(x);
    if (Number.isFinite(y)) out.push({ x, y });
  }
  return out;
}

function TooltipBody({ active, payload }: { active?: boolean; payload?: { payload?: Plotted; name?: string }[] }) {
  const point = payload?.[0]?.payload;
  if (!active || !point) return null;
  return (
    <div className="rounded border border-rule bg-paper px-2 py-1 font-mono text-sm text-ink shadow-sm">
      <div>x = {point.x.toPrecision(6)}</div>
      <div>
        y = {point.y.toPrecision(6)}
        {point.sigma != null && <> ± {point.sigma.toPrecision(3)}</>}
      </div>
    </div>
  );
}

export function DataPlot({ points, curves = [], dataName = 'data', xLabel, yLabel, logX = false, logY = false, height = 360, description }: DataPlotProps) {
  const xs = [...points.map((p) => p.x), ...curves.flatMap((c) => c.points.map((p) => p.x))];
  const ys = [
    ...points.flatMap((p) => (p.sigma == null ? [p.y] : [p.y + p.sigma, logY ? p.y * 0.5 : p.y - p.sigma])),
    ...curves.flatMap((c) => c.points.map((p) => p.y)),
  ];
  const xDomain = domainOf(xs, logX);
  const yDomain = domainOf(ys, logY);
  return (
    <figure className="my-4" data-testid="data-plot" data-points={points.length} data-curves={curves.map((c) => c.name).join('|')}>
      <figcaption className="mb-1 text-ink-soft">
        {yLabel} <span className="text-ink-faint">against</span> {xLabel}
      </figcaption>
      <div role="img" aria-label={description ?? `${points.length} data points of ${yLabel} against ${xLabel}${curves.length ? `, with ${curves.map((c) => c.name).join(' and ')}` : ''}.`}>
        <ResponsiveContainer width="100%" height={height}>
          <ScatterChart margin={{ top: 10, right: 20, bottom: 36, left: 8 }}>
            <CartesianGrid stroke="#e4e0d6" />
            <XAxis
              type="number"
              dataKey="x"
              name={xLabel}
              scale={logX ? 'log' : 'linear'}
              domain={xDomain}
              allowDataOverflow
              ticks={logX ? decadeTicks(xDomain) : undefined}
              tickFormatter={logX ? decade : tick}
              stroke={SOFT}
              label={{ value: xLabel, position: 'insideBottom', offset: -24, fill: INK }}
            />
            <YAxis
              type="number"
              dataKey="y"
              name={yLabel}
              scale={logY ? 'log' : 'linear'}
              domain={yDomain}
              allowDataOverflow
              ticks={logY ? decadeTicks(yDomain) : undefined}
              tickFormatter={logY ? decade : tick}
              stroke={SOFT}
              width={64}
            />
            <Tooltip content={<TooltipBody />} cursor={{ strokeDasharray: '3 3' }} />
            <Legend verticalAlign="top" height={28} />
            {DataSeries({ points, name: dataName, logY })}
            {curves.map((curve) => (
              <CurveSeries key={curve.name} curve={curve} />
            ))}
          </ScatterChart>
        </ResponsiveContainer>
      </div>
    </figure>
  );
}
