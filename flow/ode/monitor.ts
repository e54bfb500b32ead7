// What both methods do after every accepted step: look for non-finite values, escape past the
// bound, a sign change of the event function, the caller's stop request and the deadline. An
// escape or event inside a step is located by re-integrating from the start of that step (the
// method supplies `advance`), so the reported RG time carries the solver's own accuracy.

import type { IntegrateOptions, IntegrateOutcome } from './types';

/** Integrates exactly from (tStart, yStart) to t inside one accepted step; null on failure. */
export type Advance = (tStart: number, yStart: Float64Array, t: number) => Float64Array | null;

/** The state at a time inside the step just accepted (dense output or a re-step). */
export type Interpolate = (t: number) => Float64Array | null;

export interface Sample {
  t: number;
  y: Float64Array;
}

export interface Stop {
  outcome: IntegrateOutcome;
  t: number;
  y: Float64Array;
}

/** Thrown from inside a right-hand side wrapper to leave a solver that offers no other exit. */
export class AbortIntegration extends Error {
  constructor(readonly reason: 'deadline' | 'non-finite') {
    super(reason);
  }
}

export function allFinite(y: ArrayLike<number>): boolean {
  for (let i = 0; i < y.length; i++) if (!Number.isFinite(y[i])) return false;
  return true;
}

type Scalar = (t: number, y: Float64Array) => number;

export class StepMonitor {
  private readonly event?: Scalar;
  private readonly escape?: Scalar;
  private eventSign = 0;
  private readonly deadline: number;
  private readonly onStep?: (t: number, y: Float64Array) => boolean | void;
  private readonly times: Float64Array;
  private readonly direction: number;
  private cursor = 0;
  readonly outputs: Sample[] = [];

  constructor(options: IntegrateOptions, n: number, t0: number, y0: Float64Array, t1: number) {
    this.deadline = options.deadline ?? Infinity;
    this.onStep = options.onStep;
    this.direction = t1 >= t0 ? 1 : -1;
    this.times = Float64Array.from(options.outputTimes ?? []);
    for (let i = 0; i < this.times.length; i++) {
      const ti = this.times[i];
      const inside = (ti - t0) * this.direction >= 0 && (ti - t1) * this.direction <= 0;
      const ordered = i === 0 || (ti - this.times[i - 1]) * this.direction > 0;
      if (!Number.isFinite(ti) || !inside || !ordered) {
        throw new RangeError(`integrate: outputTimes[${i}] = ${ti} is not inside [${t0}, ${t1}] in increasing order of integration`);
      }
    }
    while (this.cursor < this.times.length && this.times[this.cursor] === t0) {
      this.outputs.push({ t: t0, y: Float64Array.from(y0) });
      this.cursor++;
    }
    if (options.event) {
      this.event = options.event;
      this.eventSign = Math.sign(options.event(t0, y0));
    }
    const bound = options.escape;
    if (bound !== undefined && Number.isFinite(bound)) {
      const watched = Math.min(n, Math.max(0, options.escapeComponents ?? n));
      this.escape = (_t, y) => {
        let m = 0;
        for (let i = 0; i < watched; i++) m = Math.max(m, Math.abs(y[i]));
        return bound - m;
      };
    }
  }

  /** At the start: already past the escape bound? */
  initial(t0: number, y0: Float64Array): Stop | null {
    if (!allFinite(y0)) return { outcome: 'non-finite', t: t0, y: y0 };
    if (this.escape && this.escape(t0, y0) <= 0) return { outcome: 'escaped', t: t0, y: y0 };
    return null;
  }

  pastDeadline(): boolean {
    return this.deadline !== Infinity && performance.now() > this.deadline;
  }

  /** Records the requested output times up to `limit` inside the step (tOld, tNew]. */
  private emit(tOld: number, tNew: number, yNew: Float64Array, limit: number, yLimit: Float64Array, interpolate: Interpolate): void {
    const dir = this.direction;
    const close = 1e-14 * Math.max(Math.abs(tNew), Math.abs(tNew - tOld));
    while (this.cursor < this.times.length) {
      const tk = this.times[this.cursor];
      if ((tk - limit) * dir > close) break;
      let y: Float64Array | null;
      if (Math.abs(tk - limit) <= close) y = Float64Array.from(yLimit);
      else if (Math.abs(tk - tNew) <= close) y = Float64Array.from(yNew);
      else y = interpolate(tk);
      this.outputs.push({ t: tk, y: y ?? new Float64Array(yNew.length).fill(NaN) });
      this.cursor++;
    }
  }

  /** Checks one accepted step; returns where and why to stop, or null to go on. */
  check(
    tOld: number,
    yOld: Float64Array,
    tNew: number,
    yNew: Float64Array,
    advance: Advance,
    interpolate: Interpolate = (t) => advance(tOld, yOld, t),
  ): Stop | null {
    const stop = this.checkStep(tOld, yOld, tNew, yNew, advance);
    if (stop) {
      if (stop.outcome !== 'non-finite') this.emit(tOld, tNew, yNew, stop.t, stop.y, interpolate);
      return stop;
    }
    this.emit(tOld, tNew, yNew, tNew, yNew, interpolate);
    if (this.onStep && this.onStep(tNew, yNew) === false) return { outcome: 'stopped', t: tNew, y: yNew };
    if (this.pastDeadline()) return { outcome: 'deadline', t: tNew, y: yNew };
    return null;
  }

  private checkStep(tOld: number, yOld: Float64Array, tNew: number, yNew: Float64Array, advance: Advance): Stop | null {
    if (!allFinite(yNew)) return { outcome: 'non-finite', t: tOld, y: yOld };
    let first: Stop | null = null;
    if (this.escape && this.escape(tNew, yNew) <= 0) {
      first = locate(this.escape, 1, tOld, yOld, tNew, yNew, advance, 'escaped');
    }
    if (this.event) {
      const s = Math.sign(this.event(tNew, yNew));
      if (this.eventSign === 0) this.eventSign = s;
      else if (s !== 0 && s !== this.eventSign) {
        const hit = locate(this.event, this.eventSign, tOld, yOld, tNew, yNew, advance, 'event');
        if (!first || Math.abs(hit.t - tOld) < Math.abs(first.t - tOld)) first = hit;
      } else if (s === 0) {
        const hit: Stop = { outcome: 'event', t: tNew, y: yNew };
        if (!first) first = hit;
      }
    }
    return first;
  }
}

/**
 * Illinois (modified regula falsi) on [tOld, tNew] for the first point where `fn` leaves the
 * sign `signBefore`; returns the bracket end past the root, so the state reported is on the far
 * side of the event.
 */
function locate(
  fn: Scalar,
  signBefore: number,
  tOld: number,
  yOld: Float64Array,
  tNew: number,
  yNew: Float64Array,
  advance: Advance,
  outcome: IntegrateOutcome,
): Stop {
  let a = tOld;
  let fa = fn(tOld, yOld) * signBefore;
  let b = tNew;
  let fb = fn(tNew, yNew) * signBefore;
  let yb = yNew;
  if (!(fa > 0)) return { outcome, t: tOld, y: yOld };
  const width = Math.abs(tNew - tOld);
  const tol = Math.max(1e-13 * width, 4e-16 * Math.max(Math.abs(tOld), Math.abs(tNew)));
  let side = 0;
  for (let iter = 0; iter < 80 && Math.abs(b - a) > tol; iter++) {
    let c = fb !== fa ? (a * fb - b * fa) / (fb - fa) : 0.5 * (a + b);
    if (!(c > Math.min(a, b) && c < Math.max(a, b))) c = 0.5 * (a + b);
    // Keep the bracket shrinking even when regula falsi creeps along one side.
    if (iter % 8 === 7) c = 0.5 * (a + b);
    const yc = advance(tOld, yOld, c);
    if (!yc || !allFinite(yc)) break; // keep the last consistent bracket end
    const fc = fn(c, yc) * signBefore;
    if (fc > 0) {
      a = c;
      fa = fc;
      if (side === 1) fb /= 2;
      side = 1;
    } else {
      b = c;
      fb = fc;
      yb = yc;
      if (side === -1) fa /= 2;
      side = -1;
      if (fc === 0) break;
    }
  }
  return { outcome, t: b, y: yb };
}
