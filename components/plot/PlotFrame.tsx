'use client';
// Marginalia's plot frame, drawn as SVG by recharts: linear or logarithmic axes with whole-decade
// ticks, several curves (told apart by dash pattern as well as colour), data points with error
// bars, markers (fixed points) labelled in words, a readout of the values under the pointer or
// reached with the arrow keys, and "Save as SVG". It computes nothing: it draws what it is given.
import { memo, useCallback, useEffect, useId, useLayoutEffect, useMemo, useRef, useState, type KeyboardEvent, type PointerEvent, type ReactNode } from 'react';
import {
  CartesianGrid,
  Curve,
  ErrorBar,
  Scatter,
  ScatterChart,
  XAxis,
  YAxis,
  ZIndexLayer,
  usePlotArea,
  useXAxisScale,
  useYAxisScale,
  type PlotArea,
  type ScaleFunction,
} from 'recharts';
import { LABEL_LINE, textMeasurer, wrapLabel } from './axisLabel';
import { PLOT_ACCENT, PLOT_INK } from './colours';
import { decadeLabel, decadeTicks, domainOf, linearAxis, readoutNumber, tickLabel, type Domain } from './axes';
import { isNavigationKey, nearestPoint, stepPoint, type ActivePoint, type PixelGroups } from './navigation';
import { downloadText, standaloneSvg, svgFileName } from './svgFile';
import type { MarkerShape, PlotAxis, PlotMarker, PlotPoint, PlotSeries, ReadoutEntry, SeriesLook } from './types';

export interface PlotFrameProps {
  /** Caption above the plot (also the title of the saved SVG). */
  title: string;
  x: PlotAxis;
  y: PlotAxis;
  series: PlotSeries[];
  markers?: PlotMarker[];
  /** Height of the drawing in pixels (default 340). */
  height?: number;
  /** A sentence for screen readers describing what is drawn; by default one is made from the series. */
  description?: string;
  /** Sentences shown under the plot, e.g. where a trajectory ends. */
  notes?: string[];
  /** Name of the saved file (default from the title). */
  fileName?: string;
  /** Extra controls beside "Save as SVG". */
  actions?: ReactNode;
}

const SOFT = '#4a4640';
const FAINT = '#8a857c';
const GRID = '#e4e0d6';
const PAPER = '#fbfaf6';
const PALETTE = [PLOT_INK, PLOT_ACCENT, '#7b5a2c', SOFT];
const DASHES: Record<Exclude<SeriesLook, 'points'>, string | undefined> = { line: undefined, dashed: '7 4', dotted: '1.5 3.5', dashdot: '9 3 1.5 3' };
const LINE_LOOKS: Exclude<SeriesLook, 'points'>[] = ['line', 'dashed', 'dotted', 'dashdot'];

const MARGIN = { top: 12, right: 24, left: 8 };
const AXIS_BAND = 44;
const Y_AXIS_WIDTH = 64;
const LEGEND_ROW = 18;
/** The pointer reads the nearest point within this many pixels. */
const REACH = 48;

interface DrawnSeries {
  series: PlotSeries;
  look: SeriesLook;
  colour: string;
  /** The points that can be drawn on these axes (finite, positive on a log axis). */
  points: PlotPoint[];
  hidden: number;
}

interface Scales {
  x: ScaleFunction;
  y: ScaleFunction;
  area: PlotArea;
}

function drawable(p: { x: number; y: number }, logX: boolean, logY: boolean): boolean {
  return Number.isFinite(p.x) && Number.isFinite(p.y) && (!logX || p.x > 0) && (!logY || p.y > 0);
}

function useWidth(): [(element: HTMLDivElement | null) => void, number] {
  const [width, setWidth] = useState(0);
  const observer = useRef<ResizeObserver | null>(null);
  const ref = useCallback((element: HTMLDivElement | null) => {
    observer.current?.disconnect();
    observer.current = null;
    if (!element) return;
    setWidth(Math.floor(element.getBoundingClientRect().width));
    observer.current = new ResizeObserver((entries) => {
      const next = Math.floor(entries[0]?.contentRect.width ?? 0);
      setWidth((w) => (Math.abs(w - next) >= 1 ? next : w));
    });
    observer.current.observe(element);
  }, []);
  return [ref, width];
}

/** Reports the chart's scales and plot area to the frame (for the pointer and the keyboard). */
function ScaleReporter({ onScales }: { onScales: (scales: Scales | null) => void }) {
  const x = useXAxisScale();
  const y = useYAxisScale();
  const area = usePlotArea();
  useLayoutEffect(() => {
    onScales(x && y && area ? { x, y, area } : null);
  }, [x, y, area, onScales]);
  return null;
}

function pixel(scale: ScaleFunction, v: number): number {
  const p = scale(v);
  // Far outside the range the drawing is clipped anyway; keep the path numbers sane.
  return typeof p === 'number' && Number.isFinite(p) ? Math.max(-1e5, Math.min(1e5, p)) : NaN;
}

function CurveLayer({ drawn, clipId }: { drawn: DrawnSeries[]; clipId: string }) {
  const x = useXAxisScale();
  const y = useYAxisScale();
  const area = usePlotArea();
  if (!x || !y || !area) return null;
  return (
    <ZIndexLayer zIndex={450}>
      {/* A nested viewport clips the curves to the plot area: a plain rectangle, far cheaper for
          the browser to keep up to date than a clip-path reference. */}
      <svg x={area.x} y={area.y} width={area.width} height={area.height} viewBox={`${area.x} ${area.y} ${area.width} ${area.height}`} overflow="hidden" data-clip={clipId}>
        {drawn
          .filter((d) => d.look !== 'points')
          .map((d) => (
            <Curve
              key={d.series.id}
              type="linear"
              points={d.points.map((p) => ({ x: pixel(x, p.x), y: pixel(y, p.y) }))}
              stroke={d.colour}
              strokeWidth={1.7}
              strokeDasharray={DASHES[d.look as Exclude<SeriesLook, 'points'>]}
              fill="none"
              data-series={d.series.name}
            />
          ))}
      </svg>
    </ZIndexLayer>
  );
}

function MarkerGlyph({ shape, cx, cy, colour }: { shape: MarkerShape; cx: number; cy: number; colour: string }) {
  switch (shape) {
    case 'ring':
      return <circle cx={cx} cy={cy} r={5} fill={PAPER} stroke={colour} strokeWidth={2} />;
    case 'square':
      return <rect x={cx - 4.5} y={cy - 4.5} width={9} height={9} fill={colour} stroke={PAPER} strokeWidth={1} />;
    case 'diamond':
      return <path d={`M${cx} ${cy - 6}L${cx + 6} ${cy}L${cx} ${cy + 6}L${cx - 6} ${cy}Z`} fill={PAPER} stroke={colour} strokeWidth={2} />;
    default:
      return <circle cx={cx} cy={cy} r={5} fill={colour} stroke={PAPER} strokeWidth={1} />;
  }
}

function MarkerLayer({ markers }: { markers: PlotMarker[] }) {
  const x = useXAxisScale();
  const y = useYAxisScale();
  const area = usePlotArea();
  if (!x || !y || !area) return null;
  return (
    <ZIndexLayer zIndex={700}>
      {markers.map((m) => {
        const cx = pixel(x, m.x);
        const cy = pixel(y, m.y);
        if (!Number.isFinite(cx) || !Number.isFinite(cy)) return null;
        if (cx < area.x - 1 || cx > area.x + area.width + 1 || cy < area.y - 1 || cy > area.y + area.height + 1) return null;
        // The label sits on the side with more room.
        const right = cx < area.x + area.width * 0.6;
        return (
          <g key={m.id} data-marker-label={m.label}>
            <MarkerGlyph shape={m.shape ?? 'disc'} cx={cx} cy={cy} colour={PLOT_ACCENT} />
            <text
              x={right ? cx + 9 : cx - 9}
              y={cy - 8}
              textAnchor={right ? 'start' : 'end'}
              fontSize={13}
              fill={PLOT_INK}
              stroke={PAPER}
              strokeWidth={3}
              paintOrder="stroke"
            >
              {m.label}
            </text>
          </g>
        );
      })}
    </ZIndexLayer>
  );
}

interface LegendEntry {
  name: string;
  look: SeriesLook;
  colour: string;
}

function legendRows(entries: LegendEntry[], width: number): LegendEntry[][] {
  const rows: LegendEntry[][] = [];
  let used = Infinity;
  for (const entry of entries) {
    const w = 40 + entry.name.length * 7;
    if (used + w > width) {
      rows.push([]);
      used = 0;
    }
    rows[rows.length - 1]!.push(entry);
    used += w;
  }
  return rows;
}

function LegendLayer({ rows }: { rows: LegendEntry[][] }) {
  const area = usePlotArea();
  if (!area || rows.length === 0) return null;
  return (
    <g aria-hidden="true">
      {rows.map((row, r) => {
        let at = area.x;
        const y = area.y + area.height + AXIS_BAND + 16 + r * LEGEND_ROW;
        return (
          <g key={r}>
            {row.map((entry) => {
              const x0 = at;
              at += 40 + entry.name.length * 7;
              return (
                <g key={entry.name + x0}>
                  {entry.look === 'points' ? (
                    <circle cx={x0 + 12} cy={y - 4} r={3.5} fill={entry.colour} />
                  ) : (
                    <line x1={x0} x2={x0 + 26} y1={y - 4} y2={y - 4} stroke={entry.colour} strokeWidth={1.7} strokeDasharray={DASHES[entry.look as Exclude<SeriesLook, 'points'>]} />
                  )}
                  <text x={x0 + 32} y={y} fontSize={13} fill={PLOT_INK}>
                    {entry.name}
                  </text>
                </g>
              );
            })}
          </g>
        );
      })}
    </g>
  );
}

/** The y-axis label up the left side, one rotated line per wrapped line, centred on the plot area. */
function YLabelLayer({ lines, label }: { lines: string[]; label: string }) {
  const area = usePlotArea();
  if (!area || lines.length === 0) return null;
  const cy = area.y + area.height / 2;
  return (
    <g data-axis-label="y">
      <title>{label}</title>
      {lines.map((line, i) => {
        const x = MARGIN.left + 13 + i * LABEL_LINE;
        return (
          <text key={i} x={x} y={cy} transform={`rotate(-90 ${x} ${cy})`} textAnchor="middle" fill={PLOT_INK}>
            {line}
          </text>
        );
      })}
    </g>
  );
}

function ActiveLayer({ at }: { at: { x: number; y: number } | null }) {
  const x = useXAxisScale();
  const y = useYAxisScale();
  const area = usePlotArea();
  if (!at || !x || !y || !area) return null;
  const cx = pixel(x, at.x);
  const cy = pixel(y, at.y);
  if (!Number.isFinite(cx) || !Number.isFinite(cy)) return null;
  return (
    <ZIndexLayer zIndex={800}>
      <g data-plot-transient="" pointerEvents="none">
        <line x1={cx} x2={cx} y1={area.y} y2={area.y + area.height} stroke={FAINT} strokeDasharray="3 3" />
        <line x1={area.x} x2={area.x + area.width} y1={cy} y2={cy} stroke={FAINT} strokeDasharray="3 3" />
        <circle cx={cx} cy={cy} r={6.5} fill="none" stroke={PLOT_INK} strokeWidth={1.6} />
      </g>
    </ZIndexLayer>
  );
}

/** The axis range and ticks: whole decades on a log axis, round steps on a linear one. */
function axisOf(axis: PlotAxis, values: () => number[]): { domain: Domain | null; ticks: number[] | undefined } {
  if (axis.scale === 'log') {
    const domain = axis.domain ?? domainOf(values(), true);
    return { domain, ticks: decadeTicks(domain) };
  }
  return axis.domain ? linearAxis(axis.domain, true) : linearAxis(domainOf(values(), false, false), false);
}

type AxisRange = ReturnType<typeof axisOf>;

const sameNumbers = (a: readonly number[] | null | undefined, b: readonly number[] | null | undefined) =>
  a === b || (!!a && !!b && a.length === b.length && a.every((v, i) => v === b[i]));

/** The previous range while the numbers are the same: recharts then keeps its scales and does not redraw every point. */
function useSameAxis(next: AxisRange): AxisRange {
  const previous = useRef(next);
  if (!sameNumbers(previous.current.domain, next.domain) || !sameNumbers(previous.current.ticks, next.ticks)) previous.current = next;
  return previous.current;
}

const NO_MARKERS: PlotMarker[] = [];
const NO_NOTES: string[] = [];

function readoutOf(point: { x: number; y: number; readout?: ReadoutEntry[] }, x: PlotAxis, y: PlotAxis): ReadoutEntry[] {
  return point.readout ?? [
    { name: x.label, value: point.x },
    { name: y.label, value: point.y },
  ];
}

function readoutText(entries: ReadoutEntry[]): string {
  return entries.map((e) => `${e.name} = ${readoutNumber(e.value)}`).join(', ');
}

function PlotFrameDrawing({ title, x, y, series, markers = NO_MARKERS, height = 340, description, notes = NO_NOTES, fileName, actions }: PlotFrameProps) {
  const logX = x.scale === 'log';
  const logY = y.scale === 'log';
  const [measure, width] = useWidth();
  const box = useRef<HTMLDivElement | null>(null);
  const setBox = useCallback(
    (element: HTMLDivElement | null) => {
      box.current = element;
      measure(element);
    },
    [measure],
  );
  const scales = useRef<Scales | null>(null);
  const [active, setActive] = useState<ActivePoint | null>(null);
  const [tooltipAt, setTooltipAt] = useState<{ left: number; top: number } | null>(null);
  const clipId = `plot-clip-${useId().replace(/[^a-zA-Z0-9_-]/g, '')}`;
  const hintId = `${clipId}-hint`;

  // A series given again (the same object) keeps its drawable points, so a plot that only gains
  // a curve does not hand recharts thousands of new points.
  const kept = useRef(new WeakMap<PlotSeries, { logX: boolean; logY: boolean; points: PlotPoint[] }>());
  const drawn = useMemo<DrawnSeries[]>(() => {
    let line = 0;
    return series.map((s, i) => {
      const look = s.look ?? LINE_LOOKS[line % LINE_LOOKS.length]!;
      if (look !== 'points') line++;
      const known = kept.current.get(s);
      const points = known && known.logX === logX && known.logY === logY ? known.points : s.points.filter((p) => drawable(p, logX, logY));
      kept.current.set(s, { logX, logY, points });
      return { series: s, look, colour: PALETTE[i % PALETTE.length]!, points, hidden: s.points.length - points.length };
    });
  }, [series, logX, logY]);
  const scatterData = useRef(new WeakMap<PlotPoint[], { logY: boolean; data: { x: number; y: number; bar: [number, number] | undefined }[] }>());
  const scatterOf = (points: PlotPoint[]) => {
    const known = scatterData.current.get(points);
    if (known && known.logY === logY) return known.data;
    const data = points.map((p) => ({ x: p.x, y: p.y, bar: p.sigma == null ? undefined : ([logY ? Math.min(p.sigma, p.y * 0.999) : p.sigma, p.sigma] as [number, number]) }));
    scatterData.current.set(points, { logY, data });
    return data;
  };
  const shownMarkers = useMemo(() => markers.filter((m) => drawable(m, logX, logY)), [markers, logX, logY]);
  const groups = useMemo(() => [...drawn.map((d) => d.points as { x: number; y: number; readout?: ReadoutEntry[] }[]), shownMarkers], [drawn, shownMarkers]);

  const xAxis = useSameAxis(axisOf(x, () => groups.flatMap((g) => g.map((p) => p.x))));
  const yAxis = useSameAxis(
    axisOf(y, () => [
      ...drawn.flatMap((d) => d.points.flatMap((p) => (p.sigma == null ? [p.y] : [p.y + p.sigma, logY ? p.y * 0.5 : p.y - p.sigma]))),
      ...shownMarkers.map((m) => m.y),
    ]),
  );

  const legend = useMemo(() => drawn.map((d) => ({ name: d.series.name, look: d.look, colour: d.colour })), [drawn]);
  const rows = legendRows(legend, Math.max(120, width - MARGIN.left - MARGIN.right - 64));
  const chartHeight = height + (rows.length ? 8 + rows.length * LEGEND_ROW : 0);
  // The plot area's height (the chart less its margins and the x-axis band) is the room for the y label.
  const yRoom = height - MARGIN.top - AXIS_BAND - (rows.length ? 0 : 4) - 8;
  const measured = width > 0;
  const yLines = useMemo(
    () => (measured ? wrapLabel(y.label, yRoom, textMeasurer(box.current ? getComputedStyle(box.current).font : null)) : []),
    [y.label, yRoom, measured],
  );

  // A change of what is drawn ends the reading of a point that may no longer exist.
  useEffect(() => setActive(null), [groups]);

  const onScales = useCallback((next: Scales | null) => {
    scales.current = next;
  }, []);

  const pixelGroups = useCallback((): PixelGroups | null => {
    const s = scales.current;
    if (!s) return null;
    return groups.map((g) => g.map((p) => ({ px: pixel(s.x, p.x), py: pixel(s.y, p.y) })));
  }, [groups]);

  const place = useCallback(
    (point: ActivePoint | null) => {
      setActive(point);
      const s = scales.current;
      const p = point ? groups[point.group]?.[point.index] : undefined;
      setTooltipAt(s && p ? { left: pixel(s.x, p.x), top: pixel(s.y, p.y) } : null);
    },
    [groups],
  );

  const onPointerMove = (event: PointerEvent<HTMLDivElement>) => {
    const svg = box.current?.querySelector('svg');
    const s = scales.current;
    const pixels = pixelGroups();
    if (!svg || !s || !pixels) return;
    const rect = svg.getBoundingClientRect();
    const px = event.clientX - rect.left;
    const py = event.clientY - rect.top;
    const inside = px >= s.area.x - REACH && px <= s.area.x + s.area.width + REACH && py >= s.area.y - REACH && py <= s.area.y + s.area.height + REACH;
    place(inside ? nearestPoint(pixels, px, py, REACH) : null);
  };

  const onKeyDown = (event: KeyboardEvent<HTMLDivElement>) => {
    if (event.key === 'Escape') {
      if (active) event.preventDefault();
      place(null);
      return;
    }
    if (!isNavigationKey(event.key)) return;
    event.preventDefault();
    place(stepPoint(groups.map((g) => g.length), active, event.key, event.shiftKey));
  };

  const activePoint = active ? groups[active.group]?.[active.index] ?? null : null;
  const activeMarker = active && active.group === drawn.length ? shownMarkers[active.index] : undefined;
  const activeName = active ? (active.group < drawn.length ? drawn[active.group]!.series.name : activeMarker?.label) : undefined;
  const readout = activePoint ? readoutText(readoutOf(activePoint, x, y)) : '';

  const hidden = drawn.reduce((n, d) => n + d.hidden, 0) + (markers.length - shownMarkers.length);
  const spoken =
    description ??
    `${title}: ${drawn.map((d) => `${d.series.name} (${d.points.length} points)`).join(', ') || 'nothing drawn'}` +
      (shownMarkers.length ? `; marked: ${shownMarkers.map((m) => m.label).join('; ')}` : '') +
      '.';

  const save = () => {
    const svg = box.current?.querySelector('svg');
    if (svg instanceof SVGSVGElement) downloadText(standaloneSvg(svg, title), fileName ?? svgFileName(title), 'image/svg+xml');
  };

  return (
    <figure
      className="my-3"
      data-testid="plot-frame"
      data-series={drawn.map((d) => d.series.name).join('|')}
      data-markers={shownMarkers.map((m) => m.label).join('|')}
    >
      <figcaption className="mb-1 flex flex-wrap items-baseline justify-between gap-2">
        <span className="text-ink">{title}</span>
        <span className="flex items-center gap-2">
          {actions}
          <button
            type="button"
            onClick={save}
            disabled={width === 0}
            className="rounded border border-rule px-2 py-0.5 text-sm text-ink-soft hover:border-ink-faint hover:text-ink"
          >
            Save as SVG
          </button>
        </span>
      </figcaption>
      <div
        ref={setBox}
        tabIndex={0}
        role="group"
        aria-roledescription="plot"
        aria-label={spoken}
        aria-describedby={hintId}
        onPointerMove={onPointerMove}
        onPointerLeave={() => place(null)}
        onKeyDown={onKeyDown}
        onBlur={() => place(null)}
        className="relative w-full rounded outline-offset-2"
        style={{ height: chartHeight }}
        data-plot-area=""
      >
        {width > 0 && (
          <ScatterChart width={width} height={chartHeight} margin={{ ...MARGIN, bottom: rows.length ? 8 + rows.length * LEGEND_ROW : 4 }} accessibilityLayer={false}>
            <CartesianGrid stroke={GRID} />
            <XAxis
              type="number"
              dataKey="x"
              scale={logX ? 'log' : 'linear'}
              domain={xAxis.domain ?? ['auto', 'auto']}
              allowDataOverflow
              ticks={xAxis.ticks}
              height={AXIS_BAND}
              tickFormatter={logX ? decadeLabel : tickLabel}
              stroke={SOFT}
              label={{ value: x.label, position: 'insideBottom', offset: 2, fill: PLOT_INK }}
            />
            <YAxis
              type="number"
              dataKey="y"
              scale={logY ? 'log' : 'linear'}
              domain={yAxis.domain ?? ['auto', 'auto']}
              allowDataOverflow
              ticks={yAxis.ticks}
              tickFormatter={logY ? decadeLabel : tickLabel}
              stroke={SOFT}
              width={Y_AXIS_WIDTH + Math.max(0, yLines.length - 1) * LABEL_LINE}
            />
            {drawn
              .filter((d) => d.look === 'points')
              .map((d) => (
                <Scatter
                  key={d.series.id}
                  name={d.series.name}
                  data={scatterOf(d.points)}
                  fill={d.colour}
                  shape="circle"
                  isAnimationActive={false}
                >
                  {d.points.some((p) => p.sigma != null) && <ErrorBar dataKey="bar" direction="y" stroke={d.colour} width={4} strokeWidth={1.2} />}
                </Scatter>
              ))}
            <CurveLayer drawn={drawn} clipId={clipId} />
            <MarkerLayer markers={shownMarkers} />
            <YLabelLayer lines={yLines} label={y.label} />
            <LegendLayer rows={rows} />
            <ActiveLayer at={activePoint} />
            <ScaleReporter onScales={onScales} />
          </ScatterChart>
        )}
        {activePoint && tooltipAt && Number.isFinite(tooltipAt.left) && (
          <div
            aria-hidden="true"
            className="pointer-events-none absolute z-10 max-w-xs rounded border border-rule bg-paper px-2 py-1 font-mono text-xs text-ink shadow-sm"
            style={{
              left: tooltipAt.left > width * 0.6 ? undefined : tooltipAt.left + 12,
              right: tooltipAt.left > width * 0.6 ? width - tooltipAt.left + 12 : undefined,
              top: Math.max(0, tooltipAt.top - 52),
            }}
          >
            <div className="font-serif text-sm">{activeName}</div>
            <div>{readout}</div>
          </div>
        )}
      </div>
      <p id={hintId} className="mt-1 text-sm text-ink-faint" aria-live="polite" data-testid="plot-readout">
        {activePoint ? (
          <>
            <span className="text-ink">{activeName}</span>: <span className="font-mono text-ink">{readout}</span>
            {activeMarker?.detail && <span className="text-ink-soft"> — {activeMarker.detail}</span>}
          </>
        ) : (
          'Point along a curve to read its values; or focus the plot and use the arrow keys (up and down change the curve).'
        )}
      </p>
      {shownMarkers.some((m) => m.detail) && (
        <ul className="mt-1 text-sm text-ink-soft" aria-label="Marked points">
          {shownMarkers.map((m) => (
            <li key={m.id}>
              <span className="text-ink">{m.label}</span>
              {m.detail && <> — {m.detail}</>}
            </li>
          ))}
        </ul>
      )}
      {(notes.length > 0 || hidden > 0) && (
        <ul className="mt-1 text-sm text-ink-soft">
          {notes.map((note) => (
            <li key={note}>{note}</li>
          ))}
          {hidden > 0 && <li>{hidden === 1 ? 'One point lies' : `${hidden} points lie`} at or below zero or are not finite and cannot be drawn on these axes.</li>}
        </ul>
      )}
    </figure>
  );
}

/** Drawn again only when what it is given changes (a block around it may render often). */
export const PlotFrame = memo(PlotFrameDrawing);
