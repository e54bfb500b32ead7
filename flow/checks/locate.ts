/** Shared by the fixed-point, stability and epsilon-coefficient checks: locating the fixed point meant by a claim. */
import { complexFixedPoints, describeFixedPoint, formatComplex, searchFixedPoints, type SearchResult } from '../fixedPoints';
import type { CompiledModel, ModelPoint } from '../model';
import { inverse } from '../numerics/linalg';
import type { CheckContext, CheckOutcome, FixedPointInfo, SanityFlag, SettingsRecord } from '../types';
import { describePosition, fmt } from './common';

export const LOCATE_DEFAULTS = {
  starts: 12,
  newtonTolerance: 1e-13,
  maxIterations: 100,
  proximity: 0.5,
  marginal: 1e-9,
};
export type LocateSettings = typeof LOCATE_DEFAULTS;

export function tightened<T extends LocateSettings>(settings: T, tight: boolean): T {
  if (!tight) return settings;
  return { ...settings, starts: settings.starts * 2, newtonTolerance: Math.min(settings.newtonTolerance, 1e-15), maxIterations: settings.maxIterations * 2 };
}

export interface Located {
  search: SearchResult;
  infos: FixedPointInfo[];
  /** Index into infos of the located fixed point. */
  index: number;
  x: Float64Array;
  info: FixedPointInfo;
  /** An estimate of the position error (max over couplings). */
  uncertainty: number;
  sanity: SanityFlag[];
}

/** |J^-1 F| at x, the distance to the exact zero to first order; a coarse bound where J is singular. */
export function positionUncertainty(point: ModelPoint, x: Float64Array): number {
  const n = x.length;
  const jacobian = new Float64Array(n * n);
  const field = new Float64Array(n);
  point.fieldJacobian(x, jacobian);
  point.field(x, field);
  const scale = 1 + Math.max(...Array.from(x, Math.abs));
  const inv = inverse(jacobian, n);
  if (!inv) return 1e-7 * scale;
  let worst = 0;
  for (let i = 0; i < n; i++) {
    let delta = 0;
    for (let j = 0; j < n; j++) delta += inv[i * n + j]! * field[j]!;
    worst = Math.max(worst, Math.abs(delta));
  }
  const conditioned = Math.max(...Array.from(inv, Math.abs)) * 1e-15 * scale;
  return Math.max(worst, 4e-16 * scale, Math.min(conditioned, 1e-7 * scale));
}

export function searchStats(search: SearchResult): SettingsRecord {
  return { starts: search.starts, converged: search.converged, distinct: search.all.length, iterations: search.iterations, evaluations: search.evaluations };
}

export function solverFlag(search: SearchResult): SanityFlag {
  return {
    check: 'solver',
    ok: search.converged > 0,
    message: `Newton from ${search.starts} starts: ${search.converged} converged, ${search.all.length} distinct fixed point${search.all.length === 1 ? '' : 's'}, ${search.iterations} iterations`,
  };
}

export function finiteFlag(infos: readonly FixedPointInfo[]): SanityFlag {
  const finite = infos.every((info) => Object.values(info.position).every(Number.isFinite) && info.eigenvalues.every((v) => Number.isFinite(v.re) && Number.isFinite(v.im)));
  return { check: 'finite', ok: finite, message: finite ? 'positions and eigenvalues are finite' : 'a position or eigenvalue is not finite' };
}

export function summarizeFixedPoint(info: FixedPointInfo): string {
  const counts = (['relevant', 'irrelevant', 'marginal'] as const)
    .map((kind) => [kind, info.classification.filter((c) => c === kind).length] as const)
    .filter(([, count]) => count > 0)
    .map(([kind, count]) => `${count} ${kind}`);
  return counts.join(', ');
}

/**
 * Locate the fixed point near `guess` at this model point. On failure, returns the outcome that
 * explains it (complex fixed points for one coupling, the nearest real one otherwise).
 */
export function locate(
  model: CompiledModel,
  point: ModelPoint,
  guess: Float64Array,
  extra: readonly Float64Array[],
  settings: LocateSettings,
  ctx: CheckContext,
  /** Accept the fixed point nearest to this point, however far (a claimed position). */
  reference?: Float64Array,
): { ok: true; located: Located } | { ok: false; outcome: CheckOutcome } {
  const options = {
    starts: settings.starts,
    tolerance: settings.newtonTolerance,
    maxIterations: settings.maxIterations,
    proximity: reference ? Number.POSITIVE_INFINITY : settings.proximity,
    random: ctx.random,
    checkpoint: ctx.checkpoint,
    ...(reference ? { reference } : {}),
  };
  let search = searchFixedPoints(point, model.dimension, guess, extra, options);
  const complexSearch = search.located ? null : complexFixedPoints(model, point, guess[0]!, ctx.checkpoint);
  if (!search.located && complexSearch?.real) {
    // The polynomial's real roots seed one more search (Newton can miss a root between starts).
    const seeds = complexSearch.real.map((r) => Float64Array.of(r));
    search = searchFixedPoints(point, model.dimension, guess, [...extra, ...seeds], options);
  }
  const infos = search.all.map((x) => describeFixedPoint(model, point, x, settings.marginal));
  const stats = searchStats(search);
  const sanity = [solverFlag(search), finiteFlag(infos)];
  if (search.located) {
    const index = search.all.indexOf(search.located);
    return {
      ok: true,
      located: { search, infos, index, x: search.located, info: infos[index]!, uncertainty: positionUncertainty(point, search.located), sanity },
    };
  }
  const near = describePosition(model, guess);
  const elsewhere = search.all.length > 0 ? ` The fixed points found elsewhere: ${search.all.map((x) => describePosition(model, x)).join('; ')}.` : '';
  if (complexSearch && complexSearch.complex.length > 0) {
    const pairs = complexSearch.complex.filter((z) => z.im > 0).map((z) => `${model.couplings[0]} = ${formatComplex(z)} and its conjugate`);
    const realText = complexSearch.real ? ` The real fixed points are ${complexSearch.real.map((r) => fmt(r)).join(', ') || 'none'}.` : elsewhere;
    return {
      ok: false,
      outcome: {
        status: 'fails',
        message: `no real fixed point near ${near}: the fixed points there are complex, ${pairs.join('; ')} (${complexSearch.method}).${realText}`,
        method: `Newton from several starts, then ${complexSearch.method}`,
        stats,
        sanity,
        evidence: {
          fixedPoints: infos,
          complexFixedPoints: complexSearch.complex.map((z) => ({ [model.couplings[0]!]: z })),
        },
      },
    };
  }
  const definite = complexSearch?.real != null;
  return {
    ok: false,
    outcome: {
      status: definite ? 'fails' : 'inconclusive',
      message: definite
        ? `no fixed point near ${near}: the real fixed points are ${complexSearch!.real!.map((r) => fmt(r)).join(', ')} (polynomial roots)`
        : `Newton found no fixed point near ${near} from ${search.starts} starts.${elsewhere}${model.dimension > 1 ? ' (Complex fixed points are searched for one coupling only.)' : ''}`,
      method: 'Newton from several starts',
      stats,
      sanity,
      evidence: { fixedPoints: infos },
    },
  };
}

/**
 * The fixed point near a guess as the expansion parameter varies: g*(e) for small e. The guess is
 * evaluated at each e; a guess that does not vary with e is first solved at the flow's own value
 * e0 and then scaled as e/e0 (a fixed point that leaves the Gaussian one moves linearly in e).
 */
export function branchTracker(
  model: CompiledModel,
  parameter: string,
  guessAt: (point: ModelPoint) => Float64Array,
  extraAt: ((point: ModelPoint) => Float64Array) | null,
  settings: LocateSettings,
  ctx: CheckContext,
): { at: (e: number) => Float64Array | null; pointAt: (e: number) => ModelPoint; solves: () => number; scaledGuess: boolean } | { error: string } {
  const e0 = model.parameters[parameter]!;
  const probeA = guessAt(model.at({ [parameter]: 0.011 }));
  const probeB = guessAt(model.at({ [parameter]: 0.023 }));
  const varies = probeA.some((x, i) => x !== probeB[i]);
  let anchor: Float64Array | null = null;
  if (!varies) {
    if (e0 === 0) {
      return { error: `the guess does not vary with ${parameter} and the flow has ${parameter} = 0: write the guess in terms of ${parameter} (e.g. 3*${parameter}/(n+8))` };
    }
    const base = model.at();
    const found = locate(model, base, guessAt(base), [], settings, ctx);
    if (!found.ok) return { error: `no fixed point near the guess at ${parameter} = ${fmt(e0)}: ${found.outcome.message}` };
    anchor = found.located.x;
  }
  const options = { ...settings, tolerance: settings.newtonTolerance, random: ctx.random, checkpoint: ctx.checkpoint };
  const memo = new Map<number, Float64Array | null>();
  const points = new Map<number, ModelPoint>();
  const pointAt = (e: number): ModelPoint => {
    let point = points.get(e);
    if (!point) {
      point = model.at({ [parameter]: e });
      points.set(e, point);
    }
    return point;
  };
  let solves = 0;
  const at = (e: number): Float64Array | null => {
    if (memo.has(e)) return memo.get(e)!;
    const point = pointAt(e);
    const guess = anchor ? anchor.map((x) => (x * e) / e0) : guessAt(point);
    const extra = extraAt ? [extraAt(point)] : [];
    solves++;
    let search = searchFixedPoints(point, model.dimension, guess, extra, { ...options, quick: true });
    if (!search.located) search = searchFixedPoints(point, model.dimension, guess, extra, options);
    const x = search.located ? Float64Array.from(search.located) : null;
    memo.set(e, x);
    return x;
  };
  return { at, pointAt, solves: () => solves, scaledGuess: !varies };
}
