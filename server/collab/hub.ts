// The collaboration server: rooms by derivation, the upgrade of /collab/<derivationId> (session,
// Origin and role checked before the socket opens), the group-commit writer, compaction,
// unloading idle rooms, periodic access checks and the server-side access of access.ts.
import { STATUS_CODES, type IncomingMessage } from 'node:http';
import type { Duplex } from 'node:stream';
import { yXmlFragmentToProsemirrorJSON } from 'y-prosemirror';
import { WebSocketServer, type RawData, type WebSocket } from 'ws';
import * as Y from 'yjs';
import { isOwnOrigin } from '../origin';
import { AccessError, authorizeDerivation, may, type Role } from '../permissions';
import { parseCookieHeader, sessionUserFromCookies, type SessionUser } from '../session';
import type { CollabAccess, DocumentChange, ProseMirrorJson } from './access';
import { ActivityLog } from './activity';
import { closeCodes } from './closeReasons';
import type { CollabLimits } from './limits';
import { SocketPeer } from './peer';
import { Room, type AppliedUpdate, type Peer } from './room';
import { appendUpdates, loadDocument } from './store';
import { UpdateWriter } from './writer';

export const collabPrefix = '/collab/';

const uuidPattern = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

interface Queued {
  room: Room;
  applied: AppliedUpdate;
}

/** Answers an upgrade request with a plain HTTP refusal and ends the socket. */
function refuse(socket: Duplex, status: number, message: string): void {
  if (socket.destroyed) return;
  const body = JSON.stringify({ error: message });
  socket.end(
    `HTTP/1.1 ${status} ${STATUS_CODES[status] ?? 'Refused'}\r\n` +
      'Content-Type: application/json\r\n' +
      `Content-Length: ${Buffer.byteLength(body)}\r\n` +
      'Connection: close\r\n\r\n' +
      body,
  );
  setTimeout(() => socket.destroy(), 1_000).unref();
}

function toBytes(data: RawData): Uint8Array {
  if (Array.isArray(data)) return Buffer.concat(data);
  if (data instanceof ArrayBuffer) return new Uint8Array(data);
  return data;
}

export class CollabHub implements CollabAccess {
  private readonly rooms = new Map<string, Room>();
  private readonly loading = new Map<string, Promise<Room>>();
  private readonly peers = new Set<SocketPeer>();
  private readonly listeners = new Set<(change: DocumentChange) => void>();
  private readonly wss: WebSocketServer;
  private readonly writer: UpdateWriter<Queued>;
  private readonly activity: ActivityLog;
  private recheckTimer: NodeJS.Timeout | null = null;
  private rechecking = false;
  private stopping = false;

  constructor(private readonly limits: CollabLimits) {
    // The socket layer's own cap sits above ours, so that our limit answers with a clear reason.
    this.wss = new WebSocketServer({ noServer: true, maxPayload: limits.maxMessageBytes * 2 + 1024, perMessageDeflate: false });
    this.writer = new UpdateWriter<Queued>({
      append: appendUpdates,
      onCommitted: (batch) => this.committed(batch),
      onFailure: (error, attempt) => {
        console.error(`collab: storing ${this.writer.pending} document updates failed (attempt ${attempt}); retrying:`, error);
        // Clients keep their edits; past a few attempts tell them, so the page says so.
        if (attempt === 5) for (const peer of this.peers) peer.close(closeCodes.serverTrouble);
      },
    });
    this.activity = new ActivityLog(limits.activityFlushMs);
  }

  start(): void {
    this.activity.start();
    this.recheckTimer = setInterval(() => void this.recheckAccess(), this.limits.accessRecheckMs);
    this.recheckTimer.unref();
  }

  // ---- the socket ----------------------------------------------------------------------------

  /** Handles an upgrade under /collab/: refuses with 401/403/404 or opens the socket. */
  async upgrade(req: IncomingMessage, socket: Duplex, head: Buffer): Promise<void> {
    socket.on('error', () => socket.destroy());
    if (this.stopping) return refuse(socket, 503, 'The server is stopping.');
    const path = (req.url ?? '/').split('?')[0] ?? '/';
    let derivationId: string;
    try {
      derivationId = decodeURIComponent(path.slice(collabPrefix.length));
    } catch {
      return refuse(socket, 404, 'No such derivation.');
    }
    if (!uuidPattern.test(derivationId)) return refuse(socket, 404, 'No such derivation.');
    if (!isOwnOrigin(req.headers.origin, req.headers.host)) {
      return refuse(socket, 403, 'This connection came from another site and was refused.');
    }
    const cookies = parseCookieHeader(req.headers.cookie);
    let user: SessionUser | null;
    let role: Role;
    try {
      user = await sessionUserFromCookies(cookies);
      if (!user) return refuse(socket, 401, 'Sign in first.');
      role = (await authorizeDerivation(user.id, derivationId, 'read')).role;
    } catch (error) {
      if (error instanceof AccessError) return refuse(socket, error.status, error.message);
      console.error('collab: checking a connection failed:', error);
      return refuse(socket, 500, 'Something went wrong on the server.');
    }
    if (socket.destroyed || this.stopping) return;
    const signedIn = user;
    this.wss.handleUpgrade(req, socket, head, (ws) => this.attach(ws, signedIn, role, derivationId, cookies));
  }

  /** Joins an opened socket, already checked, to its derivation's room. */
  attach(ws: WebSocket, user: SessionUser, role: Role, derivationId: string, cookies: Record<string, string> = {}): void {
    const peer = new SocketPeer(ws, user, role, may(role, 'editText'), derivationId, cookies, this.limits.maxBufferedBytes);
    this.peers.add(peer);
    let room: Room | null = null;
    const early: Uint8Array[] = [];
    ws.on('error', () => undefined); // e.g. a frame above the socket layer's cap: ws closes with 1009
    ws.on('message', (data, isBinary) => {
      if (!isBinary) return peer.close(closeCodes.malformed);
      const bytes = toBytes(data);
      if (room) room.receive(peer, bytes);
      else early.push(bytes);
    });
    ws.on('close', () => {
      this.peers.delete(peer);
      if (room) {
        room.leave(peer);
        if (room.peers.size === 0) void this.settle(room);
      }
    });
    this.room(derivationId).then(
      (loaded) => {
        if (peer.closed) {
          if (loaded.peers.size === 0) this.scheduleUnload(loaded);
          return;
        }
        room = loaded;
        loaded.join(peer);
        for (const bytes of early.splice(0)) loaded.receive(peer, bytes);
      },
      (error: unknown) => {
        console.error(`collab: opening derivation ${derivationId} failed:`, error);
        peer.close(closeCodes.serverTrouble);
      },
    );
  }

  // ---- rooms -----------------------------------------------------------------------------------

  private room(derivationId: string): Promise<Room> {
    const open = this.rooms.get(derivationId);
    if (open) {
      if (open.unloadTimer) clearTimeout(open.unloadTimer);
      open.unloadTimer = null;
      return Promise.resolve(open);
    }
    let loading = this.loading.get(derivationId);
    if (!loading) {
      loading = loadDocument(derivationId)
        .then((stored) => {
          const room = new Room(derivationId, stored, this.limits, {
            store: (r, applied) => this.writer.enqueue({ derivationId: r.derivationId, update: applied.update, userId: applied.userId, tag: { room: r, applied } }),
            dropped: (r, p, bytes) => this.dropped(r, p as SocketPeer, bytes),
          });
          this.rooms.set(derivationId, room);
          // A log left long by a crash is folded into a snapshot right away.
          if (room.updatesSinceSnapshot >= this.limits.snapshotEvery) void room.compact();
          return room;
        })
        .finally(() => this.loading.delete(derivationId));
      this.loading.set(derivationId, loading);
    }
    return loading;
  }

  /** After the last connection left: everything committed, a snapshot, then unload after a while. */
  private async settle(room: Room): Promise<void> {
    await room.committedUpTo(room.appliedMark);
    if (room.peers.size > 0) return;
    await room.compact();
    this.scheduleUnload(room);
  }

  private scheduleUnload(room: Room): void {
    if (room.unloadTimer) clearTimeout(room.unloadTimer);
    room.unloadTimer = setTimeout(() => {
      room.unloadTimer = null;
      if (this.rooms.get(room.derivationId) !== room || room.peers.size > 0) return;
      if (room.uncommitted > 0 || room.isCompacting || room.updatesSinceSnapshot > 0) {
        void this.settle(room);
        return;
      }
      this.rooms.delete(room.derivationId);
      room.destroy();
    }, this.limits.idleUnloadMs);
    room.unloadTimer.unref();
  }

  /** Rooms in memory (for tests and the shutdown). */
  get openRooms(): number {
    return this.rooms.size;
  }

  private committed(batch: readonly { tag: Queued }[]): void {
    const byRoom = new Map<Room, AppliedUpdate[]>();
    for (const { tag } of batch) {
      const list = byRoom.get(tag.room);
      if (list) list.push(tag.applied);
      else byRoom.set(tag.room, [tag.applied]);
    }
    for (const [room, items] of byRoom) {
      room.committed(items);
      const userIds = [...new Set(items.map((item) => item.userId).filter((id): id is string => id !== null))];
      for (const userId of userIds) this.activity.note(room.derivationId, userId);
      if (room.updatesSinceSnapshot >= this.limits.snapshotEvery) void room.compact();
      if (this.listeners.size > 0) {
        const change: DocumentChange = {
          derivationId: room.derivationId,
          userIds,
          stepIds: [...new Set(items.flatMap((item) => item.stepIds))],
          edits: userIds.map((userId) => ({
            userId,
            stepIds: [...new Set(items.filter((item) => item.userId === userId).flatMap((item) => item.stepIds))],
          })),
          update: items.length === 1 ? items[0]!.update : Y.mergeUpdates(items.map((item) => item.update)),
        };
        for (const listener of this.listeners) {
          try {
            listener(change);
          } catch (error) {
            console.error('collab: a document-changed listener failed:', error);
          }
        }
      }
    }
  }

  private dropped(room: Room, peer: SocketPeer, bytes: number): void {
    peer.droppedUpdates++;
    if (peer.droppedUpdates === 1 || peer.droppedUpdates % 100 === 0) {
      console.warn(
        `collab: dropped ${peer.droppedUpdates === 1 ? 'an update' : `${peer.droppedUpdates} updates`} (${bytes} bytes) from ` +
          `${peer.user.email}, ${peer.role} of derivation ${room.derivationId}: a ${peer.role} may not edit the text.`,
      );
    }
  }

  // ---- access checks while connected -------------------------------------------------------------

  /** Checks every connection's session and role again; closes those that lost them. */
  async recheckAccess(): Promise<void> {
    if (this.rechecking) return;
    this.rechecking = true;
    try {
      for (const peer of [...this.peers]) {
        if (peer.closed) continue;
        try {
          const user = await sessionUserFromCookies(peer.cookies);
          if (!user || user.id !== peer.user.id) {
            peer.close(closeCodes.sessionExpired);
            continue;
          }
          const { role } = await authorizeDerivation(user.id, peer.derivationId, 'read');
          if (role !== peer.role) peer.close(closeCodes.roleChanged);
        } catch (error) {
          if (error instanceof AccessError) peer.close(error.status === 404 ? closeCodes.derivationGone : closeCodes.accessRemoved);
          else console.error('collab: checking a connection again failed:', error);
        }
      }
    } finally {
      this.rechecking = false;
    }
  }

  // ---- server-side access (access.ts) ------------------------------------------------------------

  private async withRoom<T>(derivationId: string, use: (room: Room) => Promise<T> | T): Promise<T> {
    const room = await this.room(derivationId);
    try {
      return await use(room);
    } finally {
      if (room.peers.size === 0) this.scheduleUnload(room);
    }
  }

  readWorkingCopy(derivationId: string): Promise<ProseMirrorJson> {
    return this.withRoom(derivationId, async (room) => {
      await room.committedUpTo(room.appliedMark);
      return yXmlFragmentToProsemirrorJSON(room.body) as ProseMirrorJson;
    });
  }

  encodeState(derivationId: string): Promise<Uint8Array> {
    return this.withRoom(derivationId, async (room) => {
      await room.committedUpTo(room.appliedMark);
      return Y.encodeStateAsUpdate(room.doc);
    });
  }

  applyUpdate(derivationId: string, update: Uint8Array, options: { userId?: string | null } = {}): Promise<void> {
    return this.withRoom(derivationId, (room) => room.committedUpTo(room.applyServerUpdate(update, options.userId ?? null)));
  }

  onDocumentChanged(listener: (change: DocumentChange) => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  // ---- shutdown ------------------------------------------------------------------------------------

  /** Closes every connection, stores what is pending, writes snapshots and the last edits. */
  async stop(): Promise<void> {
    this.stopping = true;
    if (this.recheckTimer) clearInterval(this.recheckTimer);
    for (const peer of this.peers) peer.close(closeCodes.serverStopping);
    await Promise.allSettled([...this.loading.values()]);
    await this.writer.idle();
    for (const room of this.rooms.values()) await room.compact();
    await this.activity.stop();
    for (const room of this.rooms.values()) room.destroy();
    this.rooms.clear();
    for (const ws of this.wss.clients) ws.terminate();
    await new Promise<void>((resolve) => this.wss.close(() => resolve()));
  }
}
