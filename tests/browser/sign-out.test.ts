// In Debian's Chromium, an author signs out: the copies of derivations kept on this device
// (IndexedDB) are cleared, but never before the server has every edit. Edits the server has not
// confirmed (here the server is paused, as a stalled connection would be) are named; the author
// may wait for them, and sign-out goes on by itself once they arrive, or sign out anyway after a
// confirmation that they will be discarded.
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { demoAccount, demoSessions, launchBrowser, ownTitle, signIn, signedInContext, startServer, type DemoSessions, type StartedServer } from '../helpers';
import { connectClient } from '../integration/collabClients';

let server: StartedServer;
let demo: DemoSessions;
let browser: Browser;

beforeAll(async () => {
  server = await startServer({ demo: true });
  demo = await demoSessions(server.url);
  browser = await launchBrowser();
});

afterAll(async () => {
  if (server?.process.signalCode === null) server.process.kill('SIGCONT');
  await browser?.close();
  await server?.stop();
});

async function newDerivation(title: string): Promise<string> {
  const created = await demo.as.author.post<{ id: string }>(`/api/groups/${demo.groupId}/derivations`, { title: ownTitle(title) });
  expect(created.status).toBe(201);
  return created.body.id;
}

/** A fresh browser profile signed in as the demo author, on the derivation's page, connected. */
async function authorOn(derivationId: string): Promise<{ context: BrowserContext; page: Page }> {
  const author = demoAccount('author');
  const cookie = await signIn(server.url, author.email, author.password);
  const context = await signedInContext(browser, server.url, cookie, { viewport: { width: 1200, height: 900 } });
  const page = await context.newPage();
  await page.goto(`${server.url}/derivations/${derivationId}`);
  await page.locator('[data-connection="connected"]').waitFor({ timeout: 30_000 });
  await page.locator('.ProseMirror').click();
  return { context, page };
}

const copiesOnDevice = (page: Page) => page.evaluate(async () => (await indexedDB.databases()).map((d) => d.name ?? '').filter((n) => n.startsWith('marginalia:')));

async function serverText(derivationId: string): Promise<string> {
  const client = connectClient(server.url, derivationId, { cookie: demo.cookies.lead });
  await client.synced();
  const text = client.doc.getXmlFragment('body').toString();
  client.destroy();
  return text;
}

async function signedOut(page: Page): Promise<void> {
  await page.waitForURL((url) => url.pathname === '/', { timeout: 30_000 });
  await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Sign in' }).waitFor();
}

describe('signing out clears the copies on this device without losing an edit', () => {
  test('with every edit on the server, sign-out clears the copies at once', async () => {
    const id = await newDerivation('Signed out cleanly');
    const { context, page } = await authorOn(id);
    await page.keyboard.type('Every word reached the server.');
    await expect.poll(() => serverText(id), { timeout: 20_000 }).toContain('Every word reached the server.');
    expect((await copiesOnDevice(page)).length).toBeGreaterThan(0);
    await page.getByRole('button', { name: 'Sign out' }).click();
    await signedOut(page);
    expect(await copiesOnDevice(page)).toEqual([]);
    await context.close();
  });

  test('edits the server has not confirmed are named; waiting sends them and then signs out', async () => {
    const id = await newDerivation('Waited for the server');
    const { context, page } = await authorOn(id);
    server.process.kill('SIGSTOP');
    try {
      await page.keyboard.type('Typed while the server was paused.');
      await page.getByRole('button', { name: 'Sign out' }).click();
      const dialog = page.getByRole('dialog', { name: 'Signing out' });
      await dialog.locator('[role="alert"]').waitFor({ timeout: 30_000 });
      expect(await dialog.getAttribute('data-sign-out')).toBe('unsent');
      expect(await dialog.textContent()).toMatch(/Edits to “Waited for the server [0-9a-f]{6}” on this device have not been confirmed by the server yet/);
      await dialog.getByRole('button', { name: 'Wait for them' }).click();
      await dialog.getByText('you will be signed out as soon as the server has them all').waitFor();
      // Nothing is cleared while the edits are on their way.
      expect((await copiesOnDevice(page)).length).toBeGreaterThan(0);
    } finally {
      server.process.kill('SIGCONT');
    }
    await signedOut(page);
    expect(await copiesOnDevice(page)).toEqual([]);
    expect(await serverText(id)).toContain('Typed while the server was paused.');
    await context.close();
  });

  test('signing out anyway asks first, and "Back" keeps everything', async () => {
    const id = await newDerivation('Signed out anyway');
    const { context, page } = await authorOn(id);
    server.process.kill('SIGSTOP');
    const dialog = page.getByRole('dialog', { name: 'Signing out' });
    try {
      await page.keyboard.type('Maybe lost.');
      await page.getByRole('button', { name: 'Sign out' }).click();
      await page.locator('[role="dialog"][data-sign-out="unsent"]').waitFor({ timeout: 30_000 });
      await dialog.getByRole('button', { name: 'Sign out anyway' }).click();
      expect(await dialog.textContent()).toContain('They cannot be recovered');
      await dialog.getByRole('button', { name: 'Back' }).click();
      expect(await dialog.getAttribute('data-sign-out')).toBe('unsent');
      expect((await copiesOnDevice(page)).length).toBeGreaterThan(0);
      await dialog.getByRole('button', { name: 'Sign out anyway' }).click();
    } finally {
      server.process.kill('SIGCONT');
    }
    await dialog.getByRole('button', { name: 'Discard them and sign out' }).click();
    await signedOut(page);
    expect(await copiesOnDevice(page)).toEqual([]);
    await context.close();
  });
});
