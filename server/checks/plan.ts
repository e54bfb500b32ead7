// What a server-side re-check has to do for one reading of a working copy: every claim block gets
// a fingerprint of what would be checked (the claim and its flow); claims whose fingerprint is
// unchanged keep their stored result, the others are put into claim files for the check thread,
// and blocks that cannot be checked as written get their "invalid input" result right away.
import { createHash } from 'node:crypto';
import { describeInDocument, problemResult, type DocumentReading } from '../../flow/document';
import type { ClaimFile, ClaimResult, Status } from '../../flow/types';
import { stableJson } from '../../flow/stableJson';

/** Bumped when the solver's verdicts may change for the same input, so stored results are redone. */
const FINGERPRINT_REVISION = 'checks-1';

export interface PlannedClaim {
  stepId: string;
  claimId: string;
  kind: string;
  flowStepId: string | null;
  inputHash: string;
}

/**
 * One claim file for the check thread: a flow block's whole group of claims (so the solver's
 * messages point at the right claim), of which those in `only` are checked.
 */
export interface CheckJob {
  /** The group's key (a flow block's stepId, or "none"). */
  key: string;
  file: ClaimFile;
  /** Ids of the claims to check. */
  only: string[];
  /** The stepId of each claim id of the file. */
  stepOfClaim: Record<string, string>;
}

export interface StoredCheck {
  stepId: string;
  inputHash: string;
  status: Status;
  result: ClaimResult;
}

export interface CheckPlan {
  /** Every claim block of the document, in document order. */
  claims: PlannedClaim[];
  jobs: CheckJob[];
  /** Results known without running anything: unchanged claims and blocks with problems. */
  known: Map<string, ClaimResult>;
}


export function fingerprint(value: unknown): string {
  return createHash('sha256').update(FINGERPRINT_REVISION).update(stableJson(value)).digest('hex');
}

/** A check cut short (time bound, a stopped thread) is done again even for the same input. */
export function isFinalResult(result: ClaimResult): boolean {
  return result.method !== 'stopped';
}

export function planChecks(reading: DocumentReading, stored: ReadonlyMap<string, StoredCheck>): CheckPlan {
  const claims: PlannedClaim[] = [];
  const known = new Map<string, ClaimResult>();
  const groupOfStep = new Map<string, { group: DocumentReading['groups'][number]; claim: unknown }>();
  for (const group of reading.groups) {
    group.claimStepIds.forEach((stepId, i) => groupOfStep.set(stepId, { group, claim: group.file.claims[i] }));
  }

  const toRun = new Map<string, CheckJob>();
  for (const block of reading.claims) {
    const { stepId } = block;
    if (!stepId) continue; // a block without its step id yet: the editor gives it one
    const checkable = groupOfStep.get(stepId);
    const inputHash = checkable
      ? fingerprint({ claim: checkable.claim, flow: checkable.group.file.flow })
      : fingerprint({ problems: block.problems.map((p) => [p.field, p.message]), kind: block.kind, id: block.id });
    claims.push({ stepId, claimId: block.id, kind: block.kind ?? '', flowStepId: block.flowStepId, inputHash });
    if (!checkable) {
      known.set(stepId, problemResult(block));
      continue;
    }
    const before = stored.get(stepId);
    if (before && before.inputHash === inputHash && isFinalResult(before.result)) {
      known.set(stepId, before.result);
      continue;
    }
    const { group } = checkable;
    let job = toRun.get(group.key);
    if (!job) {
      const stepOfClaim: Record<string, string> = {};
      group.file.claims.forEach((claim, i) => (stepOfClaim[(claim as { id: string }).id] = group.claimStepIds[i]!));
      job = { key: group.key, file: group.file, only: [], stepOfClaim };
      toRun.set(group.key, job);
    }
    job.only.push(block.id);
  }
  return { claims, jobs: [...toRun.values()], known };
}

/** The solver's message in the document's words ("Near" rather than "claims[2].near"). */
export function inDocumentWords(result: ClaimResult, reading: DocumentReading, key: string): ClaimResult {
  const group = reading.groups.find((g) => g.key === key);
  if (!group) return result;
  return { ...result, message: describeInDocument(result.message, reading, group) };
}
