// Named versions, the lead's lock, share links and exports through the real routes, the real
// socket and the real PGlite: a lock refused while a claim fails and accepted after the fix, the
// check report and its SHA-256 computed again from the downloaded bytes, every refusal (locking
// twice, changing a locked version by API or socket, roles, share links expired, revoked, guessed
// or altered) with the stored state compared before and after.
//
// The flow is the O(n) model's two-loop beta function beta(g) = -eps g + (n+8)/3 g^2 - (3n+14)/3 g^3
// with the fixed point g* = 3 eps/(n+8) + 9(3n+14)/(n+8)^3 eps^2 (Kleinert and Schulte-Frohlinde,
// Critical Properties of phi^4-Theories, 2001; REFERENCES.md, from memory), here at n = 0, eps = 0.1.
import { execFileSync, spawnSync } from 'node:child_process';
import { createHash, randomUUID } from 'node:crypto';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { claimBlockNode, flowBlockNode } from '../../flow/document';
import { api, demoAccount, demoSessions, repoRoot, startServer, waitForMail, readMailbox, type DemoSessions, type StartedServer } from '../helpers';
import { appendBlocks, setField } from './checksDocument';
import { connectClient, upgradeStatus, type CollabClient } from './collabClients';

interface Summary {
  id: string;
  number: number;
  name: string;
  createdBy: { name: string } | null;
  createdAt: string;
  summary: { holds: number; fails: number; inconclusive: number; invalid: number; claims: number };
  locked: { lockedAt: string; lockedBy: { name: string } | null; sha256: string } | null;
}
interface Detail extends Summary {
  checks: { claims: { claimId: string; status: string }[] };
  contentSha256: string;
}
interface Report {
  format: string;
  software: Record<string, string>;
  solver: { timeLimitMsPerClaim: number };
  summary: { holds: number; claims: number };
  claims: { id: string; kind: string; status: string; input: Record<string, unknown> | null; result: { method: string; settings: Record<string, unknown>; measured: unknown; expected: unknown; tolerance: number | null } }[];
}

let server: StartedServer;
let demo: DemoSessions;
const clients: CollabClient[] = [];

const onFlow = {
  couplings: ['g'],
  parameters: { n: 0, eps: 0.1 },
  convention: 'uv' as const,
  beta: { g: '-eps*g + (n+8)/3*g^2 - (3*n+14)/3*g^3' },
};
const seriesClaim = { id: 'fixed-point-eps2', kind: 'fixed-point' as const, near: { g: '3*eps/(n+8)' }, value: { g: '3*eps/(n+8) + 9*(3*n+14)/(n+8)^3*eps^2' }, order: 2 };
// The one-loop coefficient written wrongly: 3/(n+9) instead of 3/(n+8).
const wrongClaim = { id: 'fixed-point-eps1', kind: 'fixed-point' as const, near: { g: '3*eps/(n+8)' }, value: { g: '3*eps/(n+9)' }, order: 1 };

beforeAll(async () => {
  server = await startServer({
    demo: true,
    env: { MARGINALIA_CHECK_DELAY_MS: '200', MARGINALIA_CHECK_MAX_DELAY_MS: '2000', MARGINALIA_SHARE_DAY_SECONDS: '2' },
  });
  demo = await demoSessions(server.url);
});

afterAll(async () => {
  for (const client of clients) client.destroy();
  await server?.stop();
});

const bytes = async (path: string, cookie?: string) => {
  const response = await fetch(`${server.url}${path}`, { headers: cookie ? { cookie } : {} });
  return { status: response.status, bytes: new Uint8Array(await response.arrayBuffer()), type: response.headers.get('content-type') ?? '' };
};

/** The lock's SHA-256 computed here from the documented format, independently of the server's code. */
function documentedLockHash(snapshot: Uint8Array, report: Uint8Array): string {
  return createHash('sha256')
    .update(Buffer.from(`marginalia locked version v1\nsnapshot ${snapshot.byteLength}\n`))
    .update(snapshot)
    .update(Buffer.from(`\nreport ${report.byteLength}\n`))
    .update(report)
    .digest('hex');
}

async function versions(derivationId: string): Promise<Summary[]> {
  const answer = await demo.as.reader.get<{ versions: Summary[] }>(`/api/derivations/${derivationId}/versions`);
  expect(answer.status).toBe(200);
  return answer.body.versions;
}

async function lockedCount(derivationId: string): Promise<number> {
  const list = await demo.as.reader.get<{ derivations: { id: string; lockedVersions: number }[] }>(`/api/groups/${demo.groupId}/derivations`);
  return list.body.derivations.find((d) => d.id === derivationId)!.lockedVersions;
}

/** What the database holds for a derivation's versions, as the API shows it (for "nothing changed"). */
async function storedState(derivationId: string) {
  const list = await versions(derivationId);
  const details = await Promise.all(list.map((v) => demo.as.reader.get<Detail>(`/api/derivations/${derivationId}/versions/${v.id}`)));
  const snapshots = await Promise.all(list.map((v) => bytes(`/api/derivations/${derivationId}/versions/${v.id}/snapshot`, demo.cookies.reader)));
  return {
    list,
    details: details.map((d) => d.body),
    snapshots: snapshots.map((s) => createHash('sha256').update(s.bytes).digest('hex')),
    lockedCount: await lockedCount(derivationId),
  };
}

async function waitForClaims(derivationId: string, count: number): Promise<void> {
  const deadline = Date.now() + 45_000;
  for (;;) {
    const answer = await demo.as.reader.get<{ pending: boolean; claims: unknown[] }>(`/api/derivations/${derivationId}/checks`);
    if (!answer.body.pending && answer.body.claims.length === count) return;
    if (Date.now() > deadline) throw new Error('the server never saw the claims');
    await new Promise((resolve) => setTimeout(resolve, 150));
  }
}

describe('the lead locks a version', () => {
  const flowStep = randomUUID();
  const seriesStep = randomUUID();
  const wrongStep = randomUUID();
  let derivationId: string;
  let client: CollabClient;
  let locked: Detail;

  beforeAll(async () => {
    const created = await demo.as.author.post<{ id: string }>(`/api/groups/${demo.groupId}/derivations`, { title: `Lock ${randomUUID().slice(0, 8)}` });
    derivationId = created.body.id;
    client = connectClient(server.url, derivationId, { cookie: demo.cookies.author });
    clients.push(client);
    await client.synced();
    appendBlocks(client.doc, [
      { type: 'paragraph', attrs: { stepId: randomUUID() }, content: [{ type: 'text', text: 'The chain at two loops.' }] },
      flowBlockNode(onFlow, { stepId: flowStep, name: 'two-loop O(n) flow at n = 0' }),
      claimBlockNode(seriesClaim, { stepId: seriesStep }),
      claimBlockNode(wrongClaim, { stepId: wrongStep }),
    ]);
    await waitForClaims(derivationId, 2);
  });

  test('an author saves a named version; the history lists it with who, when and the check summary', async () => {
    const saved = await demo.as.author.post<Detail>(`/api/derivations/${derivationId}/versions`, { name: 'Before the fix' });
    expect(saved.status).toBe(201);
    expect(saved.body.number).toBe(1);
    expect(saved.body.locked).toBeNull();
    const [listed] = await versions(derivationId);
    expect(listed).toMatchObject({ number: 1, name: 'Before the fix', createdBy: { name: demoAccount('author').name } });
    expect(listed!.summary).toMatchObject({ holds: 1, fails: 1, claims: 2 });
    expect(saved.body.checks.claims.map((c) => [c.claimId, c.status])).toEqual([
      ['fixed-point-eps2', 'holds'],
      ['fixed-point-eps1', 'fails'],
    ]);
  });

  test('a version without a name is refused with the field named', async () => {
    const answer = await demo.as.author.post<{ error: string; field: string }>(`/api/derivations/${derivationId}/versions`, { name: '  ' });
    expect(answer.status).toBe(400);
    expect(answer.body.field).toBe('name');
  });

  test('the lock is refused while a claim fails: it names the claim and stores nothing', async () => {
    const before = await storedState(derivationId);
    const answer = await demo.as.lead.post<{ error: string; claims: { claimId: string; status: string; message: string }[] }>(`/api/derivations/${derivationId}/lock`, { name: 'Two loops' });
    expect(answer.status).toBe(409);
    expect(answer.body.error).toMatch(/refused: 1 of 2 claims does not hold/);
    expect(answer.body.claims).toHaveLength(1);
    expect(answer.body.claims[0]).toMatchObject({ claimId: 'fixed-point-eps1', status: 'fails' });
    expect(answer.body.claims[0]!.message.length).toBeGreaterThan(0);
    expect(await storedState(derivationId)).toEqual(before);
    expect(before.lockedCount).toBe(0);
  });

  test('a saved version with a failing claim cannot be locked either', async () => {
    const [saved] = await versions(derivationId);
    const before = await storedState(derivationId);
    const answer = await demo.as.lead.post<{ claims: { claimId: string }[] }>(`/api/derivations/${derivationId}/versions/${saved!.id}/lock`);
    expect(answer.status).toBe(409);
    expect(answer.body.claims.map((c) => c.claimId)).toEqual(['fixed-point-eps1']);
    expect(await storedState(derivationId)).toEqual(before);
  });

  test('a reviewer and an author may not lock, and nothing is stored', async () => {
    const before = await storedState(derivationId);
    for (const role of ['reviewer', 'author', 'reader'] as const) {
      const answer = await demo.as[role].post<{ error: string }>(`/api/derivations/${derivationId}/lock`, {});
      expect(answer.status).toBe(403);
      expect(answer.body.error).toBe(`As ${role} you may not lock versions.`);
    }
    const reader = await demo.as.reader.post(`/api/derivations/${derivationId}/versions`, { name: 'mine' });
    expect(reader.status).toBe(403);
    expect(await storedState(derivationId)).toEqual(before);
  });

  test('after the fix the lock succeeds, and the group is told by mail', async () => {
    setField(client.doc, wrongStep, 'value', 'g = 3*eps/(n+8)');
    await new Promise((resolve) => setTimeout(resolve, 300));
    const readerMail = await readMailbox(server.url, { to: demoAccount('reader').email });
    const answer = await demo.as.lead.post<Detail>(`/api/derivations/${derivationId}/lock`, { name: 'Two loops' });
    expect(answer.status).toBe(200);
    locked = answer.body;
    expect(locked.number).toBe(2);
    expect(locked.locked).toMatchObject({ lockedBy: { name: demoAccount('lead').name } });
    expect(locked.locked!.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(locked.summary).toMatchObject({ holds: 2, fails: 0, claims: 2 });
    expect(await lockedCount(derivationId)).toBe(1);

    const mail = await waitForMail(server.url, { to: demoAccount('reader').email, subject: /locked version 2/, notIn: readerMail });
    expect(mail.text).toContain(locked.locked!.sha256);
    expect(mail.text).toContain(`/derivations/${derivationId}/versions/${locked.id}`);
  });

  test('the check report lists each claim with its result, method, settings and the software versions', async () => {
    const report = await bytes(`/api/derivations/${derivationId}/versions/${locked.id}/report.json`, demo.cookies.reader);
    expect(report.status).toBe(200);
    const parsed = JSON.parse(Buffer.from(report.bytes).toString('utf8')) as Report;
    const installed = (name: string) => (JSON.parse(readFileSync(path.join(repoRoot, 'node_modules', name, 'package.json'), 'utf8')) as { version: string }).version;
    expect(parsed.format).toBe('marginalia check report v1');
    expect(parsed.software).toMatchObject({ mathjs: installed('mathjs'), odex: installed('odex') });
    expect(parsed.software.flow).toMatch(/\d+\.\d+\.\d+/);
    expect(parsed.solver.timeLimitMsPerClaim).toBeGreaterThan(0);
    expect(parsed.summary).toMatchObject({ holds: 2, claims: 2 });
    for (const claim of parsed.claims) {
      expect(claim.status).toBe('holds');
      expect(claim.result.method.length).toBeGreaterThan(0);
      expect(Object.keys(claim.result.settings).length).toBeGreaterThan(0);
      expect(claim.input).not.toBeNull();
    }
    // The located fixed point against the published series at n = 0, eps = 0.1 (Kleinert and
    // Schulte-Frohlinde 2001, from memory): 3 eps/8 + 126 eps^2/512 = 0.039961; the eps^3 term is
    // below 1e-3 here.
    const series = parsed.claims.find((c) => c.id === 'fixed-point-eps2')!;
    expect((series.result.measured as { g: number }).g).toBeCloseTo(0.3 / 8 + (126 / 512) * 0.01, 3);
  });

  test('the SHA-256 is computed again from the downloaded snapshot and report as documented', async () => {
    const snapshot = await bytes(`/api/derivations/${derivationId}/versions/${locked.id}/snapshot`, demo.cookies.reviewer);
    const report = await bytes(`/api/derivations/${derivationId}/versions/${locked.id}/report.json`, demo.cookies.reviewer);
    expect(snapshot.type).toBe('application/octet-stream');
    expect(documentedLockHash(snapshot.bytes, report.bytes)).toBe(locked.locked!.sha256);
    // The shell recipe of the documentation gives the same.
    const folder = mkdtempSync(path.join(tmpdir(), 'marginalia-hash-'));
    writeFileSync(path.join(folder, 'snapshot.yjs'), snapshot.bytes);
    writeFileSync(path.join(folder, 'report.json'), report.bytes);
    const recipe = "{ printf 'marginalia locked version v1\\nsnapshot %d\\n' \"$(stat -c %s snapshot.yjs)\"; cat snapshot.yjs; printf '\\nreport %d\\n' \"$(stat -c %s report.json)\"; cat report.json; } | sha256sum";
    const printed = execFileSync('bash', ['-c', recipe], { cwd: folder, encoding: 'utf8' });
    expect(printed.split(' ')[0]).toBe(locked.locked!.sha256);
  });

  test('locking the same content again is refused with 409 and nothing is added', async () => {
    const before = await storedState(derivationId);
    const answer = await demo.as.lead.post<{ error: string }>(`/api/derivations/${derivationId}/lock`, {});
    expect(answer.status).toBe(409);
    expect(answer.body.error).toMatch(/already locked as version 2/);
    expect(await storedState(derivationId)).toEqual(before);
  });

  test('a version already locked cannot be locked again', async () => {
    const before = await storedState(derivationId);
    const answer = await demo.as.lead.post<{ error: string }>(`/api/derivations/${derivationId}/versions/${locked.id}/lock`);
    expect(answer.status).toBe(409);
    expect(answer.body.error).toMatch(/Version 2 is already locked/);
    expect(await storedState(derivationId)).toEqual(before);
  });

  test('the API answers 409 to renaming or removing a locked version, and it stays as it was', async () => {
    const before = await storedState(derivationId);
    const renamed = await demo.as.lead.patch<{ error: string }>(`/api/derivations/${derivationId}/versions/${locked.id}`, { name: 'Renamed' });
    expect(renamed.status).toBe(409);
    expect(renamed.body.error).toMatch(/locked/);
    const removed = await demo.as.author.delete<{ error: string }>(`/api/derivations/${derivationId}/versions/${locked.id}`);
    expect(removed.status).toBe(409);
    const deleted = await demo.as.author.delete<{ error: string }>(`/api/derivations/${derivationId}`);
    expect(deleted.status).toBe(409);
    expect(await storedState(derivationId)).toEqual(before);
  });

  test('edits over the socket go to the working copy only: the locked version stays byte for byte', async () => {
    const before = await storedState(derivationId);
    appendBlocks(client.doc, [{ type: 'paragraph', attrs: { stepId: randomUUID() }, content: [{ type: 'text', text: 'Written after the lock.' }] }]);
    const compared = async () =>
      (await demo.as.reader.get<{ steps: { change: string; after: string | null }[] }>(`/api/derivations/${derivationId}/versions/compare?from=${locked.id}&to=working`)).body;
    const deadline = Date.now() + 15_000;
    while (!(await compared()).steps.some((s) => s.change === 'added' && s.after === 'Written after the lock.')) {
      if (Date.now() > deadline) throw new Error('the edit never reached the working copy');
      await new Promise((resolve) => setTimeout(resolve, 150));
    }
    expect(await storedState(derivationId)).toEqual(before);
    // There is no socket to a version: the collaboration server only opens working copies.
    const upgrade = await upgradeStatus(server.url, `/collab/${locked.id}`, { cookie: demo.cookies.lead });
    expect(upgrade.status).toBe(404);
    expect(await storedState(derivationId)).toEqual(before);
  });

  test('comparing two versions marks the changed claim step and calls out its verdict change', async () => {
    const [, first] = await versions(derivationId).then((list) => [list[0], list[list.length - 1]]);
    const answer = await demo.as.reader.get<{
      steps: { change: string; stepId: string; parts?: { value: string; added?: boolean; removed?: boolean }[] }[];
      claims: { claimId: string; before: string | null; after: string | null; verdictChanged: boolean }[];
      counts: { changed: number; verdictsChanged: number };
    }>(`/api/derivations/${derivationId}/versions/compare?from=${first!.id}&to=${locked.id}`);
    expect(answer.status).toBe(200);
    const changed = answer.body.steps.filter((s) => s.change === 'changed');
    expect(changed.map((s) => s.stepId)).toEqual([wrongStep]);
    const parts = changed[0]!.parts!;
    expect(parts.filter((p) => p.removed).map((p) => p.value).join('')).toBe('9');
    expect(parts.filter((p) => p.added).map((p) => p.value).join('')).toBe('8');
    expect(parts.filter((p) => !p.added).map((p) => p.value).join('')).toContain('value: g = 3*eps/(n+9)');
    expect(parts.filter((p) => !p.removed).map((p) => p.value).join('')).toContain('value: g = 3*eps/(n+8)');
    expect(answer.body.claims.filter((c) => c.verdictChanged)).toEqual([{ stepId: wrongStep, claimId: 'fixed-point-eps1', before: 'fails', after: 'holds', verdictChanged: true }]);
    expect(answer.body.counts).toMatchObject({ changed: 1, verdictsChanged: 1 });
  });

  describe('share links', () => {
    let token: string;
    let url: string;

    test('a share link opens the locked version for anyone, signed in or not', async () => {
      const made = await demo.as.lead.post<{ url: string; token: string; link: { state: string } }>(`/api/derivations/${derivationId}/versions/${locked.id}/share-links`, { days: 30, note: 'for the referee' });
      expect(made.status).toBe(201);
      expect(made.body.link.state).toBe('active');
      ({ token, url } = made.body);
      expect(Buffer.from(token, 'base64url').byteLength).toBeGreaterThanOrEqual(16);
      expect(new URL(url).pathname).toBe(`/shared/${token}`);

      const anonymous = api(server.url);
      const opened = await anonymous.get<{ version: Detail }>(`/api/shared/${token}`);
      expect(opened.status).toBe(200);
      expect(opened.body.version.id).toBe(locked.id);
      expect(opened.body.version.locked!.sha256).toBe(locked.locked!.sha256);
      expect(opened.body.version.checks.claims.map((c) => c.status)).toEqual(['holds', 'holds']);
      // The snapshot served is the locked one, not the working copy (which has a paragraph more).
      const shared = await bytes(`/api/shared/${token}/snapshot`);
      const own = await bytes(`/api/derivations/${derivationId}/versions/${locked.id}/snapshot`, demo.cookies.lead);
      expect(Buffer.from(shared.bytes).equals(Buffer.from(own.bytes))).toBe(true);
      const page = await fetch(url);
      expect(page.status).toBe(200);
    });

    test('the token is stored hashed: the lead’s list never shows it', async () => {
      const list = await demo.as.lead.get<{ links: Record<string, unknown>[] }>(`/api/derivations/${derivationId}/versions/${locked.id}/share-links`);
      expect(list.status).toBe(200);
      expect(JSON.stringify(list.body)).not.toContain(token);
      expect(list.body.links[0]).toMatchObject({ note: 'for the referee', state: 'active' });
    });

    test('a guessed or altered token answers 404 with a clear message', async () => {
      const anonymous = api(server.url);
      const altered = token.slice(0, -1) + (token.endsWith('A') ? 'B' : 'A');
      for (const wrong of [altered, Buffer.alloc(32, 7).toString('base64url'), 'short', `${token}x`]) {
        const answer = await anonymous.get<{ error: string }>(`/api/shared/${encodeURIComponent(wrong)}`);
        expect(answer.status).toBe(404);
        expect(answer.body.error).toMatch(/no share link with this address/);
        const file = await bytes(`/api/shared/${encodeURIComponent(wrong)}/report.json`);
        expect(file.status).toBe(404);
      }
      const page = await fetch(`${server.url}/shared/${altered}`);
      expect(page.status).toBe(404);
      expect(await page.text()).toMatch(/no share link with this address/);
    });

    test('a reviewer may not make or revoke share links, and nothing changes', async () => {
      const before = await demo.as.lead.get(`/api/derivations/${derivationId}/versions/${locked.id}/share-links`);
      const made = await demo.as.reviewer.post<{ error: string }>(`/api/derivations/${derivationId}/versions/${locked.id}/share-links`, { days: 3 });
      expect(made.status).toBe(403);
      expect(made.body.error).toBe('As reviewer you may not make share links.');
      const after = await demo.as.lead.get(`/api/derivations/${derivationId}/versions/${locked.id}/share-links`);
      expect(after.body).toEqual(before.body);
    });

    test('an unlocked version cannot be shared', async () => {
      const [, first] = await versions(derivationId).then((list) => [list[0], list[list.length - 1]]);
      const answer = await demo.as.lead.post<{ error: string }>(`/api/derivations/${derivationId}/versions/${first!.id}/share-links`, { days: 3 });
      expect(answer.status).toBe(409);
      expect(answer.body.error).toMatch(/only a locked version can be shared/);
    });

    test('a revoked link answers 410 and says so; revoking twice is refused', async () => {
      const made = await demo.as.lead.post<{ token: string; link: { id: string } }>(`/api/derivations/${derivationId}/versions/${locked.id}/share-links`, { days: 30 });
      expect((await api(server.url).get(`/api/shared/${made.body.token}`)).status).toBe(200);
      const revoked = await demo.as.lead.delete<{ state: string }>(`/api/derivations/${derivationId}/share-links/${made.body.link.id}`);
      expect(revoked.status).toBe(200);
      expect(revoked.body.state).toBe('revoked');
      const answer = await api(server.url).get<{ error: string }>(`/api/shared/${made.body.token}`);
      expect(answer.status).toBe(410);
      expect(answer.body.error).toMatch(/revoked/);
      const page = await fetch(`${server.url}/shared/${made.body.token}`);
      expect(page.status).toBe(410);
      expect(await page.text()).toMatch(/revoked/);
      const again = await demo.as.lead.delete<{ error: string }>(`/api/derivations/${derivationId}/share-links/${made.body.link.id}`);
      expect(again.status).toBe(409);
      // The first link still works.
      expect((await api(server.url).get(`/api/shared/${token}`)).status).toBe(200);
    });

    test('an expired link answers 410 and says so', async () => {
      // A "day" is 2 s on this server (MARGINALIA_SHARE_DAY_SECONDS).
      const made = await demo.as.lead.post<{ token: string; link: { createdAt: string; expiresAt: string } }>(`/api/derivations/${derivationId}/versions/${locked.id}/share-links`, { days: 1 });
      expect(Date.parse(made.body.link.expiresAt) - Date.parse(made.body.link.createdAt)).toBeLessThan(3_000);
      expect((await api(server.url).get(`/api/shared/${made.body.token}`)).status).toBe(200);
      await new Promise((resolve) => setTimeout(resolve, 2_300));
      const answer = await api(server.url).get<{ error: string }>(`/api/shared/${made.body.token}`);
      expect(answer.status).toBe(410);
      expect(answer.body.error).toMatch(/expired/);
      expect((await bytes(`/api/shared/${made.body.token}/snapshot`)).status).toBe(410);
      const page = await fetch(`${server.url}/shared/${made.body.token}`);
      expect(page.status).toBe(410);
    });
  });

  describe('exports', () => {
    test('the LaTeX article holds the text, each claim with its verdict, and the appendix with the report and hash', async () => {
      const tex = await bytes(`/api/derivations/${derivationId}/versions/${locked.id}/article.tex`, demo.cookies.reader);
      expect(tex.status).toBe(200);
      const text = Buffer.from(tex.bytes).toString('utf8');
      expect(text).toMatch(/^% Written by Marginalia/);
      expect(text).toContain('\\begin{document}');
      expect(text).toContain('The chain at two loops.');
      expect(text.match(/\\paragraph\{Claim \\texttt\{fixed-point-eps[12]\} \(fixed point\) \\hfill \\verdictholds\}/g)).toHaveLength(2);
      expect(text).toContain('\\section{Check report}');
      expect(text).toContain(locked.locked!.sha256.match(/.{16}/g)!.join(' '));
      expect(text.trimEnd().endsWith('\\end{document}')).toBe(true);
    });

    const pdflatex = spawnSync('pdflatex', ['--version']).status === 0;
    test.skipIf(!pdflatex)('the LaTeX article compiles with pdflatex', async () => {
      const tex = await bytes(`/api/shared/${(await newShareToken(derivationId, locked.id))}/article.tex`);
      const folder = mkdtempSync(path.join(tmpdir(), 'marginalia-tex-'));
      writeFileSync(path.join(folder, 'article.tex'), tex.bytes);
      for (let pass = 0; pass < 2; pass++) {
        const run = spawnSync('pdflatex', ['-interaction=nonstopmode', '-halt-on-error', 'article.tex'], { cwd: folder, encoding: 'utf8', timeout: 60_000 });
        expect(run.status, run.stdout.slice(-2000)).toBe(0);
      }
      expect(readFileSync(path.join(folder, 'article.pdf')).subarray(0, 5).toString()).toBe('%PDF-');
    });

    test('an unlocked version has no check report to export', async () => {
      const list = await versions(derivationId);
      const first = list[list.length - 1]!;
      const report = await demo.as.reader.get<{ error: string }>(`/api/derivations/${derivationId}/versions/${first.id}/report.json`);
      expect(report.status).toBe(409);
      expect(report.body.error).toMatch(/not locked/);
    });
  });
});

async function newShareToken(derivationId: string, versionId: string): Promise<string> {
  const made = await demo.as.lead.post<{ token: string }>(`/api/derivations/${derivationId}/versions/${versionId}/share-links`, { days: 30 });
  return made.body.token;
}
