// What one run (an integration of a flow, or an iteration of a map) hands to the estimates.

import type { IntegrateStats } from '../ode';
import type { DecadePoint } from './continuous';

export interface ExponentRun {
  /** The effective exponent at each decade of RG time reached (for the plot and the fits). */
  points: DecadePoint[];
  /**
   * Points used for the extrapolation when they differ from the decades (maps iterated without
   * an interpolating flow sample every quarter decade).
   */
  fitPoints?: DecadePoint[];
  /** Correction form for the fit: p + b/l + a ln(l)/l, or with the second-order terms too. */
  fitForm: 'first-order' | 'second-order';
  outcome: string;
  /** RG time where the run ended (the escape time when the flow escaped). */
  lastL: number;
  gEnd: Float64Array;
  method: string;
  switchedAtL?: number;
  switchReason?: string;
  stats: IntegrateStats;
  /** Points past the integrated range, from the asymptotic form (integral observables). */
  continuation?: DecadePoint[];
  /** The far-infrared limit of the effective exponent from the asymptotic form (NaN if none). */
  asymptoticP: number;
  /** Notes on how the far infrared was reached, for the method line. */
  notes: string[];
}

/**
 * An integral observable relaxes to its exponent as a power of l. Beyond the integrated range
 * l g(l) is constant to double precision and l A_R(g) = kappa, so dZ/ds = 1 - Z (1 + kappa):
 * Z relaxes to 1 / (1 + kappa), or grows like s when 1 + kappa <= 0 (O then stays finite or
 * grows like ln ln, and the exponent of |ln t0| is 0).
 */
export function integralContinuation(
  kappa: number,
  sEnd: number,
  zEnd: number,
  lastDecade: number,
  lg: Float64Array,
): { asymptoticP: number; continuation: DecadePoint[] } {
  const rate = 1 + kappa;
  const continuation: DecadePoint[] = [];
  for (const decade of [20, 25, 30, 40, 50, 70, 100, 150, 200, 300]) {
    if (decade <= lastDecade) continue;
    const ds = decade * Math.LN10 - sEnd;
    const z = Math.abs(rate) < 1e-14 ? zEnd + ds : 1 / rate + (zEnd - 1 / rate) * Math.exp(-rate * ds);
    continuation.push({ l: 10 ** decade, pEff: 1 / z, xEff: 0, lg, kappa });
  }
  return { asymptoticP: Math.max(0, rate), continuation };
}
