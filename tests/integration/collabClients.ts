// Node clients of the collaboration socket for the tests and the benchmark: a standard y-websocket
// provider over the `ws` package (with the session cookie), BroadcastChannel off so that clients
// in one process really sync through the server.
import { WebSocket } from 'ws';
import { WebsocketProvider } from 'y-websocket';
import * as Y from 'yjs';

// Every provider adds an exit listener to the process; tests and the benchmark open many.
process.setMaxListeners(Math.max(process.getMaxListeners(), 500));

export interface SocketHeaders {
  cookie?: string;
  origin?: string;
}

/** A WebSocket class that sends these headers (the provider only passes url and protocols). */
export function socketWith(headers: SocketHeaders): typeof globalThis.WebSocket {
  const sent: Record<string, string> = {};
  if (headers.cookie) sent.cookie = headers.cookie;
  if (headers.origin) sent.origin = headers.origin;
  class HeaderSocket extends WebSocket {
    constructor(url: string | URL, protocols?: string | string[]) {
      super(url, protocols, { headers: sent });
    }
  }
  return HeaderSocket as unknown as typeof globalThis.WebSocket;
}

export function socketUrl(httpUrl: string): string {
  return `${httpUrl.replace(/^http/, 'ws')}/collab`;
}

export interface CollabClient {
  doc: Y.Doc;
  provider: WebsocketProvider;
  /** Close events the provider saw (code and reason). */
  closes: { code: number; reason: string }[];
  /** Resolves once synced with the server (now, if already). */
  synced(timeoutMs?: number): Promise<void>;
  destroy(): void;
}

export interface ConnectOptions extends SocketHeaders {
  doc?: Y.Doc;
  /** Reconnect after a close the server means as final? (default: the provider's own rule). */
  reconnect?: boolean;
}

export function connectClient(httpUrl: string, derivationId: string, options: ConnectOptions = {}): CollabClient {
  const doc = options.doc ?? new Y.Doc();
  const provider = new WebsocketProvider(socketUrl(httpUrl), derivationId, doc, {
    WebSocketPolyfill: socketWith(options),
    disableBc: true,
    maxBackoffTime: 500,
    ...(options.reconnect === undefined ? {} : { shouldReconnect: () => options.reconnect! }),
  });
  const closes: { code: number; reason: string }[] = [];
  provider.on('connection-close', (event) => {
    if (event) closes.push({ code: event.code, reason: event.reason });
  });
  return {
    doc,
    provider,
    closes,
    synced(timeoutMs = 15_000) {
      if (provider.synced) return Promise.resolve();
      return new Promise((resolve, reject) => {
        const timer = setTimeout(() => reject(new Error(`Not synced with the server within ${timeoutMs} ms.`)), timeoutMs);
        const onSync = (state: boolean) => {
          if (!state) return;
          clearTimeout(timer);
          provider.off('sync', onSync);
          resolve();
        };
        provider.on('sync', onSync);
      });
    },
    destroy() {
      provider.destroy();
      doc.destroy();
    },
  };
}

/** The HTTP status answering a websocket upgrade to this path (101 when the socket opened). */
export function upgradeStatus(httpUrl: string, path: string, headers: SocketHeaders = {}): Promise<{ status: number; body: string }> {
  return new Promise((resolve, reject) => {
    const Socket = socketWith(headers) as unknown as typeof WebSocket;
    const ws = new Socket(`${httpUrl.replace(/^http/, 'ws')}${path}`);
    ws.on('unexpected-response', (_request, response) => {
      let body = '';
      response.on('data', (chunk: Buffer) => (body += chunk.toString()));
      response.on('end', () => resolve({ status: response.statusCode ?? 0, body }));
      response.on('error', () => resolve({ status: response.statusCode ?? 0, body }));
    });
    ws.on('open', () => {
      ws.close();
      resolve({ status: 101, body: '' });
    });
    ws.on('error', (error) => {
      if (!/Unexpected server response/.test(error.message)) reject(error);
    });
  });
}

/** Polls until the check passes (or throws with what was awaited). */
export async function eventually(check: () => boolean, what: string, timeoutMs = 15_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!check()) {
    if (Date.now() > deadline) throw new Error(`Timed out waiting for ${what}.`);
    await new Promise((resolve) => setTimeout(resolve, 10));
  }
}

/** Waits for the provider's next final close (one the server means as final). */
export function nextClose(client: CollabClient, timeoutMs = 15_000): Promise<{ code: number; reason: string }> {
  const seen = client.closes.length;
  return new Promise((resolve, reject) => {
    const started = Date.now();
    const poll = setInterval(() => {
      if (client.closes.length > seen) {
        clearInterval(poll);
        resolve(client.closes[seen]!);
      } else if (Date.now() - started > timeoutMs) {
        clearInterval(poll);
        reject(new Error('The connection was not closed in time.'));
      }
    }, 10);
  });
}
