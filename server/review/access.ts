// How route handlers reach the review service of the server process (registered on globalThis,
// since Next.js bundles route handlers as separate module copies).
export interface ReviewAccess {
  /** Writes who wrote which step, as far as edits have been seen (before mailing a step's authors). */
  flushStepAuthors(): Promise<void>;
  /** Sends the pending "claims that held now fail" mails of a derivation now (for the demo and tests). */
  sendFailingMailNow(derivationId: string): Promise<void>;
}

const KEY = Symbol.for('marginalia.review');
type GlobalWithReview = typeof globalThis & { [KEY]?: ReviewAccess };

export function registerReview(access: ReviewAccess | undefined): void {
  (globalThis as GlobalWithReview)[KEY] = access;
}

/** The running review service, or null outside a server started through server/index.ts. */
export function reviewService(): ReviewAccess | null {
  return (globalThis as GlobalWithReview)[KEY] ?? null;
}
