// The derivation page's first read of the text: the working copy's state as one Yjs update
// (GET /api/derivations/:id/state), which the page applies before its live connection has synced.
// Checked against what a y-websocket client syncs from the same server, with an edit made over the
// socket just before; refused without a session, to a signed-in stranger, and for an unknown id.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import * as Y from 'yjs';
import { demoSessions, registerAndSignIn, startServer, type DemoSessions, type StartedServer } from '../helpers';
import { connectClient } from './collabClients';

let server: StartedServer;
let demo: DemoSessions;

beforeAll(async () => {
  server = await startServer({ demo: true });
  demo = await demoSessions(server.url);
}, 120_000);

afterAll(async () => {
  await server?.stop();
});

async function copyAs(cookie: string, derivationId: string): Promise<Y.Doc> {
  const response = await stateAs(cookie, derivationId);
  const doc = new Y.Doc();
  if (response.status === 200) Y.applyUpdate(doc, new Uint8Array(await response.arrayBuffer()));
  return doc;
}

async function stateAs(cookie: string | undefined, derivationId: string): Promise<Response> {
  return fetch(`${server.url}/api/derivations/${derivationId}/state`, { headers: cookie ? { cookie } : {} });
}

describe('the server copy a derivation page reads first', () => {
  test('holds the same text the live connection syncs, including an edit just made over the socket', async () => {
    const author = connectClient(server.url, demo.derivationId, { cookie: demo.cookies.author });
    try {
      await author.synced();
      const line = new Y.XmlText();
      line.insert(0, 'A sentence typed just before the page opened.');
      const paragraph = new Y.XmlElement('paragraph');
      paragraph.setAttribute('stepId', randomUUID());
      paragraph.insert(0, [line]);
      author.doc.getXmlFragment('body').push([paragraph]);

      // The edit is in the copy once the server has accepted it (a reader's copy shows it too).
      const deadline = Date.now() + 15_000;
      while (!(await copyAs(demo.cookies.reader, demo.derivationId)).getXmlFragment('body').toString().includes('A sentence typed just before the page opened.')) {
        if (Date.now() > deadline) throw new Error('the edit did not reach the server copy within 15 s');
        await new Promise((resolve) => setTimeout(resolve, 100));
      }

      const response = await stateAs(demo.cookies.reader, demo.derivationId);
      expect(response.status).toBe(200);
      expect(response.headers.get('content-type')).toBe('application/octet-stream');
      expect(response.headers.get('cache-control')).toBe('no-store');
      const fromRoute = new Y.Doc();
      Y.applyUpdate(fromRoute, new Uint8Array(await response.arrayBuffer()));

      const reader = connectClient(server.url, demo.derivationId, { cookie: demo.cookies.reader });
      try {
        await reader.synced();
        expect(fromRoute.getXmlFragment('body').toString()).toBe(reader.doc.getXmlFragment('body').toString());
        // Applied first, the copy leaves the connection nothing to add: the two merge as one document.
        const merged = new Y.Doc();
        Y.applyUpdate(merged, Y.encodeStateAsUpdate(fromRoute));
        Y.applyUpdate(merged, Y.encodeStateAsUpdate(reader.doc));
        expect(merged.getXmlFragment('body').toString()).toBe(fromRoute.getXmlFragment('body').toString());
      } finally {
        reader.destroy();
      }
    } finally {
      author.destroy();
    }
  }, 60_000);

  test('is refused without a session, to someone outside the group, and for a derivation that does not exist', async () => {
    expect((await stateAs(undefined, demo.derivationId)).status).toBe(401);
    const stranger = await registerAndSignIn(server.url, { name: 'Ola Outsider', email: `outsider-${randomUUID()}@elsewhere.example`, password: 'a long enough password 1' });
    expect((await stateAs(stranger, demo.derivationId)).status).toBe(403);
    expect((await stateAs(demo.cookies.author, randomUUID())).status).toBe(404);
  }, 60_000);
});
