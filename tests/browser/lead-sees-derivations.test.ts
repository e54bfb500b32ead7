// In Debian's Chromium: the demo lead signs in through the sign-in page and sees the group's
// derivations table; sorting and filtering work from the keyboard and the mouse.
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { demoAccount, demoDerivationTitle, demoGroup, launchBrowser, startServer, type StartedServer } from '../helpers';

let server: StartedServer;
let browser: Browser;
let page: Page;

beforeAll(async () => {
  server = await startServer({ demo: true });
  browser = await launchBrowser();
  page = await browser.newPage();
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

test('a wrong password shows a message next to the field and keeps the user on the sign-in page', async () => {
  await page.goto(`${server.url}/groups`);
  await page.waitForURL(/\/signin\?callbackUrl=%2Fgroups/);
  const lead = demoAccount('lead');
  await page.getByLabel('E-mail', { exact: true }).first().fill(lead.email);
  await page.getByLabel('Password', { exact: true }).fill('not the password');
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  const message = page.locator('#signin-password-error');
  await message.waitFor();
  expect(await message.textContent()).toBe('Wrong e-mail or password.');
  expect(await page.getByLabel('Password', { exact: true }).getAttribute('aria-invalid')).toBe('true');
  expect(new URL(page.url()).pathname).toBe('/signin');
});

test('the demo lead signs in and sees the group’s derivations table', async () => {
  const lead = demoAccount('lead');
  await page.getByLabel('Password', { exact: true }).fill(lead.password);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  await page.waitForURL(`${server.url}/groups`);
  await page.getByRole('link', { name: demoGroup.name }).click();
  await page.waitForURL(/\/groups\/[0-9a-f-]{36}$/);

  const table = page.getByRole('table', { name: 'Derivations of this group' });
  await table.waitFor();
  const headers = await table.getByRole('columnheader').allTextContents();
  expect(headers.map((h) => h.trim())).toEqual(['Title', 'Authors', 'Claims holding', 'Claims failing', 'Last edit', 'Locked versions']);
  const row = table.getByRole('row').filter({ hasText: demoDerivationTitle });
  expect(await row.count()).toBe(1);
  expect(await row.getByRole('cell').nth(1).textContent()).toBe(`${lead.name}, ${demoAccount('author').name}`);
  expect(await page.getByRole('navigation', { name: 'Main' }).textContent()).toContain(lead.name);
});

test('a new derivation appears in the table, and the filter and sorting narrow and order it', async () => {
  await page.getByLabel('Title', { exact: true }).fill('Anomalous dimension at two loops');
  await page.getByRole('button', { name: 'Create derivation' }).click();
  const table = page.getByRole('table', { name: 'Derivations of this group' });
  await table.getByRole('link', { name: 'Anomalous dimension at two loops' }).waitFor();

  const titles = async () => (await table.locator('tbody tr td:first-child a').allTextContents()).map((t) => t.trim());
  // Sort by title from the keyboard: focus the header button and press Enter.
  await table.getByRole('button', { name: 'Title' }).focus();
  await page.keyboard.press('Enter');
  await expect.poll(titles).toEqual(['Anomalous dimension at two loops', demoDerivationTitle]);
  expect(await table.getByRole('columnheader', { name: 'Title' }).getAttribute('aria-sort')).toBe('ascending');
  await page.keyboard.press('Enter');
  await expect.poll(titles).toEqual([demoDerivationTitle, 'Anomalous dimension at two loops']);

  await page.getByRole('searchbox').fill('Ashby');
  await expect.poll(titles).toEqual([demoDerivationTitle]);
  await page.getByRole('searchbox').fill('anomalous');
  await expect.poll(titles).toEqual(['Anomalous dimension at two loops']);
});

test('a title that is too long is refused next to the field, and nothing is added', async () => {
  await page.getByRole('searchbox').fill('');
  const table = page.getByRole('table', { name: 'Derivations of this group' });
  const before = await table.locator('tbody tr').count();
  await page.getByLabel('Title', { exact: true }).fill('t'.repeat(201));
  await page.getByRole('button', { name: 'Create derivation' }).click();
  await page.locator('#new-derivation-title-error').waitFor();
  expect(await page.locator('#new-derivation-title-error').textContent()).toMatch(/at most 200 characters/);
  await page.reload();
  await table.waitFor();
  expect(await table.locator('tbody tr').count()).toBe(before);
});

test('the lead renames a derivation in place and deletes another after confirming', async () => {
  const table = page.getByRole('table', { name: 'Derivations of this group' });
  const row = table.getByRole('row').filter({ hasText: 'Anomalous dimension at two loops' });
  await row.getByRole('button', { name: 'Rename' }).click();
  // The row turns into a small form while renaming.
  const form = page.getByRole('form', { name: 'Rename Anomalous dimension at two loops' });
  await form.getByLabel('New title').fill('Anomalous dimension of the field at two loops');
  await form.getByRole('button', { name: 'Save title' }).click();
  await table.getByRole('link', { name: 'Anomalous dimension of the field at two loops' }).waitFor();

  const renamed = table.getByRole('row').filter({ hasText: 'Anomalous dimension of the field at two loops' });
  await renamed.getByRole('button', { name: 'Delete' }).click();
  await renamed.getByRole('button', { name: 'Keep it' }).click();
  expect(await table.getByRole('link', { name: 'Anomalous dimension of the field at two loops' }).count()).toBe(1);
  await renamed.getByRole('button', { name: 'Delete' }).click();
  await renamed.getByRole('group', { name: 'Confirm deletion' }).getByRole('button', { name: 'Delete' }).click();
  await expect.poll(() => table.getByRole('link', { name: 'Anomalous dimension of the field at two loops' }).count()).toBe(0);
  await page.reload();
  await table.getByRole('link', { name: demoDerivationTitle }).waitFor();
  expect(await table.locator('tbody tr').count()).toBe(1);
});
