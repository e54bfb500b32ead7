// In Debian's Chromium, a reader with a share link to the demo's locked version: the claim blocks
// in the text show the verdicts stored in the check report at the lock, not verdicts this browser
// computes (with no Web Worker in the page at all, every badge still shows its stored verdict), the
// evidence drawer opened from a block is the stored result, and "Check again here" runs the claim
// in the browser and shows that result beside the stored one, writing nothing.
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import type { ClaimResult } from '../../flow/types';
import { demoSessions, launchBrowser, startServer, type DemoSessions, type StartedServer } from '../helpers';

let server: StartedServer;
let demo: DemoSessions;
let browser: Browser;
let shareUrl = '';
let stored: { stepId: string; id: string; status: string; result: ClaimResult }[] = [];

beforeAll(async () => {
  server = await startServer({ demo: true });
  demo = await demoSessions(server.url);
  browser = await launchBrowser();
  // The demo's version 1 is locked through the real lock shortly after start.
  const deadline = Date.now() + 90_000;
  let versionId: string | undefined;
  while (!versionId) {
    const list = await demo.as.lead.get<{ versions: { id: string; locked: unknown }[] }>(`/api/derivations/${demo.derivationId}/versions`);
    versionId = list.body.versions.find((v) => v.locked)?.id;
    if (!versionId) {
      if (Date.now() > deadline) throw new Error('the demo version was not locked');
      await new Promise((resolve) => setTimeout(resolve, 500));
    }
  }
  const link = await demo.as.lead.post<{ url: string }>(`/api/derivations/${demo.derivationId}/versions/${versionId}/share-links`, { days: 1, note: 'stored verdicts test' });
  expect(link.status).toBe(201);
  shareUrl = link.body.url.replace(/^https?:\/\/[^/]+/, server.url);
  const report = await fetch(`${shareUrl.replace('/shared/', '/api/shared/')}/report.json`);
  expect(report.status).toBe(200);
  const body = (await report.json()) as { claims: { stepId: string; id: string; status: string; result: ClaimResult }[] };
  stored = body.claims;
  expect(stored.length).toBeGreaterThan(2);
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

async function openShared(page: Page): Promise<void> {
  await page.goto(shareUrl);
  await page.locator('[data-lock-hash]').waitFor({ timeout: 30_000 });
  await page.getByRole('region', { name: 'Text' }).locator('.claim-block').first().waitFor({ timeout: 30_000 });
}

describe('a shared locked version shows the stored verdicts in its text', () => {
  test('with no worker to check anything in the page, each claim block shows the verdict stored at the lock', async () => {
    const context = await browser.newContext({ viewport: { width: 1200, height: 1600 } });
    // Every Web Worker refuses to start: any verdict in the text can only be the stored one.
    await context.addInitScript(() => {
      class NoWorker {
        constructor() {
          throw new Error('no workers in this page');
        }
      }
      Object.defineProperty(window, 'Worker', { value: NoWorker, configurable: true });
    });
    const page = await context.newPage();
    await openShared(page);
    const text = page.getByRole('region', { name: 'Text' });
    for (const claim of stored) {
      const block = text.locator(`.claim-block[data-step-id="${claim.stepId}"]`);
      await expect.poll(() => block.getAttribute('data-verdict'), { timeout: 20_000 }).toBe(claim.status);
      expect(await block.locator('.block-verdict-message').textContent()).toBe(claim.result.message);
    }
    await context.close();
  });

  test('the evidence from a block is the stored result, and "Check again here" shows the browser\'s result beside it', async () => {
    const context = await browser.newContext({ viewport: { width: 1200, height: 1600 } });
    const page = await context.newPage();
    await openShared(page);
    const claim = stored.find((c) => typeof c.result.measured === 'number' && c.result.uncertainty !== null) ?? stored[0]!;
    const block = page.getByRole('region', { name: 'Text' }).locator(`.claim-block[data-step-id="${claim.stepId}"]`);
    await expect.poll(() => block.getAttribute('data-verdict'), { timeout: 20_000 }).toBe(claim.status);
    await block.getByRole('button', { name: 'Evidence' }).click();
    const drawer = page.getByRole('complementary', { name: 'Evidence of the claim' });
    const panel = drawer.locator('[data-evidence-panel]');
    await panel.waitFor();
    expect(await panel.locator('[data-evidence-message]').textContent()).toBe(claim.result.message);
    expect(await panel.locator('[data-value="Claimed"]').count()).toBe(1);
    // Nothing checked here yet: one column, the stored one.
    expect(await panel.locator('[data-tight-value]').count()).toBe(0);

    await panel.getByRole('button', { name: 'Check again here' }).click();
    await panel.locator('[data-tight-value="Measured"]').waitFor({ timeout: 30_000 });
    const heads = await panel.locator('thead th').allTextContents();
    expect(heads.map((h) => h.trim())).toEqual(['', 'stored with the version', 'checked here']);
    expect(await panel.textContent()).toContain('Checked again in this browser:');
    // The same solver on the same content agrees with the stored verdict; the block keeps the stored one.
    expect(await panel.locator('[data-tight-value="Claimed"]').textContent()).toBe(await panel.locator('[data-value="Claimed"]').textContent());
    expect(await block.getAttribute('data-verdict')).toBe(claim.status);
    const list = page.locator(`[data-claim="${claim.id}"] [data-checked-here]`);
    await expect.poll(() => list.getAttribute('data-checked-here')).toBe(claim.status);
    await context.close();
  });
});
