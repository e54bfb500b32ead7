'use client';
// The live connection of a derivation page: one Y.Doc, kept on this device (IndexedDB, so edits
// typed offline survive a closed tab) and synced over /collab/<derivationId> with a standard
// y-websocket provider. Tracks the connection state in words and the reason of a final close.
import { useEffect, useState } from 'react';
import { IndexeddbPersistence } from 'y-indexeddb';
import { WebsocketProvider } from 'y-websocket';
import * as Y from 'yjs';
import type { ConnectionPhase } from '@/components/ConnectionState';
import { deviceCopyName, registerOpenCopy } from '@/app/_lib/deviceCopies';
import { presenceColour, type PresenceUser } from '@/editor/presence';
import { closeCodes, closeMessages, isFinalClose, type CloseCode } from '@/server/collab/closeReasons';

export interface FinalClose {
  code: number;
  message: string;
  /** Edits may continue: they are kept on this device until the connection is back. */
  keepEditing: boolean;
}

export interface CollabSession {
  doc: Y.Doc;
  provider: WebsocketProvider;
  user: PresenceUser;
  /** The document is ready to show (from this device, the server, or after a short wait). */
  ready: boolean;
  phase: ConnectionPhase;
  final: FinalClose | null;
}

interface Options {
  derivationId: string;
  user: { id: string; name: string; role: string };
  /** The server closed because the user's role changed: refetch the role; the socket reconnects. */
  onRoleChanged: () => void;
}

/** How long to wait for the server before showing what this device has (or an empty page). */
const READY_WAIT_MS = 4_000;

function messageFor(code: number, reason: string): string {
  return closeMessages[code as CloseCode] ?? (reason || `The connection closed (code ${code}).`);
}

export function useCollabSession({ derivationId, user, onRoleChanged }: Options): CollabSession | null {
  const [session, setSession] = useState<CollabSession | null>(null);

  useEffect(() => {
    const doc = new Y.Doc();
    const presenceUser: PresenceUser = { id: user.id, name: user.name, role: user.role, color: presenceColour(user.id) };
    const copyName = deviceCopyName(user.id, derivationId);
    const local = new IndexeddbPersistence(copyName, doc);
    // Sign-out asks open pages for their document: it may hold a keystroke not yet in the database.
    const unregisterCopy = registerOpenCopy(copyName, doc);
    const socketUrl = `${window.location.protocol === 'https:' ? 'wss' : 'ws'}://${window.location.host}/collab`;
    const provider = new WebsocketProvider(socketUrl, derivationId, doc, {
      shouldReconnect: (event) => !isFinalClose(event.code),
      maxBackoffTime: 5_000,
    });
    provider.awareness.setLocalStateField('user', presenceUser);

    let localReady = false;
    let waited = false;
    let everSynced = false;
    let opened = false;
    let failedOpens = 0;
    let probing = false;
    let final: FinalClose | null = null;
    let disposed = false;

    const phase = (): ConnectionPhase => {
      if (final) return 'closed';
      if (!navigator.onLine) return 'offline';
      if (provider.wsconnected && provider.synced) return 'connected';
      return everSynced || failedOpens > 0 ? 'reconnecting' : 'connecting';
    };
    const publish = () => {
      if (disposed) return;
      const ready = everSynced || waited || (localReady && doc.getXmlFragment('body').length > 0);
      setSession({ doc, provider, user: presenceUser, ready, phase: phase(), final });
    };
    const finish = (code: number, message: string) => {
      final = { code, message, keepEditing: code === closeCodes.sessionExpired };
      provider.disconnect();
      publish();
    };

    // A refused upgrade reaches the browser only as a failed connection: ask the API why.
    const probe = async () => {
      if (probing || final) return;
      probing = true;
      try {
        const response = await fetch(`/api/derivations/${derivationId}`, { credentials: 'same-origin' });
        if (response.status === 401) finish(closeCodes.sessionExpired, closeMessages[closeCodes.sessionExpired]);
        else if (response.status === 403) finish(closeCodes.accessRemoved, closeMessages[closeCodes.accessRemoved]);
        else if (response.status === 404) finish(closeCodes.derivationGone, closeMessages[closeCodes.derivationGone]);
      } catch {
        // the server is unreachable: keep trying to reconnect
      } finally {
        probing = false;
      }
    };

    provider.on('status', ({ status }) => {
      if (status === 'connected') {
        opened = true;
        failedOpens = 0;
      }
      publish();
    });
    provider.on('sync', (synced: boolean) => {
      if (synced) everSynced = true;
      publish();
    });
    provider.on('connection-close', (event) => {
      if (event && event.code === closeCodes.roleChanged) onRoleChanged();
      if (!opened) {
        failedOpens++;
        if (failedOpens >= 2 && navigator.onLine) void probe();
      }
      opened = false;
      publish();
    });
    provider.on('closed', ({ code, reason }) => finish(code, messageFor(code, reason)));

    const onNetworkChange = () => publish();
    window.addEventListener('online', onNetworkChange);
    window.addEventListener('offline', onNetworkChange);
    void local.whenSynced.then(() => {
      localReady = true;
      publish();
    });
    const timer = window.setTimeout(() => {
      waited = true;
      publish();
    }, READY_WAIT_MS);
    publish();

    return () => {
      disposed = true;
      unregisterCopy();
      window.clearTimeout(timer);
      window.removeEventListener('online', onNetworkChange);
      window.removeEventListener('offline', onNetworkChange);
      provider.destroy();
      void local.destroy();
      doc.destroy();
    };
    // onRoleChanged is read through the latest closure only when called; a change must not reconnect.
  }, [derivationId, user.id, user.name, user.role]);

  return session;
}
