// The yardstick for the collaboration benchmark: a plain y-websocket server (the stock
// @y/websocket-server utilities) with no sign-in, no access checks and nothing written to disk.
import { createServer } from 'node:http';
import type { AddressInfo } from 'node:net';
import { setupWSConnection } from '@y/websocket-server/utils';
import { WebSocketServer } from 'ws';

const server = createServer((_req, res) => res.end('plain y-websocket server'));
const wss = new WebSocketServer({ noServer: true });
server.on('upgrade', (req, socket, head) => {
  wss.handleUpgrade(req, socket, head, (ws) => {
    setupWSConnection(ws, req, { docName: (req.url ?? '/').slice(1).split('?')[0] ?? 'doc', gc: true });
  });
});
server.listen(0, '127.0.0.1', () => {
  console.log(`plain server listening on http://127.0.0.1:${(server.address() as AddressInfo).port}`);
});
process.on('SIGTERM', () => {
  wss.close();
  server.close(() => process.exit(0));
});
