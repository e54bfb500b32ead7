// One websocket connection to a room: who it is, what it may do, and sending with back-pressure.
import { WebSocket } from 'ws';
import type { Role } from '../permissions';
import type { SessionUser } from '../session';
import { closeCodes, closeMessages, type CloseCode } from './closeReasons';
import type { Peer } from './room';

const KEEPALIVE_MS = 30_000;

export class SocketPeer implements Peer {
  closed = false;
  /** Updates dropped because the role is read-only (logged now and then). */
  droppedUpdates = 0;
  private alive = true;
  private keepalive: NodeJS.Timeout;

  constructor(
    readonly ws: WebSocket,
    readonly user: SessionUser,
    public role: Role,
    public canEdit: boolean,
    readonly derivationId: string,
    /** The cookies the connection was opened with, to check the session again later. */
    readonly cookies: Record<string, string>,
    private readonly maxBufferedBytes: number,
  ) {
    ws.on('pong', () => {
      this.alive = true;
    });
    // A connection that stops answering pings is ended; the client reconnects when it can.
    this.keepalive = setInterval(() => {
      if (!this.alive) {
        ws.terminate();
        return;
      }
      this.alive = false;
      try {
        ws.ping();
      } catch {
        ws.terminate();
      }
    }, KEEPALIVE_MS);
    this.keepalive.unref();
    ws.once('close', () => {
      this.closed = true;
      clearInterval(this.keepalive);
    });
  }

  send(message: Uint8Array): void {
    if (this.closed || this.ws.readyState !== WebSocket.OPEN) return;
    if (this.ws.bufferedAmount > this.maxBufferedBytes) {
      this.close(closeCodes.tooSlow);
      return;
    }
    this.ws.send(message, (error) => {
      if (error) this.ws.terminate();
    });
  }

  close(code: CloseCode, reason: string = closeMessages[code]): void {
    if (this.closed) return;
    this.closed = true;
    clearInterval(this.keepalive);
    this.ws.close(code, reason);
    // A client that never completes the closing handshake is cut off.
    setTimeout(() => this.ws.terminate(), 5_000).unref();
  }
}
