// The server re-checks a derivation's claims in the background after edits: the stored verdicts,
// the holds / fails counts of the group's derivations table, claims that change, vanish or are
// written wrongly, and who may read or ask for a check. A real server, real sockets, real PGlite.
//
// The flow is the O(n) model's two-loop beta function, beta(g) = -eps g + (n+8)/3 g^2 - (3n+14)/3 g^3,
// with the fixed point g* = 3 eps/(n+8) + 9(3n+14)/(n+8)^3 eps^2 (Kleinert and Schulte-Frohlinde,
// Critical Properties of phi^4-Theories, 2001; REFERENCES.md, from memory), here at n = 0.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { claimBlockNode, flowBlockNode } from '../../flow/document';
import { demoSessions, startServer, type DemoSessions, type StartedServer } from '../helpers';
import { appendBlocks, removeBlock, setField, setRowValue } from './checksDocument';
import { connectClient, type CollabClient } from './collabClients';

interface ChecksAnswer {
  checkedAt: string | null;
  pending: boolean;
  summary: { holds: number; fails: number; inconclusive: number; invalid: number };
  claims: { stepId: string; claimId: string; kind: string; status: string; previousStatus: string | null; position: number; result: { message: string; measured: unknown } }[];
}

interface TableRow {
  id: string;
  claimsHolding: number;
  claimsFailing: number;
  claimsCheckedAt: string | null;
}

let server: StartedServer;
let demo: DemoSessions;
const clients: CollabClient[] = [];

const onFlow = {
  couplings: ['g'],
  parameters: { n: 0, eps: 0.1 },
  convention: 'uv' as const,
  beta: { g: '-eps*g + (n+8)/3*g^2 - (3*n+14)/3*g^3' },
  rates: { t: '2 - ((n+2)/3*g - 5*(n+2)/18*g^2)' },
};

const seriesClaim = { id: 'fixed-point-eps2', kind: 'fixed-point' as const, near: { g: '3*eps/(n+8)' }, value: { g: '3*eps/(n+8) + 9*(3*n+14)/(n+8)^3*eps^2' }, order: 2 };
// The one-loop coefficient written wrongly: 3/(n+9) instead of 3/(n+8).
const wrongClaim = { id: 'fixed-point-eps1', kind: 'fixed-point' as const, near: { g: '3*eps/(n+8)' }, value: { g: '3*eps/(n+9)' }, order: 1 };

beforeAll(async () => {
  server = await startServer({ demo: true, env: { MARGINALIA_CHECK_DELAY_MS: '200', MARGINALIA_CHECK_MAX_DELAY_MS: '2000' } });
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

async function authorClient(derivationId: string): Promise<CollabClient> {
  const client = connectClient(server.url, derivationId, { cookie: demo.cookies.author });
  clients.push(client);
  await client.synced();
  return client;
}

async function checks(derivationId: string): Promise<ChecksAnswer> {
  const answer = await demo.as.reader.get<ChecksAnswer>(`/api/derivations/${derivationId}/checks`);
  expect(answer.status).toBe(200);
  return answer.body;
}

/** Polls the stored checks until they satisfy the condition (the re-check runs a moment after edits). */
async function checksWhen(derivationId: string, ready: (answer: ChecksAnswer) => boolean, what: string): Promise<ChecksAnswer> {
  const deadline = Date.now() + 45_000;
  for (;;) {
    const answer = await checks(derivationId);
    if (!answer.pending && ready(answer)) return answer;
    if (Date.now() > deadline) throw new Error(`Timed out waiting for ${what}; last answer: ${JSON.stringify(answer.summary)} ${answer.claims.map((c) => `${c.claimId}:${c.status}`).join(' ')}`);
    await new Promise((resolve) => setTimeout(resolve, 150));
  }
}

async function tableRow(derivationId: string): Promise<TableRow> {
  const list = await demo.as.reader.get<{ derivations: TableRow[] }>(`/api/groups/${demo.groupId}/derivations`);
  expect(list.status).toBe(200);
  const row = list.body.derivations.find((d) => d.id === derivationId);
  if (!row) throw new Error('derivation missing from the table');
  return row;
}

const statusOf = (answer: ChecksAnswer, claimId: string) => answer.claims.find((c) => c.claimId === claimId)?.status;

describe('background re-check after edits', () => {
  const flowStep = randomUUID();
  const seriesStep = randomUUID();
  const wrongStep = randomUUID();
  let derivationId: string;
  let client: CollabClient;

  test('a new derivation is "not checked" until it has claims checked', async () => {
    derivationId = await newDerivation(`Background checks ${randomUUID().slice(0, 8)}`);
    const row = await tableRow(derivationId);
    expect(row.claimsCheckedAt).toBeNull();
    const answer = await checks(derivationId);
    expect(answer.claims).toEqual([]);
  });

  test('claims written over the socket are checked and the table shows 1 holds, 1 fails', async () => {
    client = await authorClient(derivationId);
    appendBlocks(client.doc, [
      { type: 'paragraph', attrs: { stepId: randomUUID() }, content: [{ type: 'text', text: 'The chain in four dimensions.' }] },
      flowBlockNode(onFlow, { stepId: flowStep, name: 'two-loop O(n) flow at n = 0' }),
      claimBlockNode(seriesClaim, { stepId: seriesStep }),
      claimBlockNode(wrongClaim, { stepId: wrongStep }),
    ]);
    const answer = await checksWhen(derivationId, (a) => a.claims.length === 2, 'both claims checked');
    expect(statusOf(answer, 'fixed-point-eps2')).toBe('holds');
    expect(statusOf(answer, 'fixed-point-eps1')).toBe('fails');
    expect(answer.claims.map((c) => c.claimId)).toEqual(['fixed-point-eps2', 'fixed-point-eps1']);
    expect(answer.summary).toEqual({ holds: 1, fails: 1, inconclusive: 0, invalid: 0 });
    const row = await tableRow(derivationId);
    expect([row.claimsHolding, row.claimsFailing]).toEqual([1, 1]);
    expect(row.claimsCheckedAt).not.toBeNull();
  });

  test('correcting the wrong coefficient turns the claim from fails to holds (2 hold, 0 fail)', async () => {
    setField(client.doc, wrongStep, 'value', 'g = 3*eps/(n+8)');
    const answer = await checksWhen(derivationId, (a) => statusOf(a, 'fixed-point-eps1') === 'holds', 'the corrected claim to hold');
    const corrected = answer.claims.find((c) => c.claimId === 'fixed-point-eps1')!;
    expect(corrected.previousStatus).toBe('fails');
    expect(answer.summary.holds).toBe(2);
    const row = await tableRow(derivationId);
    expect([row.claimsHolding, row.claimsFailing]).toEqual([2, 0]);
  });

  test('a claim that cannot be read as written is stored as invalid input, naming the field', async () => {
    setField(client.doc, seriesStep, 'order', 'two');
    const answer = await checksWhen(derivationId, (a) => statusOf(a, 'fixed-point-eps2') === 'invalid', 'the unreadable claim to be invalid');
    const invalid = answer.claims.find((c) => c.claimId === 'fixed-point-eps2')!;
    expect(invalid.result.message).toMatch(/Series order/);
    expect(answer.summary).toEqual({ holds: 1, fails: 0, inconclusive: 0, invalid: 1 });
    setField(client.doc, seriesStep, 'order', '2');
    await checksWhen(derivationId, (a) => statusOf(a, 'fixed-point-eps2') === 'holds', 'the repaired claim to hold again');
  });

  test('a flow with an unknown symbol makes its claims invalid, and the message names the symbol', async () => {
    setRowValue(client.doc, flowStep, 'beta', 0, onFlow.beta.g.replace('(n+8)/3', '(m+8)/3'));
    const answer = await checksWhen(derivationId, (a) => a.claims.every((c) => c.status === 'invalid'), 'every claim of the broken flow to be invalid');
    for (const claim of answer.claims) expect(claim.result.message).toMatch(/\bm\b/);
    const row = await tableRow(derivationId);
    expect([row.claimsHolding, row.claimsFailing]).toEqual([0, 0]);
    setRowValue(client.doc, flowStep, 'beta', 0, onFlow.beta.g);
    await checksWhen(derivationId, (a) => a.summary.holds === 2, 'both claims to hold again');
  });

  test('a removed claim block leaves the stored checks and the counts', async () => {
    removeBlock(client.doc, wrongStep);
    const answer = await checksWhen(derivationId, (a) => a.claims.length === 1, 'the removed claim to leave the checks');
    expect(answer.claims[0]!.claimId).toBe('fixed-point-eps2');
    const row = await tableRow(derivationId);
    expect([row.claimsHolding, row.claimsFailing]).toEqual([1, 0]);
  });
});

describe('asking for a check', () => {
  test('a reviewer may ask for a check now and gets the new verdicts back', async () => {
    const derivationId = await newDerivation(`Checked on request ${randomUUID().slice(0, 8)}`);
    const client = await authorClient(derivationId);
    appendBlocks(client.doc, [
      flowBlockNode(onFlow, { stepId: randomUUID() }),
      // ln(1 + x) = x - x^2/2 + x^3/3 - ... (any handbook): the x^3 coefficient is 1/3.
      claimBlockNode({ id: 'log-series', kind: 'coefficient', of: 'log(1 + x)', variable: 'x', power: 3, value: '1/3' }, { stepId: randomUUID(), flow: 'none' }),
      // Gamma(1 + x) = x Gamma(x) (NIST DLMF 5.5.1).
      claimBlockNode({ id: 'gamma-recurrence', kind: 'identity', lhs: 'gamma(1 + x)', rhs: 'x * gamma(x)' }, { stepId: randomUUID(), flow: 'none' }),
    ]);
    const background = await checksWhen(derivationId, (a) => a.claims.length === 2, 'the background check');
    const asked = await demo.as.reviewer.post<ChecksAnswer>(`/api/derivations/${derivationId}/checks`);
    expect(asked.status).toBe(200);
    expect(Date.parse(asked.body.checkedAt!)).toBeGreaterThan(Date.parse(background.checkedAt!));
    expect(asked.body.claims.map((c) => c.claimId)).toEqual(['log-series', 'gamma-recurrence']);
    expect(statusOf(asked.body, 'log-series')).toBe('holds');
    expect(statusOf(asked.body, 'gamma-recurrence')).toBe('holds');
    expect(asked.body.pending).toBe(false);
  });

  test('a reader may read the verdicts but may not ask for a stored check', async () => {
    const refused = await demo.as.reader.post(`/api/derivations/${demo.derivationId}/checks`);
    expect(refused.status).toBe(403);
    const read = await demo.as.reader.get(`/api/derivations/${demo.derivationId}/checks`);
    expect(read.status).toBe(200);
  });

  test('someone outside the group gets no verdicts', async () => {
    const anonymous = await fetch(`${server.url}/api/derivations/${demo.derivationId}/checks`);
    expect(anonymous.status).toBe(401);
  });
});
