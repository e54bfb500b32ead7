// The collaboration socket of a running server, through standard y-websocket clients signed in
// through the real sign-in flow: access at the upgrade, concurrent edits converging, read-only
// roles, presence names, limits and close reasons, and durability across a kill -9.
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { randomBytes, randomUUID } from 'node:crypto';
import { encode } from 'next-auth/jwt';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import * as Y from 'yjs';
import {
  api,
  demoAccount,
  demoSessions,
  linkIn,
  readMailbox,
  registerAndSignIn,
  startServer,
  waitForMail,
  type DemoSessions,
  type StartedServer,
} from '../helpers';
import { generator } from '../../flow/numerics/random'; // a fixed random start, so a failing run can be repeated
import { closeCodes, closeMessages } from '../../server/collab/closeReasons';
import { connectClient, eventually, nextClose, upgradeStatus, type CollabClient } from './collabClients';

const secret = randomBytes(32).toString('base64url');
const limits = {
  MARGINALIA_COLLAB_MAX_MESSAGE_BYTES: String(256 * 1024),
  MARGINALIA_COLLAB_MAX_DOCUMENT_BYTES: String(1024 * 1024),
  MARGINALIA_COLLAB_RECHECK_MS: '300',
  MARGINALIA_COLLAB_IDLE_MS: '500',
  MARGINALIA_COLLAB_SNAPSHOT_EVERY: '50',
  MARGINALIA_COLLAB_ACTIVITY_MS: '200',
};

let dataDir: string;
let server: StartedServer;
let demo: DemoSessions;
const clients: CollabClient[] = [];

function start(): Promise<StartedServer> {
  return startServer({ demo: true, dataDir, env: { NEXTAUTH_SECRET: secret, ...limits } });
}

function client(cookie: string | undefined, derivationId: string, options: { reconnect?: boolean } = {}): CollabClient {
  const connected = connectClient(server.url, derivationId, { cookie, ...options });
  clients.push(connected);
  return connected;
}

async function newDerivation(title: string): Promise<string> {
  const created = await demo.as.lead.post<{ id: string }>(`/api/groups/${demo.groupId}/derivations`, { title });
  expect(created.status).toBe(201);
  return created.body.id;
}

/** The first paragraph's text of the body, created by this client if the body is empty. */
function firstLine(doc: Y.Doc): Y.XmlText {
  const body = doc.getXmlFragment('body');
  if (body.length === 0) {
    const paragraph = new Y.XmlElement('paragraph');
    paragraph.setAttribute('stepId', randomUUID());
    paragraph.insert(0, [new Y.XmlText('')]);
    body.insert(0, [paragraph]);
  }
  return (body.get(0) as Y.XmlElement).get(0) as Y.XmlText;
}

function bodyText(doc: Y.Doc): string {
  return doc.getXmlFragment('body').toString();
}

const pause = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

beforeAll(async () => {
  dataDir = await mkdtemp(path.join(tmpdir(), 'marginalia-collab-'));
  server = await start();
  demo = await demoSessions(server.url);
});

afterAll(async () => {
  for (const c of clients) c.destroy();
  await server?.stop();
  await rm(dataDir, { recursive: true, force: true });
});

describe('opening the socket', () => {
  test('without a session the upgrade is refused with 401', async () => {
    expect((await upgradeStatus(server.url, `/collab/${demo.derivationId}`)).status).toBe(401);
    const forged = await upgradeStatus(server.url, `/collab/${demo.derivationId}`, { cookie: 'next-auth.session-token=not-a-session' });
    expect(forged.status).toBe(401);
  });

  test('a signed-in person outside the group is refused with 403', async () => {
    const outsider = await registerAndSignIn(server.url, { name: 'Outside Reader', email: 'outside-collab@elsewhere.example', password: 'outside-password-2' });
    const answer = await upgradeStatus(server.url, `/collab/${demo.derivationId}`, { cookie: outsider });
    expect(answer.status).toBe(403);
    expect(JSON.parse(answer.body)).toEqual({ error: expect.stringMatching(/not a member/) });
  });

  test('an unknown or malformed derivation is refused with 404', async () => {
    expect((await upgradeStatus(server.url, `/collab/${randomUUID()}`, { cookie: demo.cookies.author })).status).toBe(404);
    expect((await upgradeStatus(server.url, '/collab/not-an-id', { cookie: demo.cookies.author })).status).toBe(404);
  });

  test("a connection opened from another site's page is refused; the app's own origin is accepted", async () => {
    const foreign = await upgradeStatus(server.url, `/collab/${demo.derivationId}`, { cookie: demo.cookies.author, origin: 'http://elsewhere.example' });
    expect(foreign.status).toBe(403);
    const own = await upgradeStatus(server.url, `/collab/${demo.derivationId}`, { cookie: demo.cookies.author, origin: server.url });
    expect(own.status).toBe(101);
  });
});

describe('writing together', () => {
  test('two authors making a few hundred random edits at once end with identical text, which a newcomer loads too', async () => {
    const derivationId = await newDerivation('Convergence of concurrent edits');
    const lead = client(demo.cookies.lead, derivationId);
    const author = client(demo.cookies.author, derivationId);
    await Promise.all([lead.synced(), author.synced()]);
    firstLine(lead.doc).insert(0, 'start');
    await eventually(() => bodyText(author.doc).includes('start'), 'the first line to reach the author');

    const edit = async (doc: Y.Doc, random: () => number, operations: number) => {
      const text = firstLine(doc);
      for (let i = 0; i < operations; i++) {
        const length = text.length;
        if (length > 0 && random() < 0.3) {
          const at = Math.floor(random() * length);
          text.delete(at, Math.min(1 + Math.floor(random() * 3), length - at));
        } else {
          const word = String.fromCharCode(97 + Math.floor(random() * 26)).repeat(1 + Math.floor(random() * 3));
          text.insert(Math.floor(random() * (length + 1)), word);
        }
        if (random() < 0.4) await pause(Math.floor(random() * 3));
      }
    };
    await Promise.all([edit(lead.doc, generator(20240611), 300), edit(author.doc, generator(77), 300)]);

    await eventually(
      () => bodyText(lead.doc) === bodyText(author.doc) && Y.encodeStateVector(lead.doc).toString() === Y.encodeStateVector(author.doc).toString(),
      'both authors to converge',
    );
    const converged = bodyText(lead.doc);
    expect(converged.length).toBeGreaterThan(20);

    const newcomer = client(demo.cookies.reviewer, derivationId);
    await newcomer.synced();
    expect(bodyText(newcomer.doc)).toBe(converged);
  });

  test('presence carries the signed-in name and role, whatever name the client claims', async () => {
    const author = client(demo.cookies.author, demo.derivationId);
    const reader = client(demo.cookies.reader, demo.derivationId);
    await Promise.all([author.synced(), reader.synced()]);
    author.provider.awareness.setLocalStateField('user', { name: 'Somebody Else', color: '#2f5fa3', id: 'forged' });
    const authorId = author.doc.clientID;
    await eventually(() => reader.provider.awareness.getStates().has(authorId), "the author's presence to reach the reader");
    const seen = reader.provider.awareness.getStates().get(authorId)!.user as Record<string, unknown>;
    expect(seen.name).toBe(demoAccount('author').name);
    expect(seen.role).toBe('author');
    expect(seen.color).toBe('#2f5fa3');
    expect(seen.id).not.toBe('forged');
  });

  test("the derivation's last edit and its authors follow accepted edits", async () => {
    const derivationId = await newDerivation('Who edited last');
    const author = client(demo.cookies.author, derivationId);
    await author.synced();
    firstLine(author.doc).insert(0, 'an edit by the author');
    const row = async () =>
      (await demo.as.lead.get<{ derivations: { id: string; updatedBy: string | null; authors: { name: string }[] }[] }>(`/api/groups/${demo.groupId}/derivations`)).body.derivations.find(
        (d) => d.id === derivationId,
      )!;
    const authorName = demoAccount('author').name;
    const deadline = Date.now() + 10_000;
    let latest = await row();
    while (latest.updatedBy !== authorName && Date.now() < deadline) {
      await pause(100);
      latest = await row();
    }
    expect(latest.updatedBy).toBe(authorName);
    expect(latest.authors.map((a) => a.name)).toContain(authorName);
  });
});

describe('read-only roles', () => {
  test("a reader's and a reviewer's edits never reach the authors (and are logged as dropped)", async () => {
    const derivationId = await newDerivation('Read-only roles');
    const author = client(demo.cookies.author, derivationId);
    const reader = client(demo.cookies.reader, derivationId);
    const reviewer = client(demo.cookies.reviewer, derivationId);
    await Promise.all([author.synced(), reader.synced(), reviewer.synced()]);
    firstLine(reader.doc).insert(0, 'WRITTEN-BY-READER');
    firstLine(reviewer.doc).insert(0, 'WRITTEN-BY-REVIEWER');
    await pause(100);
    const marker = new Y.XmlElement('paragraph');
    marker.insert(0, [new Y.XmlText('marker from the author')]);
    author.doc.getXmlFragment('body').push([marker]);
    await eventually(() => bodyText(reader.doc).includes('marker from the author'), "the author's marker to reach the reader");
    await eventually(() => bodyText(reviewer.doc).includes('marker from the author'), "the author's marker to reach the reviewer");
    expect(bodyText(author.doc)).not.toContain('WRITTEN-BY');
    expect(bodyText(reviewer.doc)).not.toContain('WRITTEN-BY-READER');
    expect(bodyText(reader.doc)).not.toContain('WRITTEN-BY-REVIEWER');
    const fresh = client(demo.cookies.lead, derivationId);
    await fresh.synced();
    expect(bodyText(fresh.doc)).toContain('marker from the author');
    expect(bodyText(fresh.doc)).not.toContain('WRITTEN-BY');
    await eventually(() => /dropped an update .* reader of derivation/.test(server.output()), 'the dropped update to be logged');
    expect(server.output()).toMatch(/dropped an update .*reviewer of derivation/);
  });
});

describe('limits and close reasons', () => {
  test('a message above the size limit closes the connection with a clear reason and is not passed on', async () => {
    const derivationId = await newDerivation('Too large a message');
    const author = client(demo.cookies.author, derivationId);
    const lead = client(demo.cookies.lead, derivationId);
    await Promise.all([author.synced(), lead.synced()]);
    const closed = nextClose(author);
    firstLine(author.doc).insert(0, 'x'.repeat(300 * 1024));
    const close = await closed;
    expect(close).toEqual({ code: closeCodes.messageTooLarge, reason: closeMessages[closeCodes.messageTooLarge] });
    await pause(300);
    expect(bodyText(lead.doc)).not.toContain('xxxx');
    expect(author.provider.shouldConnect).toBe(false); // final: the client does not retry the same message
  });

  test('edits that would grow the document past its limit are refused with a clear reason', async () => {
    const derivationId = await newDerivation('Too large a document');
    const author = client(demo.cookies.author, derivationId);
    await author.synced();
    const closed = nextClose(author, 30_000);
    for (let i = 0; i < 8 && author.provider.shouldConnect; i++) {
      firstLine(author.doc).insert(0, `${i}`.repeat(200 * 1024));
      await pause(200);
    }
    expect(await closed).toEqual({ code: closeCodes.documentTooLarge, reason: closeMessages[closeCodes.documentTooLarge] });
    const fresh = client(demo.cookies.lead, derivationId);
    await fresh.synced();
    expect(Y.encodeStateAsUpdate(fresh.doc).length).toBeLessThanOrEqual(1024 * 1024);
  });

  test('a connection whose session expires is closed with "session expired"', async () => {
    const me = await api(server.url, demo.cookies.author).get<{ user: { id: string; email: string; name: string } }>('/api/me');
    // A session cookie good for one second; the sign-in library allows 15 s of clock difference.
    const token = await encode({ token: { sub: me.body.user.id, email: me.body.user.email, name: me.body.user.name }, secret, maxAge: 1 });
    const shortLived = client(`next-auth.session-token=${token}`, demo.derivationId);
    await shortLived.synced();
    expect(await nextClose(shortLived, 30_000)).toEqual({ code: closeCodes.sessionExpired, reason: closeMessages[closeCodes.sessionExpired] });
    expect(shortLived.provider.shouldConnect).toBe(false);
  });

  test('a member whose role changes is reconnected with the new rights; one removed from the group is closed with "access removed"', async () => {
    const email = 'temporary-author@chains.example';
    const before = await readMailbox(server.url, { to: email });
    expect((await demo.as.lead.post(`/api/groups/${demo.groupId}/invitations`, { email, role: 'author' })).status).toBe(201);
    const link = linkIn(await waitForMail(server.url, { to: email, notIn: before }), '/invitations/');
    const cookie = await registerAndSignIn(server.url, {
      name: 'Temporary Author',
      email,
      password: 'temporary-password-1',
      invitation: new URL(link).pathname.split('/').pop()!,
    });
    const me = await api(server.url, cookie).get<{ user: { id: string } }>('/api/me');
    const derivationId = await newDerivation('Changing roles');
    const member = client(cookie, derivationId);
    const lead = client(demo.cookies.lead, derivationId);
    await Promise.all([member.synced(), lead.synced()]);
    firstLine(member.doc).insert(0, 'while an author');
    await eventually(() => bodyText(lead.doc).includes('while an author'), 'the edit made as author to arrive');

    const reconnected = nextClose(member);
    expect((await demo.as.lead.patch(`/api/groups/${demo.groupId}/members/${me.body.user.id}`, { role: 'reader' })).status).toBe(200);
    expect((await reconnected).code).toBe(closeCodes.roleChanged);
    await eventually(() => member.provider.synced, 'the member to reconnect');
    firstLine(member.doc).insert(0, 'while a reader ');
    await pause(300);
    expect(bodyText(lead.doc)).not.toContain('while a reader');

    const removed = nextClose(member);
    expect((await demo.as.lead.delete(`/api/groups/${demo.groupId}/members/${me.body.user.id}`)).status).toBe(200);
    expect(await removed).toEqual({ code: closeCodes.accessRemoved, reason: closeMessages[closeCodes.accessRemoved] });
  });
});

describe('durability', () => {
  test('a clean stop tells connected clients the server is restarting, stores everything, and the restart has it', async () => {
    const derivationId = await newDerivation('Clean stop');
    const author = client(demo.cookies.author, derivationId, { reconnect: false });
    await author.synced();
    firstLine(author.doc).insert(0, 'kept across a clean stop');
    await pause(200);
    const closed = nextClose(author);
    expect(await server.stop()).toBe(0);
    expect(await closed).toEqual({ code: closeCodes.serverStopping, reason: closeMessages[closeCodes.serverStopping] });
    author.provider.destroy();
    server = await start();
    demo = await demoSessions(server.url);
    const fresh = client(demo.cookies.lead, derivationId);
    await fresh.synced();
    expect(bodyText(fresh.doc)).toContain('kept across a clean stop');
  });

  test('after kill -9 in the middle of a stream of edits and a restart, every update any client had received is there', async () => {
    const derivationId = await newDerivation('Kill in the middle');
    const lead = client(demo.cookies.lead, derivationId, { reconnect: false });
    const author = client(demo.cookies.author, derivationId, { reconnect: false });
    const watcher = client(demo.cookies.reviewer, derivationId, { reconnect: false });
    const reader = client(demo.cookies.reader, derivationId, { reconnect: false });
    await Promise.all([lead.synced(), author.synced(), watcher.synced(), reader.synced()]);
    firstLine(reader.doc).insert(0, 'READER-NEVER-STORED');

    let streaming = true;
    const stream = async (c: CollabClient, name: string) => {
      for (let i = 0; streaming; i++) {
        const body = c.doc.getXmlFragment('body');
        const paragraph = new Y.XmlElement('paragraph');
        // Sizeable paragraphs keep the writer busy, so the kill lands while updates are in flight.
        paragraph.insert(0, [new Y.XmlText(`${name}-${i}`), new Y.XmlText(` ${'w'.repeat(2000)}`)]);
        body.push([paragraph]);
        await pause(2);
      }
    };
    const streams = [stream(lead, 'lead'), stream(author, 'author')];
    await eventually(() => watcher.doc.getXmlFragment('body').length > 120, 'a good part of the stream to reach the watcher');
    await server.kill('SIGKILL');
    streaming = false;
    await Promise.all(streams);

    // What each client had received from the server when it died.
    const received = {
      watcher: Y.decodeStateVector(Y.encodeStateVector(watcher.doc)),
      leadFromAuthor: Y.decodeStateVector(Y.encodeStateVector(lead.doc)).get(author.doc.clientID) ?? 0,
      authorFromLead: Y.decodeStateVector(Y.encodeStateVector(author.doc)).get(lead.doc.clientID) ?? 0,
    };
    const watcherText = bodyText(watcher.doc);
    for (const c of [lead, author, watcher, reader]) c.provider.destroy();

    server = await start();
    demo = await demoSessions(server.url);
    const fresh = client(demo.cookies.lead, derivationId);
    await fresh.synced();
    const stored = Y.decodeStateVector(Y.encodeStateVector(fresh.doc));
    expect(received.watcher.size).toBeGreaterThan(0);
    for (const [clientId, clock] of received.watcher) expect(stored.get(clientId) ?? 0).toBeGreaterThanOrEqual(clock);
    expect(stored.get(author.doc.clientID) ?? 0).toBeGreaterThanOrEqual(received.leadFromAuthor);
    expect(stored.get(lead.doc.clientID) ?? 0).toBeGreaterThanOrEqual(received.authorFromLead);
    const storedText = bodyText(fresh.doc);
    for (const token of watcherText.match(/(lead|author)-\d+/g) ?? []) expect(storedText).toContain(`>${token} w`);
    expect(storedText).not.toContain('READER-NEVER-STORED');
  });
});
