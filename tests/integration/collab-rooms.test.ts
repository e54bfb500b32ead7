// The collaboration rooms in-process, on an in-memory database, without the sign-in in front of
// them: the update log and its snapshots, unloading idle rooms, loading again, and the access the
// rest of the server gets (working copy as ProseMirror JSON, state for versions, server-made
// updates, change events naming the steps).
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { eq } from 'drizzle-orm';
import { WebSocketServer } from 'ws';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import * as Y from 'yjs';
import { schema } from '../../db/client';
import { openDatabase, type OpenedDatabase } from '../../db/open';
import type { DocumentChange } from '../../server/collab/access';
import { CollabHub } from '../../server/collab/hub';
import { defaultLimits } from '../../server/collab/limits';
import { connectClient, eventually, type CollabClient } from './collabClients';

let database: OpenedDatabase;
let hub: CollabHub;
let http: Server;
let url: string;
let user: { id: string; email: string; name: string };
let groupId: string;
const clients: CollabClient[] = [];

const limits = { ...defaultLimits, idleUnloadMs: 150, snapshotEvery: 20, activityFlushMs: 50, accessRecheckMs: 3_600_000, maxDocumentBytes: 256 * 1024 };

beforeAll(async () => {
  database = await openDatabase({ dataDir: 'memory://' });
  const [row] = await database.db.insert(schema.users).values({ email: 'rooms@chains.example', name: 'Ada Roomkeeper' }).returning();
  user = { id: row!.id, email: row!.email, name: row!.name };
  const [group] = await database.db.insert(schema.groups).values({ name: 'Rooms group' }).returning();
  groupId = group!.id;
  await database.db.insert(schema.memberships).values({ groupId, userId: user.id, role: 'author' });

  hub = new CollabHub(limits);
  hub.start();
  const wss = new WebSocketServer({ noServer: true });
  http = createServer();
  http.on('upgrade', (req, socket, head) => {
    const derivationId = (req.url ?? '').split('/').pop()!;
    wss.handleUpgrade(req, socket, head, (ws) => hub.attach(ws, user, 'author', derivationId));
  });
  await new Promise<void>((resolve) => http.listen(0, '127.0.0.1', resolve));
  url = `http://127.0.0.1:${(http.address() as AddressInfo).port}`;
});

afterAll(async () => {
  for (const c of clients) c.destroy();
  await hub?.stop();
  await new Promise((resolve) => http?.close(resolve));
  await database?.close();
});

async function newDerivation(title: string): Promise<string> {
  const [row] = await database.db.insert(schema.derivations).values({ groupId, title }).returning();
  return row!.id;
}

function client(derivationId: string): CollabClient {
  const c = connectClient(url, derivationId);
  clients.push(c);
  return c;
}

function paragraph(stepId: string, text: string): Y.XmlElement {
  const element = new Y.XmlElement('paragraph');
  element.setAttribute('stepId', stepId);
  element.insert(0, [new Y.XmlText(text)]);
  return element;
}

async function storedRows(derivationId: string) {
  const updates = await database.db.select().from(schema.documentUpdates).where(eq(schema.documentUpdates.derivationId, derivationId));
  const [snapshot] = await database.db.select().from(schema.documentSnapshots).where(eq(schema.documentSnapshots.derivationId, derivationId));
  return { updates, snapshot };
}

describe('the update log', () => {
  test('edits are logged, folded into a snapshot every so many updates, and the room loads again from snapshot plus log', async () => {
    const derivationId = await newDerivation('Log and snapshots');
    const author = client(derivationId);
    await author.synced();
    const body = author.doc.getXmlFragment('body');
    for (let i = 0; i < 45; i++) {
      body.push([paragraph(`step-${i}`, `line ${i}`)]);
      await new Promise((resolve) => setTimeout(resolve, 5));
    }
    await eventually(() => hub.openRooms > 0, 'the room to be open');
    let rows = await storedRows(derivationId);
    const deadline = Date.now() + 5_000;
    while ((!rows.snapshot || rows.snapshot.upToSeq === 0) && Date.now() < deadline) {
      await new Promise((resolve) => setTimeout(resolve, 20));
      rows = await storedRows(derivationId);
    }
    expect(rows.snapshot).toBeDefined();
    // The log keeps only what the snapshot does not cover.
    for (const update of rows.updates) expect(update.seq).toBeGreaterThan(rows.snapshot!.upToSeq);
    expect(rows.updates.length).toBeLessThan(45);

    const text = body.toString();
    author.destroy();
    await eventually(() => hub.openRooms === 0, 'the idle room to leave memory');
    rows = await storedRows(derivationId);
    expect(rows.updates).toHaveLength(0); // compacted when the last client left

    const again = client(derivationId);
    await again.synced();
    expect(again.doc.getXmlFragment('body').toString()).toBe(text);
  });

  test("accepted edits keep the derivation's last edit and authors current", async () => {
    const derivationId = await newDerivation('Last edit');
    const author = client(derivationId);
    await author.synced();
    author.doc.getXmlFragment('body').push([paragraph('a', 'edited')]);
    const deadline = Date.now() + 5_000;
    let row = (await database.db.select().from(schema.derivations).where(eq(schema.derivations.id, derivationId)))[0]!;
    while (row.updatedBy !== user.id && Date.now() < deadline) {
      await new Promise((resolve) => setTimeout(resolve, 20));
      row = (await database.db.select().from(schema.derivations).where(eq(schema.derivations.id, derivationId)))[0]!;
    }
    expect(row.updatedBy).toBe(user.id);
    const authors = await database.db.select().from(schema.derivationAuthors).where(eq(schema.derivationAuthors.derivationId, derivationId));
    expect(authors.map((a) => a.userId)).toContain(user.id);
  });
});

describe('access for the rest of the server', () => {
  test('the working copy reads as ProseMirror JSON and its encoded state rebuilds the same document', async () => {
    const derivationId = await newDerivation('Reading the working copy');
    const author = client(derivationId);
    await author.synced();
    const heading = new Y.XmlElement('heading');
    heading.setAttribute('level', 2 as unknown as string);
    heading.setAttribute('stepId', 'h');
    heading.insert(0, [new Y.XmlText('Fixed point')]);
    author.doc.getXmlFragment('body').push([heading, paragraph('p', 'g* = epsilon/3')]);
    await eventually(() => hub.openRooms > 0, 'the room');
    await new Promise((resolve) => setTimeout(resolve, 100));

    expect(await hub.readWorkingCopy(derivationId)).toEqual({
      type: 'doc',
      content: [
        { type: 'heading', attrs: { level: 2, stepId: 'h' }, content: [{ type: 'text', text: 'Fixed point' }] },
        { type: 'paragraph', attrs: { stepId: 'p' }, content: [{ type: 'text', text: 'g* = epsilon/3' }] },
      ],
    });
    const rebuilt = new Y.Doc();
    Y.applyUpdate(rebuilt, await hub.encodeState(derivationId));
    expect(rebuilt.getXmlFragment('body').toString()).toBe(author.doc.getXmlFragment('body').toString());
  });

  test('an update made on the server reaches open connections and the change events name the steps changed', async () => {
    const derivationId = await newDerivation('Server-made updates');
    const changes: DocumentChange[] = [];
    const stop = hub.onDocumentChanged((change) => {
      if (change.derivationId === derivationId) changes.push(change);
    });
    const author = client(derivationId);
    await author.synced();
    author.doc.getXmlFragment('body').push([paragraph('first', 'one'), paragraph('second', 'two')]);
    await eventually(() => changes.length > 0, 'the first change event');
    expect(changes[0]!.stepIds.sort()).toEqual(['first', 'second']);
    expect(changes[0]!.userIds).toEqual([user.id]);

    ((author.doc.getXmlFragment('body').get(1) as Y.XmlElement).get(0) as Y.XmlText).insert(3, ' and a half');
    await eventually(() => changes.some((c) => c.stepIds.includes('second') && c.stepIds.length === 1), 'a change naming the edited step');

    const copy = new Y.Doc();
    Y.applyUpdate(copy, await hub.encodeState(derivationId));
    const before = Y.encodeStateVector(copy);
    copy.getXmlFragment('body').push([paragraph('imported', 'from a LaTeX file')]);
    await hub.applyUpdate(derivationId, Y.encodeStateAsUpdate(copy, before));
    await eventually(() => author.doc.getXmlFragment('body').toString().includes('from a LaTeX file'), 'the server-made update to reach the author');
    expect(changes.at(-1)).toMatchObject({ stepIds: ['imported'], userIds: [] });
    stop();
  });

  test('a server-made update past the document limit is refused and changes nothing', async () => {
    const derivationId = await newDerivation('Too large an import');
    const copy = new Y.Doc();
    copy.getXmlFragment('body').push([paragraph('big', 'y'.repeat(300 * 1024))]);
    await expect(hub.applyUpdate(derivationId, Y.encodeStateAsUpdate(copy))).rejects.toMatchObject({ code: 'DOCUMENT_TOO_LARGE' });
    expect((await hub.readWorkingCopy(derivationId)).content ?? []).toHaveLength(0);
  });
});
