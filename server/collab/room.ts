// One derivation's live document: the Y.Doc and presence (awareness) shared by every connection
// to it. An edit is applied at once, but passed on to the other connections — and included in
// any sync answer — only after the database has committed it, so nothing a client ever received
// can be lost by a crash of the server.
import { Awareness, encodeAwarenessUpdate, removeAwarenessStates, applyAwarenessUpdate } from 'y-protocols/awareness';
import * as Y from 'yjs';
import type { Role } from '../permissions';
import type { SessionUser } from '../session';
import { closeCodes, type CloseCode } from './closeReasons';
import type { CollabLimits } from './limits';
import {
  awarenessMessage,
  decodeAwarenessUpdate,
  encodeAwarenessEntries,
  isEmptyUpdate,
  MalformedMessage,
  readMessage,
  syncStep1Message,
  syncStep2Message,
  updateMessage,
} from './protocol';
import { bodyField, changedStepIds } from './steps';
import { writeSnapshot, type StoredDocument } from './store';

/** One open connection, as a room sees it. */
export interface Peer {
  readonly user: SessionUser;
  role: Role;
  /** May change the text (the editText action); otherwise its updates are dropped. */
  canEdit: boolean;
  /** Closed by the server (or the client): nothing more it sends is taken. */
  readonly closed: boolean;
  send(message: Uint8Array): void;
  close(code: CloseCode, reason?: string): void;
}

/** Who made a change: the Yjs transaction origin of every update applied to a room. */
interface Author {
  userId: string | null;
  from: Peer | null;
}

/** An update applied to the room's document, waiting for (or past) its commit. */
export interface AppliedUpdate {
  update: Uint8Array;
  userId: string | null;
  from: Peer | null;
  stepIds: string[];
}

export interface RoomHooks {
  /** Queue the update for the database; the hub calls room.committed once it is stored. */
  store(room: Room, applied: AppliedUpdate): void;
  /** A read-only connection sent a non-empty update, which was dropped. */
  dropped(room: Room, peer: Peer, bytes: number): void;
}

export class DocumentTooLargeError extends Error {
  readonly code = 'DOCUMENT_TOO_LARGE';
  constructor(limit: number) {
    super(`The document would grow beyond ${limit} bytes.`);
    this.name = 'DocumentTooLargeError';
  }
}

const colourPattern = /^#[0-9a-f]{6}$/i;

export class Room {
  readonly doc = new Y.Doc();
  readonly body: Y.XmlFragment = this.doc.getXmlFragment(bodyField);
  readonly awareness = new Awareness(this.doc);
  readonly peers = new Set<Peer>();
  /** Committed updates not yet covered by the snapshot. */
  updatesSinceSnapshot: number;
  unloadTimer: NodeJS.Timeout | null = null;
  private compacting: Promise<void> | null = null;
  private bytes: number;
  private applied = 0;
  private committedCount = 0;
  private waiters: { mark: number; run: () => void }[] = [];
  private presenceOwners = new Map<number, Peer>();

  constructor(
    readonly derivationId: string,
    stored: StoredDocument,
    private readonly limits: CollabLimits,
    private readonly hooks: RoomHooks,
  ) {
    this.awareness.setLocalState(null);
    // One transaction for the snapshot and every later update: far faster than merging them.
    Y.transact(this.doc, () => {
      if (stored.snapshot) Y.applyUpdate(this.doc, stored.snapshot);
      for (const update of stored.updates) Y.applyUpdate(this.doc, update);
    });
    this.bytes = stored.bytes;
    this.updatesSinceSnapshot = stored.updates.length;
    this.doc.on('update', this.onUpdate);
    this.awareness.on('update', this.onPresence);
  }

  /** Updates applied but not yet committed. */
  get uncommitted(): number {
    return this.applied - this.committedCount;
  }

  get isCompacting(): boolean {
    return this.compacting !== null;
  }

  join(peer: Peer): void {
    this.peers.add(peer);
    peer.send(syncStep1Message(this.doc));
    if (this.awareness.getStates().size > 0) {
      peer.send(awarenessMessage(encodeAwarenessUpdate(this.awareness, [...this.awareness.getStates().keys()])));
    }
  }

  leave(peer: Peer): void {
    if (!this.peers.delete(peer)) return;
    const owned = [...this.presenceOwners].filter(([, owner]) => owner === peer).map(([clientId]) => clientId);
    if (owned.length > 0) removeAwarenessStates(this.awareness, owned, null);
  }

  receive(peer: Peer, data: Uint8Array): void {
    if (peer.closed) return;
    if (data.length > this.limits.maxMessageBytes) {
      peer.close(closeCodes.messageTooLarge);
      return;
    }
    try {
      const message = readMessage(data);
      switch (message.kind) {
        case 'syncStep1': {
          // The answer holds the state as of now; it leaves once all of that is committed.
          const mark = this.applied;
          const reply = syncStep2Message(Y.encodeStateAsUpdate(this.doc, message.stateVector));
          this.whenCommitted(mark, () => peer.send(reply));
          break;
        }
        case 'update':
          this.acceptUpdate(peer, message.update);
          break;
        case 'awareness':
          this.acceptPresence(peer, message.update);
          break;
        case 'queryAwareness':
          peer.send(awarenessMessage(encodeAwarenessUpdate(this.awareness, [...this.awareness.getStates().keys()])));
          break;
        case 'other':
          break;
      }
    } catch (error) {
      if (!(error instanceof MalformedMessage)) {
        console.warn(`collab: unreadable message from ${peer.user.email} on derivation ${this.derivationId}:`, error);
      }
      peer.close(closeCodes.malformed);
    }
  }

  /** Applies an update made by the server (imports); returns a mark for whenCommitted. */
  applyServerUpdate(update: Uint8Array, userId: string | null): number {
    if (!this.fits(update.length)) throw new DocumentTooLargeError(this.limits.maxDocumentBytes);
    Y.applyUpdate(this.doc, update, { userId, from: null } satisfies Author);
    return this.applied;
  }

  /** The count of updates applied so far, to wait for with whenCommitted. */
  get appliedMark(): number {
    return this.applied;
  }

  whenCommitted(mark: number, run: () => void): void {
    if (this.committedCount >= mark) run();
    else this.waiters.push({ mark, run });
  }

  committedUpTo(mark: number): Promise<void> {
    return new Promise((resolve) => this.whenCommitted(mark, resolve));
  }

  /** The database committed these updates (in order): pass them on. */
  committed(items: readonly AppliedUpdate[]): void {
    this.committedCount += items.length;
    this.updatesSinceSnapshot += items.length;
    const first = items[0];
    if (first) {
      const sameSender = items.every((item) => item.from === first.from);
      const message = updateMessage(items.length === 1 ? first.update : Y.mergeUpdates(items.map((item) => item.update)));
      const skip = sameSender ? first.from : null;
      for (const peer of this.peers) if (peer !== skip) peer.send(message);
    }
    if (this.waiters.length > 0) {
      const ready = this.waiters.filter((w) => w.mark <= this.committedCount);
      this.waiters = this.waiters.filter((w) => w.mark > this.committedCount);
      for (const waiter of ready) waiter.run();
    }
  }

  /** Writes a snapshot of the document and drops the log rows it covers. */
  compact(): Promise<void> {
    if (this.compacting) return this.compacting;
    if (this.updatesSinceSnapshot === 0) return Promise.resolve();
    let counted = 0;
    let bytesBefore = 0;
    this.compacting = writeSnapshot(this.derivationId, () => {
      // Runs inside the snapshot's transaction: what is committed now is what the snapshot covers.
      counted = this.updatesSinceSnapshot;
      bytesBefore = this.bytes;
      return Y.encodeStateAsUpdate(this.doc);
    })
      .then((size) => {
        this.updatesSinceSnapshot -= counted;
        this.bytes = size + (this.bytes - bytesBefore);
      })
      .catch((error: unknown) => {
        console.error(`collab: writing the snapshot of derivation ${this.derivationId} failed (the update log is kept):`, error);
      })
      .finally(() => {
        this.compacting = null;
      });
    return this.compacting;
  }

  destroy(): void {
    if (this.unloadTimer) clearTimeout(this.unloadTimer);
    this.awareness.destroy();
    this.doc.destroy();
  }

  private acceptUpdate(peer: Peer, update: Uint8Array): void {
    if (!peer.canEdit) {
      if (!isEmptyUpdate(update)) this.hooks.dropped(this, peer, update.length);
      return;
    }
    if (!this.fits(update.length)) {
      peer.close(closeCodes.documentTooLarge);
      return;
    }
    try {
      Y.applyUpdate(this.doc, update, { userId: peer.user.id, from: peer } satisfies Author);
    } catch (error) {
      throw new MalformedMessage(`unreadable update (${error instanceof Error ? error.message : String(error)})`);
    }
  }

  /** Would the document stay within its limit with this many more bytes? Exact only near the limit. */
  private fits(extra: number): boolean {
    if (this.bytes + extra <= this.limits.maxDocumentBytes) return true;
    this.bytes = Y.encodeStateAsUpdate(this.doc).length;
    return this.bytes + extra <= this.limits.maxDocumentBytes;
  }

  private onUpdate = (update: Uint8Array, origin: unknown, _doc: Y.Doc, transaction: Y.Transaction): void => {
    const author = (origin ?? { userId: null, from: null }) as Author;
    this.applied++;
    this.bytes += update.length;
    this.hooks.store(this, { update, userId: author.userId, from: author.from, stepIds: changedStepIds(transaction, this.body) });
  };

  /**
   * Presence from a connection: it may speak only for the clients it introduced, and the name and
   * role shown beside its caret are the signed-in user's, whatever the client claims.
   */
  private acceptPresence(peer: Peer, update: Uint8Array): void {
    const entries = decodeAwarenessUpdate(update).filter((entry) => {
      const owner = this.presenceOwners.get(entry.clientId);
      return owner === undefined || owner === peer;
    });
    for (const entry of entries) {
      if (!entry.state) continue;
      const claimed = entry.state.user;
      const colour =
        claimed && typeof claimed === 'object' && typeof (claimed as { color?: unknown }).color === 'string' &&
        colourPattern.test((claimed as { color: string }).color)
          ? (claimed as { color: string }).color
          : '#6b6b6b';
      entry.state.user = { id: peer.user.id, name: peer.user.name, role: peer.role, color: colour };
    }
    if (entries.length > 0) applyAwarenessUpdate(this.awareness, encodeAwarenessEntries(entries), peer);
  }

  private onPresence = (
    { added, updated, removed }: { added: number[]; updated: number[]; removed: number[] },
    origin: unknown,
  ): void => {
    const from = origin !== null && typeof origin === 'object' && this.peers.has(origin as Peer) ? (origin as Peer) : null;
    if (from) for (const clientId of added) this.presenceOwners.set(clientId, from);
    for (const clientId of removed) this.presenceOwners.delete(clientId);
    const changed = added.concat(updated, removed);
    if (changed.length === 0) return;
    const message = awarenessMessage(encodeAwarenessUpdate(this.awareness, changed));
    for (const peer of this.peers) if (peer !== from) peer.send(message);
  };
}
