// In Debian's Chromium: asking for a sign-in link on the sign-in page, opening it from the
// mailbox page, and the clear message when the same link is opened a second time.
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { demoAccount, launchBrowser, startServer, type StartedServer } from '../helpers';

let server: StartedServer;
let browser: Browser;

beforeAll(async () => {
  server = await startServer({ demo: true });
  browser = await launchBrowser();
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

test('a sign-in link from the mailbox signs the reviewer in once; a second use says the link expired or was used', async () => {
  const reviewer = demoAccount('reviewer');
  const page = await (await browser.newContext()).newPage();
  await page.goto(`${server.url}/signin`);
  const form = page.getByRole('form', { name: 'Sign in with a link by e-mail' });
  await form.getByLabel('E-mail', { exact: true }).fill(reviewer.email);
  await form.getByRole('button', { name: 'Send me a sign-in link' }).click();
  await page.getByText(`A sign-in link is on its way to ${reviewer.email}`).waitFor();

  await page.getByRole('link', { name: 'Mailbox' }).click();
  const messages = page.getByRole('list', { name: 'Messages' });
  await messages.getByRole('button', { name: /Your Marginalia sign-in link/ }).click();
  const link = messages.getByRole('link', { name: /\/api\/auth\/callback\/email/ });
  const href = (await link.getAttribute('href'))!;
  await link.click();
  await page.waitForURL(`${server.url}/groups`);
  expect(await page.getByRole('navigation', { name: 'Main' }).textContent()).toContain(reviewer.name);

  const other = await (await browser.newContext()).newPage();
  await other.goto(href);
  await other.waitForURL(/\/signin\?error=Verification/);
  await other.getByText('This sign-in link has expired or has already been used. Ask for a new one below.').waitFor();
});

test('asking for a link for an address without an account says so next to the field', async () => {
  const page = await (await browser.newContext()).newPage();
  await page.goto(`${server.url}/signin`);
  const form = page.getByRole('form', { name: 'Sign in with a link by e-mail' });
  await form.getByLabel('E-mail', { exact: true }).fill('nobody@chains.example');
  await form.getByRole('button', { name: 'Send me a sign-in link' }).click();
  await page.locator('#link-email-error').waitFor();
  expect(await page.locator('#link-email-error').textContent()).toBe('No account uses this address. Register first.');
});
