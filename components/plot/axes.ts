// Axis ranges and tick labels shared by Marginalia's plots: whole decades on a logarithmic axis
// (the charting library's own log ticks land on odd values), round steps on a linear one.
import { getNiceTickValues } from 'recharts';

export type Domain = [number, number];

/** The range covering these values; on a log axis whole decades, ignoring values <= 0. */
export function domainOf(values: readonly number[], log: boolean, pad = true): Domain | null {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (!Number.isFinite(v) || (log && v <= 0)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (lo > hi) return null;
  if (log) {
    const from = Math.floor(Math.log10(lo));
    const to = Math.max(from + 1, Math.ceil(Math.log10(hi)));
    return [10 ** from, 10 ** to];
  }
  const room = pad ? (hi - lo) * 0.05 || Math.abs(hi) * 0.05 || 1 : 0;
  return [lo - room, hi + room];
}

/**
 * Round tick values for a linear axis and the range they span: with `fixed`, ticks inside the
 * given range; otherwise the range is widened to the round ticks around the values.
 */
export function linearAxis(extent: Domain | null, fixed: boolean): { domain: Domain | null; ticks: number[] | undefined } {
  if (!extent) return { domain: null, ticks: undefined };
  let [lo, hi] = extent;
  if (lo === hi) {
    const room = Math.abs(lo) * 0.1 || 1;
    lo -= room;
    hi += room;
  }
  const ticks = getNiceTickValues([lo, hi], 6, true);
  if (fixed) return { domain: extent, ticks: ticks.filter((t) => t >= lo && t <= hi) };
  if (ticks.length < 2) return { domain: [lo, hi], ticks: undefined };
  return { domain: [Math.min(lo, ticks[0]!), Math.max(hi, ticks[ticks.length - 1]!)], ticks };
}

/** Ticks at whole decades (at most about eight of them). */
export function decadeTicks(domain: Domain | null): number[] | undefined {
  if (!domain) return undefined;
  const from = Math.round(Math.log10(domain[0]));
  const to = Math.round(Math.log10(domain[1]));
  const every = Math.max(1, Math.ceil((to - from) / 8));
  const ticks: number[] = [];
  for (let k = from; k <= to; k += every) ticks.push(10 ** k);
  return ticks;
}

const SUPERSCRIPT: Record<string, string> = { '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹' };

/** A linear-axis tick: three significant digits, exponent form for very large or small values. */
export function tickLabel(v: number): string {
  const a = Math.abs(v);
  return a !== 0 && (a >= 1e4 || a < 1e-2) ? v.toExponential(0) : String(Number(v.toPrecision(3)));
}

/** A log-axis tick: 1, 10, 100, 1000, then 10⁴, 10⁻² and so on. */
export function decadeLabel(v: number): string {
  const k = Math.round(Math.log10(v));
  if (Math.abs(10 ** k - v) > 1e-9 * v) return tickLabel(v);
  return k >= 0 && k <= 3 ? String(10 ** k) : `10${String(k).replace(/./g, (c) => SUPERSCRIPT[c] ?? c)}`;
}

/** A value in a readout: six significant digits, exponent form far from 1. */
export function readoutNumber(v: number): string {
  if (!Number.isFinite(v)) return String(v);
  const a = Math.abs(v);
  if (a !== 0 && (a >= 1e6 || a < 1e-4)) return v.toExponential(4);
  return String(Number(v.toPrecision(6)));
}
