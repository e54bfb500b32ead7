// From a trajectory plot block's settings and the trajectories flow/trajectory.ts followed, what
// the plot frame draws: one curve per starting point and direction, the fixed points in view with
// their classification in words, the ends of the curves in plain sentences, and a view that keeps
// a flow escaping to infinity from squashing the rest. Pure data, no numerics beyond choosing axes.
import type { PlotAxis, PlotMarker, PlotSeries, MarkerShape, ReadoutEntry } from '@/components/plot';
import type { Convention, FixedPointInfo, Trajectory, TrajectoryOptions, TrajectoryResult, ValueInput } from '@/flow';

export type PlotView = 'plane' | 'time';
export type AxisScale = 'linear' | 'log';

export interface PlotSettings {
  /** The flow in coupling space (two couplings), or one coupling against RG time. */
  view: PlotView;
  /** Horizontal coupling of the plane view ('' = the first coupling). */
  x: string;
  /** Vertical coupling of the plane view, or the coupling against RG time ('' = the second, or first). */
  y: string;
  /** Scale of the RG-time axis (time view). */
  timeScale: AxisScale;
  /** Scale of the coupling axes. */
  valueScale: AxisScale;
  /** Follow the flow into the infrared only, or both ways from each start. */
  direction: 'ir' | 'both';
  /** The longest RG time followed (steps for a map); null: the default for the axis. */
  span: number | null;
}

export const defaultPlotSettings: PlotSettings = { view: 'plane', x: '', y: '', timeScale: 'log', valueScale: 'linear', direction: 'ir', span: null };

const DEFAULT_SPAN = { log: 1e6, linear: 40 } as const;
const MAP_SPAN = { log: 1e4, linear: 60 } as const;

export interface ResolvedAxes {
  view: PlotView;
  x: string;
  y: string;
  /** Why the view differs from the one asked for, if it does. */
  note?: string;
}

/** The couplings each axis shows, falling back sensibly when the flow has fewer couplings than asked. */
export function resolveAxes(settings: PlotSettings, couplings: readonly string[]): ResolvedAxes {
  const pick = (name: string, fallback: number) => (name && couplings.includes(name) ? name : (couplings[fallback] ?? couplings[0] ?? ''));
  if (settings.view === 'plane' && couplings.length < 2) {
    return { view: 'time', x: '', y: pick(settings.y, 0), note: 'The flow has one coupling, so it is drawn against RG time.' };
  }
  if (settings.view === 'plane') {
    const x = pick(settings.x, 0);
    let y = pick(settings.y, 1);
    if (y === x) y = couplings.find((c) => c !== x) ?? y;
    return { view: 'plane', x, y };
  }
  return { view: 'time', x: '', y: pick(settings.y, 0) };
}

/** What to ask flow/trajectory.ts for, one entry per starting point. */
export function traceOptions(settings: PlotSettings, starts: readonly Record<string, ValueInput>[], convention: Convention, couplings: readonly string[]): TrajectoryOptions[] {
  const axes = resolveAxes(settings, couplings);
  const axis: AxisScale = axes.view === 'time' ? settings.timeScale : 'log';
  const isMap = convention === 'map';
  const span = settings.span ?? (isMap ? MAP_SPAN : DEFAULT_SPAN)[axis];
  return starts.map((start) => ({
    start,
    direction: settings.direction === 'both' && !isMap ? 'both' : 'ir',
    maxTime: span,
    axis,
    samples: 300,
    timeLimitMs: 400,
  }));
}

function fmt(v: number): string {
  if (!Number.isFinite(v)) return String(v);
  const a = Math.abs(v);
  return a !== 0 && (a >= 1e4 || a < 1e-3) ? v.toExponential(3) : String(Number(v.toPrecision(4)));
}

function complexText(e: { re: number; im: number }): string {
  if (Math.abs(e.im) < 1e-12 * Math.max(1, Math.abs(e.re))) return fmt(e.re);
  return `${fmt(e.re)} ${e.im < 0 ? '−' : '+'} ${fmt(Math.abs(e.im))}i`;
}

export interface FixedPointWords {
  /** Short, for the plot: "attractive fixed point". */
  label: string;
  /** Where it is and why: position, eigenvalues, directions. */
  detail: string;
  shape: MarkerShape;
}

/** A fixed point's classification in words, from its eigenvalues (infrared convention; for a map, |λ| against 1). */
/** A fixed point's coordinates with rounding residue (|v| below 1e-12 of the largest) shown as 0. */
export function cleanPosition(position: Record<string, number>): Record<string, number> {
  const size = Math.max(1e-3, ...Object.values(position).map(Math.abs).filter(Number.isFinite));
  return Object.fromEntries(Object.entries(position).map(([name, v]) => [name, Math.abs(v) < 1e-12 * size ? 0 : v]));
}

export function describeFixedPointInWords(fp: FixedPointInfo, convention: Convention): FixedPointWords {
  const n = fp.classification.length;
  const relevant = fp.classification.filter((c) => c === 'relevant').length;
  const marginal = fp.classification.filter((c) => c === 'marginal').length;
  const irrelevant = n - relevant - marginal;
  const where = Object.entries(cleanPosition(fp.position))
    .map(([name, value]) => `${name} = ${fmt(value)}`)
    .join(', ');
  let kind: string;
  let shape: MarkerShape;
  if (n === 0) {
    kind = 'fixed point';
    shape = 'diamond';
  } else if (marginal > 0) {
    kind = relevant === 0 && irrelevant === 0 ? 'marginal fixed point' : `fixed point with ${marginal} marginal direction${marginal === 1 ? '' : 's'}`;
    shape = 'diamond';
  } else if (relevant === 0) {
    kind = 'attractive fixed point';
    shape = 'disc';
  } else if (relevant === n) {
    kind = 'repulsive fixed point';
    shape = 'ring';
  } else {
    kind = `saddle fixed point (${relevant} relevant)`;
    shape = 'square';
  }
  const directions = [
    relevant ? `${relevant} relevant` : '',
    irrelevant ? `${irrelevant} irrelevant` : '',
    marginal ? `${marginal} marginal` : '',
  ]
    .filter(Boolean)
    .join(', ');
  const values =
    fp.eigenvalues.length === 0
      ? 'its eigenvalues could not be computed'
      : convention === 'map'
        ? `eigenvalues of the map λ = ${fp.eigenvalues.map(complexText).join(', ')} (y = ln|λ| = ${(fp.exponents ?? []).map(fmt).join(', ')})`
        : `eigenvalues of the infrared flow ${fp.eigenvalues.map(complexText).join(', ')}`;
  return { label: kind, detail: `at ${where}; ${values}${directions ? `: ${directions} direction${n === 1 ? '' : 's'}` : ''}`, shape };
}

export interface PlotPicture {
  x: PlotAxis;
  y: PlotAxis;
  series: PlotSeries[];
  markers: PlotMarker[];
  notes: string[];
  /** What went wrong per starting point (index into the starts), in plain words. */
  problems: { start: number; message: string }[];
}

/** Values beyond this many times the size of the starts and fixed points are out of view. */
const VIEW_REACH = 3;

function viewRange(core: number[], all: number[], log: boolean): [number, number] | undefined {
  const finite = core.filter((v) => Number.isFinite(v) && (!log || v > 0));
  if (finite.length === 0) return undefined;
  const size = Math.max(...finite.map(Math.abs), 1e-6);
  const reach = VIEW_REACH * size;
  const inView = [...finite, ...all.filter((v) => Number.isFinite(v) && Math.abs(v) <= reach && (!log || v > 0))];
  let lo = Math.min(...inView);
  let hi = Math.max(...inView);
  if (log) return [10 ** Math.floor(Math.log10(lo)), 10 ** Math.ceil(Math.log10(hi))];
  if (hi === lo) {
    lo -= Math.abs(lo) * 0.5 || 1;
    hi += Math.abs(hi) * 0.5 || 1;
  }
  const pad = (hi - lo) * 0.05;
  return [lo - pad, hi + pad];
}

function readout(time: string, l: number, couplings: Record<string, number>): ReadoutEntry[] {
  return [{ name: time, value: l }, ...Object.entries(couplings).map(([name, value]) => ({ name, value }))];
}

/**
 * The picture of the trajectories from each start (`results[i]` from `starts[i]`, whose written
 * text is `startTexts[i]`), on the axes the settings ask for.
 */
export function plotPicture(settings: PlotSettings, couplings: readonly string[], convention: Convention, startTexts: readonly string[], results: readonly (TrajectoryResult | null)[]): PlotPicture {
  const axes = resolveAxes(settings, couplings);
  const isMap = convention === 'map';
  const time = isMap ? 'RG step' : 'RG time';
  const timeLabel = isMap ? 'RG step j' : 'RG time l';
  const series: PlotSeries[] = [];
  const notes: string[] = axes.note ? [axes.note] : [];
  const problems: PlotPicture['problems'] = [];
  const fixedPoints: FixedPointInfo[] = [];
  const coreX: number[] = [];
  const coreY: number[] = [];
  const allX: number[] = [];
  const allY: number[] = [];
  const logTime = axes.view === 'time' && settings.timeScale === 'log';
  let leftOutUv = false;

  results.forEach((result, i) => {
    if (!result) return;
    if (!result.ok) {
      problems.push({ start: i, message: result.error });
      return;
    }
    const trajectory: Trajectory = result.trajectory;
    for (const fp of trajectory.fixedPoints) {
      if (!fixedPoints.some((known) => couplings.every((c) => Math.abs(known.position[c]! - fp.position[c]!) <= 1e-9 * Math.max(1, Math.abs(fp.position[c]!))))) fixedPoints.push(fp);
    }
    for (const note of trajectory.notes) if (!notes.includes(note)) notes.push(note);
    const name = `start ${i + 1} (${startTexts[i] ?? ''})`;
    const branches = [
      { branch: trajectory.infrared, words: settings.direction === 'both' && !isMap ? 'infrared' : '' },
      { branch: trajectory.ultraviolet, words: 'ultraviolet' },
    ];
    for (const { branch, words } of branches) {
      if (!branch) continue;
      const first = branch.points[0];
      if (first) {
        if (axes.view === 'plane') {
          coreX.push(first.couplings[axes.x]!);
          coreY.push(first.couplings[axes.y]!);
        } else coreY.push(first.couplings[axes.y]!);
      }
      notes.push(`Start ${i + 1}${words ? `, ${words}` : ''}: ${branch.summary}.`);
      if (axes.view === 'time' && logTime && words === 'ultraviolet') {
        leftOutUv = true;
        continue;
      }
      // RG time 0 (the start) has no place on a logarithmic time axis.
      const shown = logTime ? branch.points.filter((p) => p.l > 0) : branch.points;
      const points = shown.map((p) =>
        axes.view === 'plane'
          ? { x: p.couplings[axes.x]!, y: p.couplings[axes.y]!, readout: readout(time, p.l, p.couplings) }
          : { x: p.l, y: p.couplings[axes.y]!, readout: readout(time, p.l, p.couplings) },
      );
      for (const p of points) {
        allX.push(p.x);
        allY.push(p.y);
      }
      series.push({ id: `${i}-${words || 'ir'}`, name: words ? `${name}, ${words}` : name, points });
    }
  });
  if (leftOutUv) notes.push('The ultraviolet branches are drawn on a linear RG-time axis only.');

  const markers: PlotMarker[] = [];
  const rightEdge = allX.length ? Math.max(...allX.filter(Number.isFinite)) : 1;
  fixedPoints.forEach((fp, k) => {
    const words = describeFixedPointInWords(fp, convention);
    const at = axes.view === 'plane' ? { x: fp.position[axes.x]!, y: fp.position[axes.y]! } : { x: rightEdge, y: fp.position[axes.y]! };
    coreY.push(at.y);
    if (axes.view === 'plane') coreX.push(at.x);
    markers.push({
      id: `fixed-point-${k}`,
      ...at,
      label: words.label,
      detail: words.detail,
      shape: words.shape,
      readout: Object.entries(cleanPosition(fp.position)).map(([name, value]) => ({ name, value })),
    });
  });

  const logValues = settings.valueScale === 'log';
  const x: PlotAxis =
    axes.view === 'plane'
      ? { label: axes.x, scale: settings.valueScale, domain: viewRange(coreX, allX, logValues) }
      : { label: timeLabel, scale: settings.timeScale };
  const y: PlotAxis = { label: axes.y, scale: settings.valueScale, domain: viewRange(coreY, allY, logValues) };
  return { x, y, series, markers, notes, problems };
}

/** Widens a range to take in these values (whole decades on a log axis). */
function widened(domain: [number, number] | undefined, values: number[], log: boolean): [number, number] | undefined {
  if (!domain) return undefined;
  const usable = values.filter((v) => Number.isFinite(v) && (!log || v > 0));
  if (usable.length === 0) return domain;
  let lo = Math.min(domain[0], ...usable);
  let hi = Math.max(domain[1], ...usable);
  if (log) return [10 ** Math.floor(Math.log10(lo)), 10 ** Math.ceil(Math.log10(hi))];
  const pad = (hi - lo) * 0.02;
  if (lo < domain[0]) lo -= pad;
  if (hi > domain[1]) hi += pad;
  return [lo, hi];
}

/** The picture with a dataset's series laid over it, the view widened to show the data. */
export function withOverlay(picture: PlotPicture, overlay: readonly PlotSeries[]): PlotPicture {
  const xs = overlay.flatMap((s) => s.points.map((p) => p.x));
  const ys = overlay.flatMap((s) => s.points.flatMap((p) => (p.sigma == null ? [p.y] : [p.y - p.sigma, p.y + p.sigma])));
  return {
    ...picture,
    x: { ...picture.x, domain: widened(picture.x.domain, xs, picture.x.scale === 'log') },
    y: { ...picture.y, domain: widened(picture.y.domain, ys, picture.y.scale === 'log') },
    series: [...picture.series, ...overlay],
  };
}
