// The result of a check that was stopped or could not run, made without the solver (so the page
// can say so without loading it).
import type { ClaimResult } from '@/flow/types';
import { uncheckedResult } from '@/flow/uncheckedResult';

export function stoppedResult(id: string, kind: string, message: string, method = 'stopped'): ClaimResult {
  return uncheckedResult(id, kind, 'inconclusive', message, method);
}
