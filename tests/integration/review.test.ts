// Review through the real routes and the real socket: remarks anchored to steps (threads,
// replies, resolve and reopen, removed steps), sign-offs cleared when the step or its flow block
// changes, who may do what, and the mails of review (a remark on your step; claims that held and
// now fail, batched per derivation).
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { claimBlockNode, flowBlockNode } from '../../flow/document';
import type { RemarkThreadView, ReviewView, SignOffView, StepHistory } from '../../server/review';
import { demoAccount, demoSessions, linkIn, readMailbox, startServer, waitForMail, type DemoSessions, type StartedServer } from '../helpers';
import { connectClient, eventually, type CollabClient } from './collabClients';
import { appendSteps, appendToParagraph, paragraph, removeStep, setField, withStepId } from './reviewDocuments';

type Wire<T> = T extends Date ? string : T extends (infer U)[] ? Wire<U>[] : T extends object ? { [K in keyof T]: Wire<T[K]> } : T;
type Review = Wire<ReviewView>;
type Thread = Wire<RemarkThreadView>;
type SignOff = Wire<SignOffView>;
type History = Wire<StepHistory>;

// Long enough for the second edit's check run to finish inside the first one's window on a busy machine.
const FAILING_MAIL_WINDOW_MS = 4_000;

let server: StartedServer;
let demo: DemoSessions;
const clients: CollabClient[] = [];

beforeAll(async () => {
  server = await startServer({
    demo: true,
    env: {
      MARGINALIA_CHECK_DELAY_MS: '100',
      MARGINALIA_CHECK_MAX_DELAY_MS: '400',
      MARGINALIA_FAILING_MAIL_WINDOW_MS: String(FAILING_MAIL_WINDOW_MS),
      MARGINALIA_STEP_AUTHORS_MS: '100',
      MARGINALIA_SIGNOFF_CHECK_MS: '50',
    },
  });
  demo = await demoSessions(server.url);
});

afterAll(async () => {
  for (const client of clients) client.destroy();
  await server?.stop();
});

async function newDerivation(title: string): Promise<string> {
  const created = await demo.as.author.post<{ id: string }>(`/api/groups/${demo.groupId}/derivations`, { title });
  expect(created.status).toBe(201);
  return created.body.id;
}

/** The demo author's client on a derivation, synced. */
async function authorClient(derivationId: string): Promise<CollabClient> {
  const client = connectClient(server.url, derivationId, { cookie: demo.cookies.author });
  clients.push(client);
  await client.synced();
  return client;
}

async function review(derivationId: string, as: keyof DemoSessions['as'] = 'reviewer'): Promise<Review> {
  const answer = await demo.as[as].get<Review>(`/api/derivations/${derivationId}/review`);
  expect(answer.status).toBe(200);
  return answer.body;
}

/** Polls the review view until the check passes. */
async function reviewUntil(derivationId: string, check: (view: Review) => boolean, what: string, timeoutMs = 15_000): Promise<Review> {
  let last: Review | null = null;
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    last = await review(derivationId);
    if (check(last)) return last;
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
  throw new Error(`Timed out waiting for ${what}; last view: ${JSON.stringify(last?.steps)}`);
}

function step(view: Review, stepId: string) {
  const found = view.steps.find((s) => s.stepId === stepId);
  if (!found) throw new Error(`Step ${stepId} is not in the review view.`);
  return found;
}

async function history(derivationId: string, stepId: string): Promise<History> {
  const answer = await demo.as.reviewer.get<History>(`/api/derivations/${derivationId}/steps/${stepId}/history`);
  expect(answer.status).toBe(200);
  return answer.body;
}

/** Three paragraphs written by the demo author; resolves once the server has them. */
async function derivationWithParagraphs(title: string): Promise<{ id: string; client: CollabClient; steps: string[] }> {
  const id = await newDerivation(title);
  const client = await authorClient(id);
  const steps = [randomUUID(), randomUUID(), randomUUID()];
  appendSteps(client.doc, [
    paragraph('At the upper critical dimension the coupling is marginal.', steps[0]),
    paragraph('The one-loop flow is $dg/dl = -b g^2$ with $b > 0$.', steps[1]),
    paragraph('Hence $g(l) \\sim 1/(b l)$ in the infrared.', steps[2]),
  ]);
  await reviewUntil(id, (view) => view.steps.length === 3, 'the three steps to reach the server');
  return { id, client, steps };
}

describe('remarks on steps', () => {
  test('a reviewer remarks on a step; its author gets a mail that links back to the thread', async () => {
    const { id, steps } = await derivationWithParagraphs('Remarks: the marginal coupling');
    const before = await readMailbox(server.url, { to: demoAccount('author').email });

    const posted = await demo.as.reviewer.post<Thread>(`/api/derivations/${id}/remarks`, {
      stepId: steps[1],
      body: 'Which sign convention for l? With dl = -d ln mu the sign of b flips.',
    });
    expect(posted.status).toBe(201);
    expect(posted.body.stepId).toBe(steps[1]);
    expect(posted.body.stepPresent).toBe(true);
    expect(posted.body.excerpt).toContain('$dg/dl = -b g^2$');
    expect(posted.body.entries).toHaveLength(1);
    expect(posted.body.entries[0]).toMatchObject({ kind: 'remark', by: { name: demoAccount('reviewer').name } });

    // The demo's own review mails the author too, in the background: wait for this derivation's.
    const mail = await waitForMail(server.url, { to: demoAccount('author').email, subject: /remark on your step in "Remarks: the marginal coupling"/, notIn: before });
    expect(mail.subject).toContain(demoAccount('reviewer').name);
    expect(mail.subject).toContain('Remarks: the marginal coupling');
    expect(mail.text).toContain('Which sign convention for l?');
    expect(mail.text).toContain('> The one-loop flow is $dg/dl = -b g^2$');
    const link = new URL(linkIn(mail, `/derivations/${id}`));
    expect(link.searchParams.get('step')).toBe(steps[1]);
    expect(link.searchParams.get('thread')).toBe(posted.body.id);
    // The writer of the remark is not mailed about their own remark.
    const reviewerMail = await readMailbox(server.url, { to: demoAccount('reviewer').email });
    expect(reviewerMail.some((m) => m.text.includes('Which sign convention for l?'))).toBe(false);

    const view = await review(id, 'reader');
    expect(view.threads.map((t) => t.id)).toEqual([posted.body.id]);
    expect(step(view, steps[1])).toMatchObject({ openThreads: 1, resolvedThreads: 0 });
    expect(view.you).toEqual({ mayRemark: false, mayResolve: false, maySignOff: false });
  });

  test('replies, resolving and reopening are kept in the thread in order; a resolved thread takes no reply until reopened', async () => {
    const { id, steps } = await derivationWithParagraphs('Remarks: a thread');
    const thread = (await demo.as.reviewer.post<Thread>(`/api/derivations/${id}/remarks`, { stepId: steps[2], body: 'Only for l >> 1/(b g0).' })).body;
    const beforeReply = await readMailbox(server.url, { to: demoAccount('reviewer').email });

    const reply = await demo.as.author.post<Thread>(`/api/derivations/${id}/remarks/${thread.id}/replies`, { body: 'Added: for l much larger than 1/(b g_0).' });
    expect(reply.status).toBe(201);
    // The reviewer took part in the thread: the author's reply reaches them.
    const replyMail = await waitForMail(server.url, { to: demoAccount('reviewer').email, subject: /replied to a remark.* in "Remarks: a thread"/, notIn: beforeReply });
    expect(replyMail.text).toContain('Added: for l much larger than');
    expect(replyMail.text).toContain('because you wrote in this remark thread');

    const resolved = await demo.as.reviewer.patch<Thread>(`/api/derivations/${id}/remarks/${thread.id}`, { resolved: true });
    expect(resolved.status).toBe(200);
    expect(resolved.body.resolved?.by.name).toBe(demoAccount('reviewer').name);

    const twice = await demo.as.author.patch<{ error: string }>(`/api/derivations/${id}/remarks/${thread.id}`, { resolved: true });
    expect(twice.status).toBe(409);
    expect(twice.body.error).toBe('This thread is already resolved.');

    const late = await demo.as.lead.post<{ error: string }>(`/api/derivations/${id}/remarks/${thread.id}/replies`, { body: 'One more thing.' });
    expect(late.status).toBe(409);
    expect(late.body.error).toBe('This thread is resolved: reopen it to reply.');

    const reopened = await demo.as.lead.patch<Thread>(`/api/derivations/${id}/remarks/${thread.id}`, { resolved: false });
    expect(reopened.status).toBe(200);
    expect(reopened.body.resolved).toBeNull();
    expect(reopened.body.entries.map((e) => [e.kind, e.by.name])).toEqual([
      ['remark', demoAccount('reviewer').name],
      ['remark', demoAccount('author').name],
      ['resolved', demoAccount('reviewer').name],
      ['reopened', demoAccount('lead').name],
    ]);
    const events = (await history(id, steps[2])).events.map((e) => e.kind);
    expect(events).toEqual(['reopened', 'resolved', 'reply', 'remark']);
  });

  test('a reader may not remark, reply or resolve: refused with a clear message, nothing written', async () => {
    const { id, steps } = await derivationWithParagraphs('Remarks: the reader');
    const thread = (await demo.as.reviewer.post<Thread>(`/api/derivations/${id}/remarks`, { stepId: steps[0], body: 'Marginal in d = 4 only.' })).body;
    const before = await review(id);

    const remark = await demo.as.reader.post<{ error: string }>(`/api/derivations/${id}/remarks`, { stepId: steps[0], body: 'I disagree.' });
    expect(remark.status).toBe(403);
    expect(remark.body.error).toBe('As reader you may not leave remarks.');
    const reply = await demo.as.reader.post<{ error: string }>(`/api/derivations/${id}/remarks/${thread.id}/replies`, { body: 'I disagree.' });
    expect(reply.status).toBe(403);
    const resolve = await demo.as.reader.patch<{ error: string }>(`/api/derivations/${id}/remarks/${thread.id}`, { resolved: true });
    expect(resolve.status).toBe(403);
    expect(resolve.body.error).toBe('As reader you may not resolve remarks.');

    expect(await review(id)).toEqual(before);
    // Nothing was mailed about it either.
    expect((await readMailbox(server.url)).some((m) => m.text.includes('I disagree.'))).toBe(false);
  });

  test('a remark needs a step that is in the derivation and some text; bad input changes nothing', async () => {
    const { id, steps } = await derivationWithParagraphs('Remarks: bad input');
    const before = await review(id);
    const empty = await demo.as.reviewer.post<{ error: string; field: string }>(`/api/derivations/${id}/remarks`, { stepId: steps[0], body: '   ' });
    expect(empty.status).toBe(400);
    expect(empty.body).toEqual({ error: 'Write the remark first.', field: 'body' });
    const nowhere = await demo.as.reviewer.post<{ error: string; field: string }>(`/api/derivations/${id}/remarks`, { stepId: 'no-such-step', body: 'Here?' });
    expect(nowhere.status).toBe(400);
    expect(nowhere.body).toEqual({ error: 'This step is not in the derivation (it may have been removed).', field: 'stepId' });
    const unknownThread = await demo.as.reviewer.post<{ error: string }>(`/api/derivations/${id}/remarks/${randomUUID()}/replies`, { body: 'Hello' });
    expect(unknownThread.status).toBe(404);
    expect(await review(id)).toEqual(before);
  });

  test("a removed step's remarks stay listed, on a removed step, with the text it had", async () => {
    const { id, client, steps } = await derivationWithParagraphs('Remarks: a removed step');
    const thread = (await demo.as.reviewer.post<Thread>(`/api/derivations/${id}/remarks`, { stepId: steps[0], body: 'Say which lattice.' })).body;
    removeStep(client.doc, steps[0]!);
    const view = await reviewUntil(id, (v) => v.steps.length === 2, 'the step to be removed on the server');
    const kept = view.threads.find((t) => t.id === thread.id);
    expect(kept).toMatchObject({ stepId: steps[0], stepPresent: false, position: null });
    expect(kept?.excerpt).toBe('At the upper critical dimension the coupling is marginal.');
    expect(kept?.entries[0]?.body).toBe('Say which lattice.');
    // The thread still takes replies.
    const reply = await demo.as.author.post<Thread>(`/api/derivations/${id}/remarks/${thread.id}/replies`, { body: 'Removed: the hypercubic lattice is named later.' });
    expect(reply.status).toBe(201);
    expect(reply.body.stepPresent).toBe(false);
  });
});

describe('sign-offs', () => {
  test('a reviewer signs off a step: "checked by" with name and time, cleared with why when the step is edited', async () => {
    const { id, client, steps } = await derivationWithParagraphs('Sign-offs: an edited step');
    const before = step(await review(id), steps[1]!);
    const signed = await demo.as.reviewer.post<SignOff>(`/api/derivations/${id}/sign-offs`, { stepId: steps[1], contentHash: before.contentHash });
    expect(signed.status).toBe(201);
    expect(signed.body).toMatchObject({ stepId: steps[1], by: { name: demoAccount('reviewer').name }, cleared: null });
    expect(Date.parse(signed.body.signedAt)).not.toBeNaN();
    expect(step(await review(id), steps[1]!).signOffs.map((s) => s.by.name)).toEqual([demoAccount('reviewer').name]);

    // An edit of another step leaves it standing; an edit of this step clears it.
    appendToParagraph(client.doc, steps[2]!, ' (leading order)');
    await reviewUntil(id, (v) => step(v, steps[2]!).excerpt.endsWith('(leading order)'), 'the other edit');
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(step(await review(id), steps[1]!).signOffs).toHaveLength(1);

    appendToParagraph(client.doc, steps[1]!, ' Here b = (n+8)/6.');
    const after = await reviewUntil(id, (v) => step(v, steps[1]!).signOffs.length === 0, 'the sign-off to be cleared');
    const cleared = step(after, steps[1]!).lastCleared;
    expect(cleared?.cleared?.reason).toBe('the step was edited after the sign-off');
    expect(cleared?.cleared?.by?.name).toBe(demoAccount('author').name);

    const events = (await history(id, steps[1]!)).events;
    expect(events.map((e) => e.kind)).toEqual(['sign-off-cleared', 'signed-off']);
    expect(events[0]?.detail).toBe(`the sign-off by ${demoAccount('reviewer').name} was cleared: the step was edited after the sign-off`);
  });

  test("a claim's sign-off is cleared when the flow block it depends on changes, not when another flow changes", async () => {
    const id = await newDerivation('Sign-offs: a claim and its flow');
    const client = await authorClient(id);
    const flowStep = randomUUID();
    const otherFlowStep = randomUUID();
    const claimStep = randomUUID();
    appendSteps(client.doc, [
      withStepId(flowBlockNode({ couplings: ['g'], convention: 'ir', parameters: { eps: 0.1 }, beta: { g: 'eps*g - g^2' } }, { name: 'one-loop' }), flowStep),
      withStepId(claimBlockNode({ kind: 'fixed-point', id: 'gstar', near: { g: 0.1 }, value: { g: 'eps' } }), claimStep),
      withStepId(flowBlockNode({ couplings: ['u'], convention: 'ir', beta: { u: '-u' } }, { name: 'unrelated' }), otherFlowStep),
    ]);
    const view = await reviewUntil(id, (v) => v.steps.length === 3, 'the blocks');
    expect(step(view, claimStep)).toMatchObject({ dependencyStepId: flowStep, excerpt: 'Claim "gstar" (fixed point)' });

    const signed = await demo.as.lead.post<SignOff>(`/api/derivations/${id}/sign-offs`, { stepId: claimStep });
    expect(signed.status).toBe(201);

    setField(client.doc, otherFlowStep, 'value', '-2*u', 'beta');
    await new Promise((resolve) => setTimeout(resolve, 400));
    expect(step(await review(id), claimStep).signOffs).toHaveLength(1);

    setField(client.doc, flowStep, 'value', 'eps*g - 2*g^2', 'beta');
    const after = await reviewUntil(id, (v) => step(v, claimStep).signOffs.length === 0, "the claim's sign-off to be cleared");
    expect(step(after, claimStep).lastCleared?.cleared?.reason).toBe('the flow block it depends on was edited after the sign-off');
  });

  test('signing off twice, a step changed since it was read and a step not in the derivation are refused; nothing changes', async () => {
    const { id, client, steps } = await derivationWithParagraphs('Sign-offs: refusals');
    const read = step(await review(id), steps[0]!);
    expect((await demo.as.reviewer.post(`/api/derivations/${id}/sign-offs`, { stepId: steps[0], contentHash: read.contentHash })).status).toBe(201);
    const before = await review(id);

    const twice = await demo.as.reviewer.post<{ error: string }>(`/api/derivations/${id}/sign-offs`, { stepId: steps[0] });
    expect(twice.status).toBe(409);
    expect(twice.body.error).toBe('You have already signed off this step.');

    const unknown = await demo.as.reviewer.post<{ error: string; field: string }>(`/api/derivations/${id}/sign-offs`, { stepId: 'not-a-step' });
    expect(unknown.status).toBe(400);
    expect(unknown.body.field).toBe('stepId');

    const badHash = await demo.as.reviewer.post<{ error: string; field: string }>(`/api/derivations/${id}/sign-offs`, { stepId: steps[1], contentHash: 'abc' });
    expect(badHash.status).toBe(400);
    expect(badHash.body.field).toBe('contentHash');
    expect(await review(id)).toEqual(before);

    // The author edits step 2 after the reviewer read it: the reviewer's sign-off of what they read is refused.
    const stale = step(before, steps[1]!).contentHash;
    appendToParagraph(client.doc, steps[1]!, ' (one loop)');
    await reviewUntil(id, (v) => step(v, steps[1]!).contentHash !== stale, 'the edit');
    const late = await demo.as.reviewer.post<{ error: string; field: string }>(`/api/derivations/${id}/sign-offs`, { stepId: steps[1], contentHash: stale });
    expect(late.status).toBe(409);
    expect(late.body).toEqual({ error: 'The step changed since you read it. Read it again, then sign it off.', field: 'contentHash' });
    expect(step(await review(id), steps[1]!).signOffs).toEqual([]);
  });

  test('authors and readers may not sign off; only the signer withdraws a sign-off, which stays in the history', async () => {
    const { id, steps } = await derivationWithParagraphs('Sign-offs: who may');
    const before = await review(id);
    const byAuthor = await demo.as.author.post<{ error: string }>(`/api/derivations/${id}/sign-offs`, { stepId: steps[0] });
    expect(byAuthor.status).toBe(403);
    expect(byAuthor.body.error).toBe('As author you may not sign off steps.');
    const byReader = await demo.as.reader.post<{ error: string }>(`/api/derivations/${id}/sign-offs`, { stepId: steps[0] });
    expect(byReader.status).toBe(403);
    expect(await review(id)).toEqual(before);

    const signed = (await demo.as.reviewer.post<SignOff>(`/api/derivations/${id}/sign-offs`, { stepId: steps[0] })).body;
    const byLead = await demo.as.lead.delete<{ error: string }>(`/api/derivations/${id}/sign-offs/${signed.id}`);
    expect(byLead.status).toBe(403);
    expect(byLead.body.error).toBe('Only the person who signed off a step may withdraw the sign-off.');
    expect(step(await review(id), steps[0]!).signOffs).toHaveLength(1);

    expect((await demo.as.reviewer.delete(`/api/derivations/${id}/sign-offs/${signed.id}`)).status).toBe(204);
    const after = step(await review(id), steps[0]!);
    expect(after.signOffs).toEqual([]);
    expect(after.lastCleared?.cleared?.reason).toBe('withdrawn by the signer');
    expect((await history(id, steps[0]!)).events.map((e) => e.kind)).toEqual(['sign-off-withdrawn', 'signed-off']);
  });

  test("a reviewer's edits over the socket are dropped: the text and the sign-off stay as they were", async () => {
    const { id, steps } = await derivationWithParagraphs('Sign-offs: a reviewer cannot edit');
    await demo.as.reviewer.post(`/api/derivations/${id}/sign-offs`, { stepId: steps[0] });
    const before = await review(id);
    const reviewer = connectClient(server.url, id, { cookie: demo.cookies.reviewer });
    clients.push(reviewer);
    await reviewer.synced();
    appendToParagraph(reviewer.doc, steps[0]!, ' EDITED BY REVIEWER');
    await eventually(() => server.output().includes('dropped an update'), 'the server to drop the update');
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(await review(id)).toEqual(before);
  });

  test('a sign-off of a removed step is cleared, saying so', async () => {
    const { id, client, steps } = await derivationWithParagraphs('Sign-offs: removed');
    await demo.as.reviewer.post(`/api/derivations/${id}/sign-offs`, { stepId: steps[2] });
    removeStep(client.doc, steps[2]!);
    await reviewUntil(id, (v) => v.steps.length === 2, 'the removal');
    const deadline = Date.now() + 10_000;
    let events: History['events'] = [];
    while (Date.now() < deadline) {
      events = (await history(id, steps[2]!)).events;
      if (events.some((e) => e.kind === 'sign-off-cleared')) break;
      await new Promise((resolve) => setTimeout(resolve, 50));
    }
    expect(events[0]?.detail).toBe(`the sign-off by ${demoAccount('reviewer').name} was cleared: the step was removed from the derivation`);
  });
});

describe('mail about claims that turned', () => {
  test('claims that held and now fail after edits reach the authors in one mail listing each of them', async () => {
    const id = await newDerivation('Turned claims: the square');
    const client = await authorClient(id);
    const square = randomUUID();
    const cube = randomUUID();
    const steady = randomUUID();
    appendSteps(client.doc, [
      // Binomial expansions (common practice): both hold as written.
      withStepId(claimBlockNode({ kind: 'identity', id: 'square', lhs: '(1+x)^2', rhs: '1 + 2*x + x^2' }, { flow: 'none' }), square),
      withStepId(claimBlockNode({ kind: 'identity', id: 'cube', lhs: '(1+x)^3', rhs: '1 + 3*x + 3*x^2 + x^3' }, { flow: 'none' }), cube),
      withStepId(claimBlockNode({ kind: 'identity', id: 'steady', lhs: 'x*(1+x)', rhs: 'x + x^2' }, { flow: 'none' }), steady),
    ]);
    const checks = async () => (await demo.as.author.get<{ claims: { claimId: string; status: string }[] }>(`/api/derivations/${id}/checks`)).body.claims;
    for (let i = 0; i < 300; i++) {
      const claims = await checks();
      if (claims.length === 3 && claims.every((c) => c.status === 'holds')) break;
      await new Promise((resolve) => setTimeout(resolve, 100));
    }
    expect((await checks()).map((c) => c.status)).toEqual(['holds', 'holds', 'holds']);

    const lead = demoAccount('lead').email;
    const author = demoAccount('author').email;
    const before = await readMailbox(server.url);
    // Two wrong signs, a moment apart (each its own check run), within one mail window.
    setField(client.doc, square, 'rhs', '1 - 2*x + x^2');
    for (let i = 0; i < 100 && !(await checks()).some((c) => c.claimId === 'square' && c.status === 'fails'); i++) {
      await new Promise((resolve) => setTimeout(resolve, 100));
    }
    setField(client.doc, cube, 'rhs', '1 + 3*x - 3*x^2 + x^3');

    const mail = await waitForMail(server.url, { to: author, subject: /claims that held now fail in "Turned claims: the square"/, notIn: before, timeoutMs: 30_000 });
    expect(mail.subject).toBe('2 claims that held now fail in "Turned claims: the square"');
    expect(mail.text).toMatch(/- square \(identity\): fails/);
    expect(mail.text).toMatch(/- cube \(identity\): fails/);
    expect(mail.text).not.toContain('steady');
    expect(mail.text).toContain(`after edits by ${demoAccount('author').name}`);
    expect(linkIn(mail, `/derivations/${id}`)).toBe(`${server.url}/derivations/${id}?step=${square}`);
    // Only the derivation's authors are mailed: the lead wrote nothing in this one.
    const toLead = (await readMailbox(server.url, { to: lead })).filter((m) => !before.some((b) => b.id === m.id) && m.subject.includes('Turned claims'));
    expect(toLead).toEqual([]);

    // One mail for the batch: nothing more arrives after the window.
    await new Promise((resolve) => setTimeout(resolve, FAILING_MAIL_WINDOW_MS + 500));
    const turnedMails = (await readMailbox(server.url, { to: author })).filter(
      (m) => !before.some((b) => b.id === m.id) && m.subject.includes('now fail in "Turned claims: the square"'),
    );
    expect(turnedMails).toHaveLength(1);
  });

  test('a claim that fails and holds again before the mail leaves is not mailed', async () => {
    const id = await newDerivation('Turned claims: put right in time');
    const client = await authorClient(id);
    const square = randomUUID();
    appendSteps(client.doc, [withStepId(claimBlockNode({ kind: 'identity', id: 'square', lhs: '(1+x)^2', rhs: '1 + 2*x + x^2' }, { flow: 'none' }), square)]);
    const status = async () => (await demo.as.author.get<{ claims: { status: string }[] }>(`/api/derivations/${id}/checks`)).body.claims[0]?.status;
    for (let i = 0; i < 300 && (await status()) !== 'holds'; i++) await new Promise((resolve) => setTimeout(resolve, 100));
    const before = await readMailbox(server.url);
    setField(client.doc, square, 'rhs', '1 - 2*x + x^2');
    for (let i = 0; i < 100 && (await status()) !== 'fails'; i++) await new Promise((resolve) => setTimeout(resolve, 100));
    expect(await status()).toBe('fails');
    setField(client.doc, square, 'rhs', '1 + 2*x + x^2');
    for (let i = 0; i < 100 && (await status()) !== 'holds'; i++) await new Promise((resolve) => setTimeout(resolve, 100));
    await new Promise((resolve) => setTimeout(resolve, FAILING_MAIL_WINDOW_MS + 1_000));
    const after = (await readMailbox(server.url)).filter((m) => !before.some((b) => b.id === m.id) && m.subject.includes('put right in time'));
    expect(after).toEqual([]);
  });
});

describe('the demo data', () => {
  test('the demo derivation has an open remark thread with a reply, a resolved one, and a sign-off of a claim that holds', async () => {
    const view = await reviewUntil(demo.derivationId, (v) => v.threads.length >= 2 && v.steps.some((s) => s.signOffs.length > 0), 'the demo review', 60_000);
    const open = view.threads.find((t) => !t.resolved);
    const resolved = view.threads.find((t) => t.resolved);
    expect(open?.entries.map((e) => e.by.name)).toEqual([demoAccount('reviewer').name, demoAccount('author').name]);
    expect(resolved?.resolved?.by.name).toBe(demoAccount('author').name);
    const signed = view.steps.find((s) => s.signOffs.length > 0)!;
    expect(signed.type).toBe('claimBlock');
    expect(signed.signOffs[0]?.by.name).toBe(demoAccount('reviewer').name);
    const checks = await demo.as.reviewer.get<{ claims: { stepId: string; status: string }[] }>(`/api/derivations/${demo.derivationId}/checks`);
    expect(checks.body.claims.find((c) => c.stepId === signed.stepId)?.status).toBe('holds');
  });
});
