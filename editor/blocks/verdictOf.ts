// What a claim's badge and message line say, from its live state.
import type { VerdictState } from '@/components/checks/verdict';
import type { ClaimResult } from '@/flow/types';
import type { ClaimView } from './live';

export interface ShownVerdict {
  state: VerdictState;
  /** The verdict the message is from: the current one, or the previous one while checking. */
  result: ClaimResult | null;
  /** The previous verdict is shown faded while the claim is checked again. */
  stale: boolean;
  message: string;
}

export function shownVerdict(view: ClaimView | undefined): ShownVerdict {
  if (!view) return { state: 'unchecked', result: null, stale: false, message: '' };
  if (view.state === 'invalid') return { state: 'invalid', result: view.result, stale: false, message: view.result?.message ?? '' };
  if (view.state === 'done' && view.result) return { state: view.result.status, result: view.result, stale: false, message: view.result.message };
  const previous = view.previous;
  const state: VerdictState = view.state === 'running' ? 'checking' : view.state === 'queued' ? (previous ? 'checking' : 'queued') : view.state === 'cancelled' ? 'cancelled' : 'unchecked';
  // While a claim is checked again its last message stays (faded): the block keeps its height.
  const message = view.state === 'cancelled' ? 'The check was cancelled before it reached a verdict. Check it again when you are ready.' : (previous?.message ?? '');
  return { state, result: previous, stale: previous !== null, message };
}

/** A verdict worded for a list, e.g. "holds", "invalid input". */
export function verdictWord(status: ClaimResult['status']): string {
  return status === 'invalid' ? 'invalid input' : status;
}
