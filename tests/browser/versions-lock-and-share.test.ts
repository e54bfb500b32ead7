// In Debian's Chromium, the lead's and the reader's stories: the lead locks the working copy, is
// refused while a claim fails (the claim named), fixes it and locks again, and sees the SHA-256;
// the lead makes a share link; a reader with no account opens it and reads the locked version
// (typeset math, each claim's verdict, the hash) and hovers along the trajectory plot to read the
// RG time and the coupling there.
//
// The flow is the O(n) model's two-loop beta function beta(g) = -eps g + (n+8)/3 g^2 - (3n+14)/3 g^3
// with g* = 3 eps/(n+8) + 9(3n+14)/(n+8)^3 eps^2 (Kleinert and Schulte-Frohlinde, Critical
// Properties of phi^4-Theories, 2001; REFERENCES.md, from memory), here at n = 0, eps = 0.1.
import { randomUUID } from 'node:crypto';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { plotBlockNode } from '../../editor/blocks/plotNodes';
import { claimBlockNode, flowBlockNode } from '../../flow/document';
import { demoSessions, launchBrowser, startServer, type DemoSessions, type StartedServer } from '../helpers';
import { appendBlocks, setField } from '../integration/checksDocument';
import { connectClient, type CollabClient } from '../integration/collabClients';

let server: StartedServer;
let demo: DemoSessions;
let browser: Browser;
let author: CollabClient;
let derivationId: string;
let shareUrl = '';
let lockHash = '';
const wrongStep = randomUUID();

const onFlow = {
  couplings: ['g'],
  parameters: { n: 0, eps: 0.1 },
  convention: 'uv' as const,
  beta: { g: '-eps*g + (n+8)/3*g^2 - (3*n+14)/3*g^3' },
};

async function signedInContext(cookie: string): Promise<BrowserContext> {
  const context = await browser.newContext({ viewport: { width: 1200, height: 1600 } });
  const [name, ...rest] = cookie.split('=');
  await context.addCookies([{ name: name!, value: rest.join('='), url: server.url }]);
  return context;
}

beforeAll(async () => {
  server = await startServer({ demo: true, env: { MARGINALIA_CHECK_DELAY_MS: '200', MARGINALIA_CHECK_MAX_DELAY_MS: '2000' } });
  demo = await demoSessions(server.url);
  browser = await launchBrowser();
  const created = await demo.as.author.post<{ id: string }>(`/api/groups/${demo.groupId}/derivations`, { title: 'Chains at two loops' });
  derivationId = created.body.id;
  author = connectClient(server.url, derivationId, { cookie: demo.cookies.author });
  await author.synced();
  const flowStep = randomUUID();
  appendBlocks(author.doc, [
    { type: 'paragraph', attrs: { stepId: randomUUID() }, content: [{ type: 'text', text: 'At the fixed point ' }, { type: 'mathInline', content: [{ type: 'text', text: 'g^* = 3\\epsilon/8' }] }, { type: 'text', text: ' to first order.' }] },
    flowBlockNode(onFlow, { stepId: flowStep, name: 'two-loop flow at n = 0' }),
    claimBlockNode({ id: 'fixed-point-eps2', kind: 'fixed-point', near: { g: '3*eps/(n+8)' }, value: { g: '3*eps/(n+8) + 9*(3*n+14)/(n+8)^3*eps^2' }, order: 2 }, { stepId: randomUUID() }),
    // The one-loop coefficient written wrongly: 3/(n+9) instead of 3/(n+8).
    claimBlockNode({ id: 'fixed-point-eps1', kind: 'fixed-point', near: { g: '3*eps/(n+8)' }, value: { g: '3*eps/(n+9)' }, order: 1 }, { stepId: wrongStep }),
    plotBlockNode({ stepId: 'plot-against-time', flow: flowStep, caption: 'The coupling flowing to its fixed point', starts: ['g = 0.01'], settings: { view: 'time', timeScale: 'log' } }),
  ]);
  // The server has the claims once its background check has seen them.
  const deadline = Date.now() + 45_000;
  for (;;) {
    const answer = await demo.as.reader.get<{ pending: boolean; claims: unknown[] }>(`/api/derivations/${derivationId}/checks`);
    if (!answer.body.pending && answer.body.claims.length === 2) break;
    if (Date.now() > deadline) throw new Error('the server never saw the claims');
    await new Promise((resolve) => setTimeout(resolve, 150));
  }
});

afterAll(async () => {
  author?.destroy();
  await browser?.close();
  await server?.stop();
});

describe('the lead locks a version', () => {
  let page: Page;

  beforeAll(async () => {
    page = await (await signedInContext(demo.cookies.lead)).newPage();
    await page.goto(`${server.url}/derivations/${derivationId}`);
    await page.getByRole('region', { name: 'Versions' }).waitFor();
  });

  test('the lock is refused while a claim fails, and the failing claim is named', async () => {
    await page.getByLabel('Name of the locked version (optional)', { exact: true }).fill('Two loops');
    await page.getByRole('button', { name: 'Lock the working copy' }).click();
    const refused = page.locator('[data-lock-refused]');
    await refused.waitFor({ timeout: 60_000 });
    const text = (await refused.textContent()) ?? '';
    expect(text).toContain('The lock was refused: 1 of 2 claims does not hold');
    expect(text).toContain('fixed-point-eps1');
    expect(text).toContain('fails');
    expect(await page.getByRole('region', { name: 'Versions' }).textContent()).toContain('No versions yet');
  });

  test('after the fix the lock succeeds and the SHA-256 is shown', async () => {
    setField(author.doc, wrongStep, 'value', 'g = 3*eps/(n+8)');
    await new Promise((resolve) => setTimeout(resolve, 500));
    await page.getByRole('button', { name: 'Lock the working copy' }).click();
    const done = page.locator('[data-lock-done]');
    await done.waitFor({ timeout: 60_000 });
    expect(await done.textContent()).toContain('all 2 claims hold');
    lockHash = ((await done.locator('[data-lock-hash]').textContent()) ?? '').trim();
    expect(lockHash).toMatch(/^[0-9a-f]{64}$/);
    const history = page.locator('[data-version="1"]');
    await history.waitFor();
    expect(await history.textContent()).toContain('locked');

    // The locked version's own page shows the same hash, the check report and the exports.
    await done.getByRole('link', { name: 'version 1' }).click();
    await page.waitForURL(/\/versions\/[0-9a-f-]{36}$/);
    await page.locator('[data-lock-hash]').waitFor();
    expect((await page.locator('[data-lock-hash]').textContent())?.trim()).toBe(lockHash);
    const exports = page.getByRole('navigation', { name: 'Exports' });
    expect(await exports.getByRole('link').allTextContents()).toEqual(['LaTeX article (.tex)', 'Check report (JSON)', 'Snapshot (.yjs)', 'Figures (SVG)']);
  });

  test('the lead makes a share link for the locked version', async () => {
    await page.getByLabel('Note (for your list)', { exact: true }).fill('for the referee');
    await page.getByRole('button', { name: 'Make a share link' }).click();
    const link = page.locator('[data-share-url]');
    await link.waitFor();
    shareUrl = ((await link.textContent()) ?? '').trim();
    expect(shareUrl).toMatch(/\/shared\/[A-Za-z0-9_-]{43}$/);
    await page.getByRole('cell', { name: 'for the referee' }).waitFor();
  });
});

describe('a reader follows the shared locked version', () => {
  let page: Page;

  beforeAll(async () => {
    page = await (await browser.newContext({ viewport: { width: 1200, height: 1600 } })).newPage();
  });

  test('without an account, the share link opens the locked version with typeset math, verdicts and the hash', async () => {
    await page.goto(shareUrl);
    await page.locator('[data-lock-hash]').waitFor({ timeout: 30_000 });
    expect((await page.locator('[data-lock-hash]').textContent())?.trim()).toBe(lockHash);
    expect(await page.getByRole('heading', { level: 1 }).textContent()).toBe('Chains at two loops');
    const text = page.getByRole('region', { name: 'Text' });
    await text.locator('.katex').first().waitFor();
    expect(await text.textContent()).toContain('to first order.');
    const claims = page.locator('[data-claim]');
    expect(await claims.count()).toBe(2);
    for (const claim of await claims.all()) expect(await claim.locator('[data-verdict]').first().getAttribute('data-verdict')).toBe('holds');
    // Each claim's evidence is the stored result: the located fixed point beside the claimed one.
    const series = page.locator('[data-claim="fixed-point-eps2"]');
    await series.getByRole('button', { name: 'Evidence' }).click();
    const evidence = series.locator('[data-evidence-panel]');
    await evidence.waitFor();
    expect(await evidence.textContent()).toContain('A numerical check is evidence, not a proof');
    // g* at n = 0, eps = 0.1 from the two-loop flow: 3 eps/8 + 126 eps^2/512 + O(eps^3) = 0.0400 (Kleinert and Schulte-Frohlinde 2001).
    expect(await evidence.textContent()).toMatch(/0\.040\d*/);
    // The reader may not change it: the text is not editable and nothing offers to lock or share.
    expect(await text.locator('.derivation-text').getAttribute('contenteditable')).toBe('false');
    expect(await page.getByRole('button', { name: 'Lock the working copy' }).count()).toBe(0);
    expect(await page.getByRole('button', { name: 'Make a share link' }).count()).toBe(0);
  });

  test('hovering along the trajectory plot reads the RG time and the coupling', async () => {
    const plot = page.locator('[data-step-id="plot-against-time"] [data-trajectory-plot], [data-trajectory-plot][data-step-id="plot-against-time"]').first();
    const area = plot.locator('[data-plot-area]');
    await area.locator('svg.recharts-surface').waitFor({ timeout: 60_000 });
    await area.scrollIntoViewIfNeeded();
    // Two places along the drawn curve (the longest path of the drawing), early and late in RG time.
    const along = await area.evaluate((element) => {
      const paths = [...element.querySelectorAll('path')].filter((p) => p.getTotalLength() > 0);
      const curve = paths.sort((a, b) => b.getTotalLength() - a.getTotalLength())[0]!;
      const toScreen = curve.getScreenCTM()!;
      return [0.3, 0.8].map((fraction) => {
        const at = curve.getPointAtLength(curve.getTotalLength() * fraction);
        const screen = new DOMPoint(at.x, at.y).matrixTransform(toScreen);
        return { x: screen.x, y: screen.y };
      });
    });
    const readout = plot.getByTestId('plot-readout');
    const readAt = async (index: number) => {
      await page.mouse.move(along[index]!.x, along[index]!.y);
      await expect.poll(async () => (await readout.textContent()) ?? '').toMatch(/RG time = [\d.e+-]+/);
      return (await readout.textContent()) ?? '';
    };
    const early = await readAt(0);
    const late = await readAt(1);
    expect(early).toMatch(/g = [\d.e+-]+/);
    const time = (line: string) => Number(/RG time = ([\d.e+-]+)/.exec(line)![1]);
    expect(time(late)).toBeGreaterThan(time(early));
  });
});
