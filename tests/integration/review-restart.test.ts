// Review across a crash: an edit stored just before a kill -9, whose sign-off was not yet compared,
// clears that sign-off when the server starts again; a claim that turned failing just before the
// kill is still mailed after the restart.
import { randomBytes, randomUUID } from 'node:crypto';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { claimBlockNode } from '../../flow/document';
import { demoAccount, demoSessions, readMailbox, startServer, waitForMail, type DemoSessions, type StartedServer } from '../helpers';
import { connectClient, type CollabClient } from './collabClients';
import { appendSteps, appendToParagraph, paragraph, setField, withStepId } from './reviewDocuments';

const secret = randomBytes(32).toString('base64url');
let dataDir: string;
let server: StartedServer;
let demo: DemoSessions;
const clients: CollabClient[] = [];

// Comparisons and mails far slower than the test, so that the kill comes before them.
const slow = { MARGINALIA_SIGNOFF_CHECK_MS: '60000', MARGINALIA_FAILING_MAIL_WINDOW_MS: '600000', MARGINALIA_CHECK_DELAY_MS: '100', MARGINALIA_CHECK_MAX_DELAY_MS: '300' };
const quick = { MARGINALIA_SIGNOFF_CHECK_MS: '50', MARGINALIA_FAILING_MAIL_WINDOW_MS: '200' };

async function start(env: Record<string, string>): Promise<void> {
  server = await startServer({ demo: true, dataDir, env: { NEXTAUTH_SECRET: secret, ...env } });
  demo = await demoSessions(server.url);
}

beforeAll(async () => {
  dataDir = await mkdtemp(path.join(tmpdir(), 'marginalia-review-'));
  await start(slow);
});

afterAll(async () => {
  for (const client of clients) client.destroy();
  await server?.stop();
  await rm(dataDir, { recursive: true, force: true });
});

async function until<T>(read: () => Promise<T>, check: (value: T) => boolean, what: string): Promise<T> {
  const deadline = Date.now() + 30_000;
  for (;;) {
    const value = await read();
    if (check(value)) return value;
    if (Date.now() > deadline) throw new Error(`Timed out waiting for ${what}.`);
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

type Review = { steps: { stepId: string; excerpt: string; signOffs: unknown[]; lastCleared: { cleared: { reason: string } | null } | null }[] };

test('a sign-off whose step was edited just before a crash is cleared when the server starts again; a claim that turned failing is still mailed', async () => {
  const created = await demo.as.author.post<{ id: string }>(`/api/groups/${demo.groupId}/derivations`, { title: 'Restart: sign-off and mail' });
  const id = created.body.id;
  const client = connectClient(server.url, id, { cookie: demo.cookies.author, reconnect: false });
  clients.push(client);
  await client.synced();
  const prose = randomUUID();
  const claim = randomUUID();
  appendSteps(client.doc, [
    paragraph('The flow of the quartic coupling is marginal at d = 4.', prose),
    // The binomial square (common practice): holds as written.
    withStepId(claimBlockNode({ kind: 'identity', id: 'square', lhs: '(1+x)^2', rhs: '1 + 2*x + x^2' }, { flow: 'none' }), claim),
  ]);
  const review = () => demo.as.reviewer.get<Review>(`/api/derivations/${id}/review`).then((answer) => answer.body);
  const checks = () => demo.as.author.get<{ claims: { status: string }[] }>(`/api/derivations/${id}/checks`).then((answer) => answer.body.claims[0]?.status);
  await until(review, (view) => view.steps.length === 2, 'the steps');
  await until(checks, (status) => status === 'holds', 'the claim to hold');

  expect((await demo.as.reviewer.post(`/api/derivations/${id}/sign-offs`, { stepId: prose })).status).toBe(201);
  appendToParagraph(client.doc, prose, ' It decreases logarithmically.');
  setField(client.doc, claim, 'rhs', '1 - 2*x + x^2');
  await until(review, (view) => view.steps.some((s) => s.excerpt.endsWith('logarithmically.')), 'the edit to be stored');
  await until(checks, (status) => status === 'fails', 'the claim to fail');
  // The sign-off still stands: nothing compared it yet.
  expect((await review()).steps.find((s) => s.stepId === prose)?.signOffs).toHaveLength(1);
  const before = await readMailbox(server.url, { to: demoAccount('author').email });
  await new Promise((resolve) => setTimeout(resolve, 300)); // the turned claim's note is written right after the run
  client.destroy();
  await server.kill('SIGKILL');

  await start(quick);
  const after = await until(review, (view) => view.steps.find((s) => s.stepId === prose)?.signOffs.length === 0, 'the sign-off to be cleared after the restart');
  expect(after.steps.find((s) => s.stepId === prose)?.lastCleared?.cleared?.reason).toBe('the step was edited after the sign-off');
  const mail = await waitForMail(server.url, { to: demoAccount('author').email, subject: /A claim that held now fails in "Restart: sign-off and mail"/, notIn: before });
  expect(mail.text).toMatch(/- square \(identity\): fails/);
});
