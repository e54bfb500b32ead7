// The demo data's locked version: once the demo derivation has claims (the demo body's, or the ones
// this test writes), a demo start saves version 1 without the claims that fail, locks it through the real lock (every claim re-checked on the
// server) and prints a share link to it beside the demo accounts; the link opens it without signing in.
//
// Flow and claims: the O(n) two-loop fixed point g* = 3 eps/(n+8) + 9(3n+14)/(n+8)^3 eps^2 (Kleinert
// and Schulte-Frohlinde 2001; REFERENCES.md, from memory), at n = 0; the failing claim has 3/(n+9).
import { randomUUID } from 'node:crypto';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, expect, test } from 'vitest';
import { claimBlockNode, flowBlockNode } from '../../flow/document';
import { api, demoSessions, startServer, type StartedServer } from '../helpers';
import { appendBlocks } from './checksDocument';
import { connectClient } from './collabClients';

const dataDir = mkdtempSync(path.join(tmpdir(), 'marginalia-demo-lock-'));
let server: StartedServer | undefined;
afterAll(async () => {
  await server?.stop();
});

test('a demo start locks the demo derivation and prints a share link that opens it', async () => {
  server = await startServer({ demo: true, dataDir });
  const demo = await demoSessions(server.url);
  const client = connectClient(server.url, demo.derivationId, { cookie: demo.cookies.author });
  await client.synced();
  const flow = { couplings: ['g'], parameters: { n: 0, eps: 0.1 }, convention: 'uv' as const, beta: { g: '-eps*g + (n+8)/3*g^2 - (3*n+14)/3*g^3' } };
  appendBlocks(client.doc, [
    flowBlockNode(flow, { stepId: randomUUID(), name: 'chain flow' }),
    claimBlockNode({ id: 'fixed-point-eps2', kind: 'fixed-point', near: { g: '3*eps/(n+8)' }, value: { g: '3*eps/(n+8) + 9*(3*n+14)/(n+8)^3*eps^2' }, order: 2 }, { stepId: randomUUID() }),
    claimBlockNode({ id: 'deliberately-wrong', kind: 'fixed-point', near: { g: '3*eps/(n+8)' }, value: { g: '3*eps/(n+9)' }, order: 1 }, { stepId: randomUUID() }),
  ]);
  for (const deadline = Date.now() + 30_000; ; ) {
    const checks = await demo.as.reader.get<{ claims: { claimId: string; status: string }[]; pending: boolean }>(`/api/derivations/${demo.derivationId}/checks`);
    if (!checks.body.pending && checks.body.claims.some((c) => c.claimId === 'deliberately-wrong' && c.status === 'fails')) break;
    if (Date.now() > deadline) throw new Error('the claims never reached the server');
    await new Promise((resolve) => setTimeout(resolve, 200));
  }
  client.destroy();
  await server.stop();

  server = await startServer({ demo: true, dataDir });
  const line = server.output().split('\n').find((l) => l.startsWith('Share link to locked version 1'));
  expect(line).toBeDefined();
  // Printed with the demo accounts, before the listening line.
  expect(server.output().indexOf('Demo accounts')).toBeLessThan(server.output().indexOf(line!));
  const url = /(http:\/\/\S+\/shared\/[A-Za-z0-9_-]{43})/.exec(line!)![1]!;
  const token = url.split('/').pop()!;
  const shared = await api(server.url).get<{ version: { number: number; locked: { sha256: string } | null; checks: { claims: { claimId: string; status: string }[] } } }>(`/api/shared/${token}`);
  expect(shared.status).toBe(200);
  expect(shared.body.version.locked?.sha256).toMatch(/^[0-9a-f]{64}$/);
  // Every claim of the locked version holds; the deliberately failing one was left out of it.
  const locked = shared.body.version.checks.claims;
  expect(locked.length).toBeGreaterThan(0);
  expect(locked.every((c) => c.status === 'holds')).toBe(true);
  expect(locked.map((c) => c.claimId)).not.toContain('deliberately-wrong');
  // The working copy keeps its deliberately failing claim.
  const again = await demoSessions(server.url);
  const checks = await again.as.reader.get<{ claims: { claimId: string }[] }>(`/api/derivations/${again.derivationId}/checks`);
  expect(checks.body.claims.map((c) => c.claimId)).toContain('deliberately-wrong');
  const table = await again.as.reader.get<{ derivations: { id: string; lockedVersions: number }[] }>(`/api/groups/${again.groupId}/derivations`);
  expect(table.body.derivations.find((d) => d.id === again.derivationId)?.lockedVersions).toBe(1);
});
