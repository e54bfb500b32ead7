import { checkClaimFile, type CheckOptions } from '@/flow/runner';
import type { ClaimResult, FlowSpec } from '@/flow/types';

/** Checks one claim against a flow through the public runner. */
export function checkOne(flow: FlowSpec, claim: Record<string, unknown>, options: CheckOptions = {}): ClaimResult {
  const result = checkClaimFile({ flow, claims: [{ id: 'claim', kind: 'log-exponent', ...claim }] }, options);
  if (!result.ok) throw new Error(`file rejected: ${result.errors.map((e) => e.message).join('; ')}`);
  return result.report.claims[0]!;
}

/** The measured p of a result that claimed p (alone or with x). */
export function measuredP(result: ClaimResult): number {
  const m = result.measured;
  if (typeof m === 'number') return m;
  if (m && !Array.isArray(m) && typeof m.p === 'number') return m.p;
  throw new Error(`no measured p in ${JSON.stringify(m)}`);
}

/**
 * Two-loop O(n) RG functions at d = 4 - eps in minimal subtraction (Kleinert and
 * Schulte-Frohlinde 2001, via REFERENCES.md; from memory), with the rates of the scaling field t
 * (d ln t / dl = 2 - gamma_{m^2}), of the susceptibility chi (2 - eta) and of the correlation
 * length xi (1).
 */
export function onFlow(n: number): FlowSpec {
  return {
    couplings: ['g'],
    parameters: { n, eps: 0 },
    convention: 'uv',
    beta: { g: '-eps*g + (n+8)/3*g^2 - (3*n+14)/3*g^3' },
    rates: { t: '2 - ((n+2)/3*g - 5*(n+2)/18*g^2)', chi: '2 - (n+2)/18*g^2', xi: '1' },
  };
}
