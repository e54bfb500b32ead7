/**
 * Trajectories for the trajectory plots: from given starting couplings, the infrared flow (and
 * the ultraviolet direction if asked) sampled densely enough for a smooth curve on a linear or a
 * logarithmic RG-time axis, stopping at a fixed point, at escape to infinity (saying where) or at
 * a bound; for a discrete map, its iterates. The fixed points inside the region the trajectory
 * covers are returned beside it, each with its eigenvalues and classification.
 */
import { ClaimInputError, ExpressionError, describeError } from './errors';
import { dependsOn } from './expr';
import { describeFixedPoint, searchFixedPoints } from './fixedPoints';
import { compileModel, type CompiledModel, type ModelPoint } from './model';
import { generator, hashString } from './numerics/random';
import { integrate, type IntegrateOutcome } from './ode';
import type { FixedPointInfo, FlowSpec, ValueInput } from './types';

export interface TrajectoryOptions {
  /** Starting couplings (numbers or expressions in the parameters). */
  start: Record<string, ValueInput>;
  /** Parameter values overriding the flow's own, e.g. { eps: 0.1 }. */
  parameters?: Record<string, number>;
  /** Which way to follow the flow from the start (default 'ir'). Maps have no ultraviolet direction. */
  direction?: 'ir' | 'uv' | 'both';
  /** The largest |RG time| followed (default 1e6; steps for a map, default 1e4). */
  maxTime?: number;
  /** Samples per direction, spaced for the axis (default 300). */
  samples?: number;
  /** Spacing of the samples: uniform in l, or in ln|l| from 1e-3 on for a logarithmic axis (default 'log'). */
  axis?: 'linear' | 'log';
  /** |g| beyond this counts as escape to infinity (default 1e6). */
  escape?: number;
  /** Time budget in milliseconds (default 500). */
  timeLimitMs?: number;
}

export interface TrajectoryPoint {
  /** RG time (negative in the ultraviolet direction; the step number for a map). */
  l: number;
  couplings: Record<string, number>;
}

export type TrajectoryEnd =
  | { kind: 'fixed-point'; l: number; position: Record<string, number> }
  | { kind: 'escaped'; l: number }
  | { kind: 'bound'; l: number }
  | { kind: 'stopped'; l: number; reason: string };

export interface TrajectoryBranch {
  points: TrajectoryPoint[];
  end: TrajectoryEnd;
  /** Plain words for the plot caption, e.g. "escapes to infinity at RG time 3.21". */
  summary: string;
  method: string;
}

export interface Trajectory {
  couplings: string[];
  convention: FlowSpec['convention'];
  infrared?: TrajectoryBranch;
  ultraviolet?: TrajectoryBranch;
  /** Fixed points inside the region the trajectory covers (enlarged by a quarter). */
  fixedPoints: FixedPointInfo[];
  notes: string[];
}

export type TrajectoryResult = { ok: true; trajectory: Trajectory } | { ok: false; error: string; field?: string };

const DEFAULT_SAMPLES = 300;
/** A velocity this small against the couplings means the flow has settled on a fixed point. */
const SETTLED = 1e-10;

function fmt(v: number): string {
  return Math.abs(v) >= 1e4 || (Math.abs(v) < 1e-3 && v !== 0) ? v.toExponential(3) : Number(v.toPrecision(6)).toString();
}

function startPoint(model: CompiledModel, point: ModelPoint, start: Record<string, ValueInput>): Float64Array {
  for (const name of Object.keys(start)) {
    if (!model.couplings.includes(name)) throw new ClaimInputError(`start.${name}`, `start.${name}: "${name}" is not a coupling (couplings: ${model.couplings.join(', ')})`);
  }
  return Float64Array.from(model.couplings, (name) => {
    const input = start[name];
    if (input === undefined) throw new ClaimInputError(`start.${name}`, `start.${name}: missing (the start needs a value for every coupling)`);
    const q = model.quantity(input, `start.${name}`);
    if (dependsOn(q.term, new Set(model.couplings))) throw new ClaimInputError(`start.${name}`, `start.${name}: must not depend on the couplings`);
    const v = point.evaluate(q, new Float64Array(model.dimension));
    if (!Number.isFinite(v)) throw new ClaimInputError(`start.${name}`, `start.${name}: not a finite number`);
    return v;
  });
}

const named = (model: CompiledModel, g: ArrayLike<number>): Record<string, number> => {
  const out: Record<string, number> = {};
  model.couplings.forEach((name, i) => (out[name] = g[i]!));
  return out;
};

/** Sample times from 0 to `to` (either sign), uniform in l, or in ln|l| from |l| = 1e-3 on. */
function sampleTimes(to: number, samples: number, axis: 'linear' | 'log'): number[] {
  const sign = Math.sign(to);
  const span = Math.abs(to);
  const first = Math.min(1e-3, span / 1e3);
  const out: number[] = [];
  for (let k = 1; k < samples; k++) {
    out.push(axis === 'linear' ? (to * k) / samples : sign * first * Math.pow(span / first, (k - 1) / (samples - 1)));
  }
  out.push(to);
  return out;
}

function flowBranch(model: CompiledModel, point: ModelPoint, g0: Float64Array, to: number, o: Required<Pick<TrajectoryOptions, 'samples' | 'axis' | 'escape'>>, deadline: number): TrajectoryBranch {
  const n = model.dimension;
  const velocity = new Float64Array(n);
  let settledAt: Float64Array | null = null;
  let settledL = 0;
  const steps: TrajectoryPoint[] = [];
  const result = integrate((_l, y, d) => point.field(y, d), 0, g0, to, {
    rtol: 1e-9,
    atol: 1e-12,
    maxSteps: 50_000,
    deadline,
    escape: o.escape,
    outputTimes: sampleTimes(to, o.samples, o.axis),
    jacobian: model.jacobianMethod === 'symbolic' ? (_l, y, jac) => point.fieldJacobian(y, jac) : undefined,
    onStep: (l, y) => {
      steps.push({ l, couplings: named(model, y) });
      point.field(y, velocity);
      let v = 0;
      let size = 0;
      for (let i = 0; i < n; i++) {
        v = Math.max(v, Math.abs(velocity[i]!));
        size = Math.max(size, Math.abs(y[i]!));
      }
      if (v <= SETTLED * Math.max(1, size) && Math.abs(l) > 1) {
        settledAt = Float64Array.from(y);
        settledL = l;
        return false;
      }
      return true;
    },
  });
  // The uniform samples, plus the solver's own steps where it had to take them closer (fast
  // transients), so a curve drawn through the points stays smooth.
  const samples: TrajectoryPoint[] = [{ l: 0, couplings: named(model, g0) }, ...result.outputs.map((s) => ({ l: s.t, couplings: named(model, s.y) }))];
  const thinned = steps.length > 2 * o.samples ? steps.filter((_, i) => i % Math.ceil(steps.length / (2 * o.samples)) === 0) : steps;
  const dir = Math.sign(to);
  const points = [...samples, ...thinned]
    .filter((p, i, all) => all.findIndex((q) => q.l === p.l) === i)
    .sort((a, b) => dir * (a.l - b.l));
  const last: TrajectoryPoint = { l: result.t, couplings: named(model, result.y) };
  if (points.length === 0 || points[points.length - 1]!.l !== last.l) points.push(last);
  const time = (l: number) => `RG time ${fmt(l)}`;
  let end: TrajectoryEnd;
  let summary: string;
  const settled = settledAt as Float64Array | null;
  if (settled) {
    const fp = refine(point, n, settled);
    end = { kind: 'fixed-point', l: settledL, position: named(model, fp) };
    summary = `settles on the fixed point (${model.couplings.map((c, i) => `${c} = ${fmt(fp[i]!)}`).join(', ')}) by ${time(settledL)}`;
  } else {
    end = endOf(result.outcome, result.t);
    summary = describeEnd(end, time);
  }
  return { points, end, summary, method: result.method };
}

function endOf(outcome: IntegrateOutcome, l: number): TrajectoryEnd {
  if (outcome === 'escaped') return { kind: 'escaped', l };
  if (outcome === 'reached') return { kind: 'bound', l };
  const reasons: Record<string, string> = {
    'non-finite': 'the flow became NaN or infinite',
    'max-steps': 'the step bound was reached',
    deadline: 'the time budget ran out',
    stalled: 'the step size fell below rounding',
  };
  return { kind: 'stopped', l, reason: reasons[outcome] ?? outcome };
}

function describeEnd(end: TrajectoryEnd, time: (l: number) => string): string {
  switch (end.kind) {
    case 'escaped':
      return `escapes to infinity at ${time(end.l)}`;
    case 'bound':
      return `followed to ${time(end.l)}`;
    case 'stopped':
      return `stopped at ${time(end.l)}: ${end.reason}`;
    default:
      return `settles by ${time(end.l)}`;
  }
}

function refine(point: ModelPoint, n: number, g: Float64Array): Float64Array {
  const found = searchFixedPoints(point, n, g, [], {
    starts: 0,
    tolerance: 1e-13,
    maxIterations: 60,
    proximity: 0.5,
    random: () => 0.5,
    checkpoint: () => undefined,
    quick: true,
  });
  return found.located ?? g;
}

function mapBranch(model: CompiledModel, point: ModelPoint, g0: Float64Array, steps: number, o: Required<Pick<TrajectoryOptions, 'samples' | 'axis' | 'escape'>>, deadline: number): TrajectoryBranch {
  const n = model.dimension;
  const g = Float64Array.from(g0);
  const next = new Float64Array(n);
  const keep = new Set<number>();
  for (const t of sampleTimes(steps, o.samples, o.axis)) keep.add(Math.round(t));
  const points: TrajectoryPoint[] = [{ l: 0, couplings: named(model, g) }];
  let end: TrajectoryEnd = { kind: 'bound', l: steps };
  for (let j = 1; j <= steps; j++) {
    point.step(g, next);
    let size = 0;
    let move = 0;
    for (let i = 0; i < n; i++) {
      size = Math.max(size, Math.abs(next[i]!));
      move = Math.max(move, Math.abs(next[i]! - g[i]!));
    }
    if (!Number.isFinite(size)) {
      end = { kind: 'stopped', l: j - 1, reason: 'the map became NaN or infinite' };
      break;
    }
    g.set(next);
    // Every iterate early on, then the sampled ones.
    if (j <= 2 * o.samples || keep.has(j)) points.push({ l: j, couplings: named(model, g) });
    if (size > o.escape) {
      end = { kind: 'escaped', l: j };
      break;
    }
    if (move <= SETTLED * Math.max(1, size) && j > 1) {
      const fp = refine(point, n, g);
      end = { kind: 'fixed-point', l: j, position: named(model, fp) };
      break;
    }
    if ((j & 1023) === 0 && performance.now() > deadline) {
      end = { kind: 'stopped', l: j, reason: 'the time budget ran out' };
      break;
    }
  }
  if (points[points.length - 1]!.l !== end.l) points.push({ l: end.l, couplings: named(model, g) });
  const time = (l: number) => `step ${Math.round(l)}`;
  const summary =
    end.kind === 'fixed-point'
      ? `settles on the fixed point (${model.couplings.map((c) => `${c} = ${fmt((end as { position: Record<string, number> }).position[c]!)}`).join(', ')}) by ${time(end.l)}`
      : end.kind === 'escaped'
        ? `escapes to infinity at ${time(end.l)}`
        : describeEnd(end, time);
  return { points, end, summary, method: 'map iteration' };
}

function fixedPointsInView(model: CompiledModel, point: ModelPoint, branches: TrajectoryBranch[], g0: Float64Array): FixedPointInfo[] {
  const n = model.dimension;
  const lo = new Float64Array(n).fill(Infinity);
  const hi = new Float64Array(n).fill(-Infinity);
  const seen: Float64Array[] = [];
  for (const b of branches) {
    for (const p of b.points) {
      model.couplings.forEach((c, i) => {
        const v = p.couplings[c]!;
        if (!Number.isFinite(v) || Math.abs(v) > 1e3) return;
        lo[i] = Math.min(lo[i]!, v);
        hi[i] = Math.max(hi[i]!, v);
      });
    }
    const last = b.points[b.points.length - 1];
    if (last) seen.push(Float64Array.from(model.couplings, (c) => last.couplings[c]!));
  }
  for (let i = 0; i < n; i++) {
    const pad = 0.25 * Math.max(hi[i]! - lo[i]!, 1e-3);
    lo[i]! -= pad;
    hi[i]! += pad;
  }
  const found = searchFixedPoints(point, n, g0, seen.filter((v) => v.every(Number.isFinite)), {
    starts: 12,
    tolerance: 1e-12,
    maxIterations: 60,
    proximity: Infinity,
    random: generator(hashString(model.couplings.join(',') + Array.from(g0).join(','))),
    checkpoint: () => undefined,
  });
  return found.all
    .filter((x) => Array.from(x).every((v, i) => v >= lo[i]! && v <= hi[i]!))
    .map((x) => {
      const { complete: _complete, ...info } = describeFixedPoint(model, point, x, 1e-9);
      return info;
    });
}

/** Follow a flow from a start. Never throws: a bad flow or start comes back as { ok: false }. */
export function traceTrajectory(spec: FlowSpec, options: TrajectoryOptions): TrajectoryResult {
  try {
    const model = compileModel(spec);
    if (model.dimension === 0) return { ok: false, error: 'the flow has no couplings to follow', field: 'flow.couplings' };
    const point = model.at(options.parameters ?? {});
    const g0 = startPoint(model, point, options.start);
    const isMap = model.convention === 'map';
    const samples = Math.max(10, Math.min(5000, Math.round(options.samples ?? DEFAULT_SAMPLES)));
    const axis = options.axis ?? 'log';
    const escape = options.escape ?? 1e6;
    const maxTime = Math.abs(options.maxTime ?? (isMap ? 1e4 : 1e6));
    if (!(maxTime > 0) || !Number.isFinite(maxTime)) return { ok: false, error: 'maxTime: must be a positive number', field: 'maxTime' };
    const deadline = performance.now() + (options.timeLimitMs ?? 500);
    const direction = options.direction ?? 'ir';
    const settings = { samples, axis, escape };
    const notes: string[] = [];
    const trajectory: Trajectory = { couplings: [...model.couplings], convention: model.convention, fixedPoints: [], notes };
    if (direction !== 'uv') {
      trajectory.infrared = isMap ? mapBranch(model, point, g0, Math.floor(maxTime), settings, deadline) : flowBranch(model, point, g0, maxTime, settings, deadline);
    }
    if (direction !== 'ir') {
      if (isMap) notes.push('a discrete map has no ultraviolet direction here (its inverse is not given)');
      else trajectory.ultraviolet = flowBranch(model, point, g0, -maxTime, settings, deadline);
    }
    const branches = [trajectory.infrared, trajectory.ultraviolet].filter((b): b is TrajectoryBranch => b !== undefined);
    trajectory.fixedPoints = fixedPointsInView(model, point, branches, g0);
    return { ok: true, trajectory };
  } catch (error) {
    if (error instanceof ClaimInputError) return { ok: false, error: error.message, field: error.field };
    if (error instanceof ExpressionError) return { ok: false, error: error.message, field: error.where };
    return { ok: false, error: `the trajectory could not be followed: ${describeError(error)}` };
  }
}
