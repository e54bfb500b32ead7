// The result of a check that was stopped or could not run, made without the solver (so the page
// can say so without loading it).
import type { ClaimResult } from '@/flow/types';

export function stoppedResult(id: string, kind: string, message: string, method = 'stopped'): ClaimResult {
  return {
    id,
    kind,
    status: 'inconclusive',
    measured: null,
    uncertainty: null,
    expected: null,
    tolerance: null,
    message,
    method,
    settings: {},
    stats: {},
    ms: 0,
    sanity: [],
    evidence: {},
  };
}
