// What the check worker does with one item: run its claim with flow/ and say the solver's places
// ("claims[0].near") in the block's own words. Never throws: the runner catches what checks throw,
// and anything else becomes an inconclusive result naming what happened.
import { checkClaims } from '@/flow';
import { describeInDocument, type CheckGroup, type ClaimReading, type DocumentReading } from '@/flow/document';
import type { ClaimResult } from '@/flow/types';
import type { CheckItem } from './protocol';
import { stoppedResult } from './stopped';

/** From this many claims waiting (a derivation opened or imported whole), the worker rests between claims. */
export const REST_FROM_WAITING = 10;
/** The longest rest after one claim: a few frames, whatever the claim took. */
export const LONGEST_REST_MS = 50;

/**
 * How long the worker rests after a claim that took `tookMs`, with `waiting` claims still queued.
 * Checking a whole derivation flat out keeps one of the machine's cores busy for a second or more
 * while the page draws every verdict; on two cores the page's frames then wait for a core (a 20 ms
 * frame taking 60 ms). Resting as long as each claim took leaves the page half that core; an edit's
 * few re-checks are not slowed.
 */
export function restAfterClaim(tookMs: number, waiting: number): number {
  return waiting >= REST_FROM_WAITING ? Math.min(Math.max(0, tookMs), LONGEST_REST_MS) : 0;
}

export function runItem(item: CheckItem): ClaimResult {
  const claim = item.file.claims[0] as { id?: unknown };
  const id = typeof claim?.id === 'string' ? claim.id : item.stepId;
  let result: ClaimResult;
  try {
    const report = checkClaims(item.file, { timeLimitMs: item.timeLimitMs, tight: item.tight });
    result = report.claims[0] ?? stoppedResult(id, item.kind, 'the solver returned no result for this claim');
  } catch (error) {
    result = stoppedResult(id, item.kind, `the check stopped unexpectedly: ${error instanceof Error ? error.message : String(error)}`);
  }
  return { ...result, message: inDocumentWords(result.message, item) };
}

function inDocumentWords(message: string, item: CheckItem): string {
  const reading = {
    flows: [],
    claims: [{ stepId: item.stepId, number: item.number, kind: item.kind } as ClaimReading],
    groups: [],
  } as DocumentReading;
  const group = { key: '', flowStepId: null, file: item.file, claimStepIds: [item.stepId] } as CheckGroup;
  return describeInDocument(message, reading, group);
}
