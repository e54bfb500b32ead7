// How other parts of the server reach derivations' working copies: read them as ProseMirror JSON,
// encode their state (for versions), apply an update made on the server (imports) and hear about
// changes (sign-off clearing, mail). The collaboration service registers the one implementation
// on globalThis, so route handlers (bundled by Next.js as separate module copies) reach the same
// rooms as the socket. Everything crossing this boundary is plain data or bytes, never a Y.Doc:
// a route handler's copy of Yjs may not be the server's.

/** A node of the working copy as ProseMirror JSON (the body of the derivation's Y.Doc). */
export interface ProseMirrorJson {
  type: string;
  attrs?: Record<string, unknown>;
  content?: ProseMirrorJson[];
  text?: string;
  marks?: { type: string; attrs?: Record<string, unknown> }[];
}

export interface DocumentChange {
  derivationId: string;
  /** Users whose edits this change holds (empty for changes made by the server alone). */
  userIds: string[];
  /** Steps (top-level blocks, by stepId) whose text or attributes changed, or that were added. */
  stepIds: string[];
  /** Which steps each user's edits in this change touched (several users' edits can commit together). */
  edits: { userId: string; stepIds: string[] }[];
  /** The change as one Yjs update. */
  update: Uint8Array;
}

export interface CollabAccess {
  /** The working copy's body as ProseMirror JSON, as stored (every accepted edit committed). */
  readWorkingCopy(derivationId: string): Promise<ProseMirrorJson>;
  /** Y.encodeStateAsUpdate of the whole document (every root type), as stored. */
  encodeState(derivationId: string): Promise<Uint8Array>;
  /**
   * Applies a Yjs update made on the server, stores it and passes it to every open connection.
   * Resolves once committed. Throws an error with code 'DOCUMENT_TOO_LARGE' past the size limit.
   * Blocks added at the top level of `body` should carry a unique `stepId` attribute.
   */
  applyUpdate(derivationId: string, update: Uint8Array, options?: { userId?: string | null }): Promise<void>;
  /** Called after each committed change of any derivation; returns the unsubscribe function. */
  onDocumentChanged(listener: (change: DocumentChange) => void): () => void;
}

const KEY = Symbol.for('marginalia.collab');
type GlobalWithCollab = typeof globalThis & { [KEY]?: CollabAccess };

export function registerCollab(access: CollabAccess | undefined): void {
  (globalThis as GlobalWithCollab)[KEY] = access;
}

/** The running collaboration service; throws outside a server started through server/index.ts. */
export function collab(): CollabAccess {
  const access = (globalThis as GlobalWithCollab)[KEY];
  if (!access) throw new Error('The collaboration service is not running: Marginalia must be started through server/index.ts.');
  return access;
}
