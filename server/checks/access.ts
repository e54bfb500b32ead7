// How other parts of the server reach the background checks: run one now, wait until a
// derivation's checks have settled, and hear when verdicts change (issue 6 mails the authors when
// a claim that held now fails). The service registers the one implementation on globalThis, so
// route handlers (bundled by Next.js as separate module copies) reach the same scheduler.
import type { DocumentReading } from '../../flow/document';
import type { ClaimResult, Status } from '../../flow/types';
import type { ClaimPlace } from './results';

export interface VerdictChange {
  stepId: string;
  claimId: string;
  kind: string;
  /** The stored verdict before this run; null for a claim checked for the first time. */
  before: Status | null;
  after: Status;
  /** The solver's message for the new verdict, in the document's words. */
  message: string;
}

export interface VerdictsChanged {
  derivationId: string;
  checkedAt: Date;
  /** The users whose edits led to this run (empty for a run asked for by hand or at start-up). */
  userIds: string[];
  /** Which steps each of those users' edits touched (a claim's own step, or its flow block's). */
  edits: { userId: string; stepIds: string[] }[];
  /** Claims whose verdict is new or differs from the stored one, in document order. */
  changes: VerdictChange[];
  /** Claims no longer in the document, with their last verdict. */
  removed: { stepId: string; claimId: string; before: Status }[];
}

/** One claim block of a document checked on demand (checkDocument), in document order. */
export interface CheckedClaim extends ClaimPlace {
  /** Fingerprint of what was checked (the claim and its flow). */
  inputHash: string;
  result: ClaimResult;
}

export interface DocumentCheck {
  reading: DocumentReading;
  claims: CheckedClaim[];
  /** The solver's time bound per claim (ms) of this run. */
  timeLimitMs: number;
}

export interface ChecksAccess {
  /**
   * Checks the claims of a document (ProseMirror JSON, e.g. a version's body) now, in the check
   * thread. With `reuseFrom` (a derivation id), claims unchanged since that derivation's stored
   * run keep their stored result; without it every claim is run afresh (the lock). Stores nothing.
   */
  checkDocument(body: unknown, options?: { reuseFrom?: string }): Promise<DocumentCheck>;
  /** Checks the working copy now (after a run already going) and resolves once stored. */
  recheckNow(derivationId: string): Promise<void>;
  /** Resolves when no check of this derivation is waiting or running. */
  whenSettled(derivationId: string): Promise<void>;
  /** A check of this derivation is waiting for edits to pause, queued or running. */
  isPending(derivationId: string): boolean;
  /** Called after a stored run in which some verdict changed; returns the unsubscribe function. */
  onVerdictsChanged(listener: (event: VerdictsChanged) => void): () => void;
}

const KEY = Symbol.for('marginalia.checks');
type GlobalWithChecks = typeof globalThis & { [KEY]?: ChecksAccess };

export function registerChecks(access: ChecksAccess | undefined): void {
  (globalThis as GlobalWithChecks)[KEY] = access;
}

/** The running check service, or null outside a server started through server/index.ts. */
export function checksService(): ChecksAccess | null {
  return (globalThis as GlobalWithChecks)[KEY] ?? null;
}
