'use client';
// The copies of derivations kept on this device (y-indexeddb, one database per user and
// derivation, so edits typed offline survive a closed tab) and what sign-out does with them:
// find out whether each copy holds edits the server does not have yet, send them, and clear the
// copies once nothing would be lost (or the user chose to discard it).
//
// "The server has it" is read from the server itself: a fresh read-only sync over the standard
// socket gives the server's document, and a copy is confirmed when applying it to that document
// changes nothing (neither new content nor new deletions).
import { IndexeddbPersistence } from 'y-indexeddb';
import { WebsocketProvider } from 'y-websocket';
import * as Y from 'yjs';

/** The name of a copy's database; the derivation page opens it under this name. */
export function deviceCopyName(userId: string, derivationId: string): string {
  return `marginalia:${userId}:${derivationId}`;
}

export interface DeviceCopy {
  name: string;
  derivationId: string;
}

// Derivation pages open in this tab register their document: it is newer than what has reached
// the database (the last keystroke may still be on its way there).
const openDocs = new Map<string, Y.Doc>();

/** Called by a derivation page for the document it keeps on this device; returns the undo. */
export function registerOpenCopy(name: string, doc: Y.Doc): () => void {
  openDocs.set(name, doc);
  return () => {
    if (openDocs.get(name) === doc) openDocs.delete(name);
  };
}

/** The copies of this user's derivations on this device. */
export async function listDeviceCopies(userId: string): Promise<DeviceCopy[]> {
  const prefix = deviceCopyName(userId, '');
  const names = new Set<string>([...openDocs.keys()].filter((name) => name.startsWith(prefix)));
  if (typeof indexedDB !== 'undefined' && typeof indexedDB.databases === 'function') {
    for (const database of await indexedDB.databases()) {
      if (database.name?.startsWith(prefix)) names.add(database.name);
    }
  }
  return [...names].map((name) => ({ name, derivationId: name.slice(prefix.length) }));
}

function socketBase(): string {
  return `${window.location.protocol === 'https:' ? 'wss' : 'ws'}://${window.location.host}/collab`;
}

function withTimeout<T>(promise: Promise<T>, ms: number, what: string): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(what)), ms);
    promise.then(
      (value) => {
        clearTimeout(timer);
        resolve(value);
      },
      (error: unknown) => {
        clearTimeout(timer);
        reject(error instanceof Error ? error : new Error(String(error)));
      },
    );
  });
}

/** The server's document now, from a sync of its own (this connection sends nothing and shows no presence). */
async function serverDocument(derivationId: string, timeoutMs: number): Promise<Y.Doc> {
  const doc = new Y.Doc();
  const provider = new WebsocketProvider(socketBase(), derivationId, doc, { disableBc: true, maxBackoffTime: 1_000 });
  provider.awareness.setLocalState(null);
  try {
    await withTimeout(
      new Promise<void>((resolve) => {
        if (provider.synced) resolve();
        provider.on('sync', (synced: boolean) => synced && resolve());
      }),
      timeoutMs,
      'the server did not answer',
    );
    return doc;
  } catch (error) {
    doc.destroy();
    throw error;
  } finally {
    provider.destroy();
  }
}

/** Whether `local` holds anything `server` lacks: content it has not seen or deletions it has not made. */
export function holdsUnsentEdits(local: Y.Doc, server: Y.Doc): boolean {
  const merged = new Y.Doc({ gc: false });
  Y.applyUpdate(merged, Y.encodeStateAsUpdate(server));
  const before = Y.snapshot(merged);
  Y.applyUpdate(merged, Y.encodeStateAsUpdate(local));
  const unchanged = Y.equalSnapshots(before, Y.snapshot(merged)) && merged.store.pendingStructs === null && merged.store.pendingDs === null;
  merged.destroy();
  return !unchanged;
}

/** A copy read from its database (or the open page's document), with a way to let it go. */
interface OpenedCopy {
  doc: Y.Doc;
  close(): Promise<void>;
}

async function openCopy(copy: DeviceCopy): Promise<OpenedCopy> {
  const open = openDocs.get(copy.name);
  if (open) return { doc: open, close: async () => undefined };
  const doc = new Y.Doc();
  const persistence = new IndexeddbPersistence(copy.name, doc);
  await persistence.whenSynced;
  return {
    doc,
    close: async () => {
      await persistence.destroy();
      doc.destroy();
    },
  };
}

export type CopyState =
  | { state: 'confirmed' }
  | { state: 'unsent' }
  /** The server could not be asked (offline, no answer, no longer allowed): its edits cannot be confirmed. */
  | { state: 'unknown'; reason: string };

export async function checkCopy(copy: DeviceCopy, timeoutMs = 5_000): Promise<CopyState> {
  let opened: OpenedCopy;
  try {
    opened = await withTimeout(openCopy(copy), timeoutMs, 'the copy on this device could not be read');
  } catch (error) {
    return { state: 'unknown', reason: error instanceof Error ? error.message : String(error) };
  }
  try {
    // An empty copy (never written) has nothing to lose.
    if (opened.doc.store.clients.size === 0) return { state: 'confirmed' };
    let server: Y.Doc;
    try {
      server = await serverDocument(copy.derivationId, timeoutMs);
    } catch (error) {
      return { state: 'unknown', reason: error instanceof Error ? error.message : String(error) };
    }
    const unsent = holdsUnsentEdits(opened.doc, server);
    server.destroy();
    return unsent ? { state: 'unsent' } : { state: 'confirmed' };
  } finally {
    await opened.close();
  }
}

/**
 * Sends a copy's edits to the server over a connection of its own (the derivation page, if open,
 * sends them too). Returns the way to stop; the caller checks again to see them confirmed.
 */
export async function sendCopy(copy: DeviceCopy): Promise<() => Promise<void>> {
  if (openDocs.has(copy.name)) return async () => undefined; // the page's own connection sends them
  const opened = await openCopy(copy);
  const provider = new WebsocketProvider(socketBase(), copy.derivationId, opened.doc, { disableBc: true, maxBackoffTime: 2_000 });
  provider.awareness.setLocalState(null);
  return async () => {
    provider.destroy();
    await opened.close();
  };
}

/** Removes every copy of this user's derivations from this device. */
export async function clearDeviceCopies(userId: string): Promise<void> {
  const copies = await listDeviceCopies(userId);
  await Promise.all(
    copies.map(
      (copy) =>
        new Promise<void>((resolve) => {
          const request = indexedDB.deleteDatabase(copy.name);
          // Open connections close themselves when asked (y-indexeddb's databases do); do not wait forever.
          const timer = setTimeout(resolve, 5_000);
          request.onsuccess = request.onerror = () => {
            clearTimeout(timer);
            resolve();
          };
        }),
    ),
  );
}
