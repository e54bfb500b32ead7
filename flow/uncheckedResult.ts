// A claim's result when no check ran or finished (input the solver cannot read, a check stopped,
// cancelled or never started): nothing measured, the reason in words. Imports only types, so the
// page can say so without loading the solver.
import type { ClaimResult, Status } from './types';

export function uncheckedResult(id: string, kind: string, status: Status, message: string, method = 'none'): ClaimResult {
  return {
    id,
    kind,
    status,
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
