import { checkClaimFile } from '../../../flow/runner';
import type { ClaimResult, FlowSpec, Report } from '../../../flow/types';

/** Check a file and return its report (fails the test if the file is rejected). */
export function run(flow: Partial<FlowSpec> | undefined, claims: unknown[], options: Parameters<typeof checkClaimFile>[1] = {}): Report {
  const result = checkClaimFile({ ...(flow ? { flow } : {}), claims }, options);
  if (!result.ok) throw new Error(`file rejected: ${result.errors.map((e) => e.message).join('; ')}`);
  return result.report;
}

/** The result of a single claim. */
export function one(flow: Partial<FlowSpec> | undefined, claim: Record<string, unknown>, options: Parameters<typeof checkClaimFile>[1] = {}): ClaimResult {
  return run(flow, [{ id: 'c', ...claim }], options).claims[0]!;
}

/**
 * Two-loop O(n) RG functions in minimal subtraction, g = lambda/(16 pi^2).
 * Source: Kleinert and Schulte-Frohlinde (2001), via REFERENCES.md (from memory).
 */
export function onFlow(n: number, eps: number): FlowSpec {
  return {
    couplings: ['g'],
    parameters: { n, eps },
    convention: 'uv',
    beta: { g: '-eps*g + (n+8)/3*g^2 - (3*n+14)/3*g^3' },
    rates: { t: '2 - ((n+2)/3*g - 5*(n+2)/18*g^2)', chi: '2 - (n+2)/18*g^2' },
  };
}
