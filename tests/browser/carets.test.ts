// In Debian's Chromium: two authors with their carets at the same place in a derivation; a third
// member sees both carets, each with its name, and neither name covers the other.
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { demoAccount, demoSessions, launchBrowser, openDerivation, ownTitle, signedInContext, startServer, type DemoSessions, type StartedServer } from '../helpers';

let server: StartedServer;
let browser: Browser;
let demo: DemoSessions;
const contexts: BrowserContext[] = [];

beforeAll(async () => {
  server = await startServer({ demo: true });
  demo = await demoSessions(server.url);
  browser = await launchBrowser();
});

afterAll(async () => {
  for (const context of contexts) await context.close().catch(() => undefined);
  await browser?.close();
  await server?.stop();
});

async function openAs(cookie: string, derivationId: string): Promise<Page> {
  const context = await signedInContext(browser, server.url, cookie);
  contexts.push(context);
  const page = await context.newPage();
  await openDerivation(page, server.url, derivationId);
  return page;
}

type Box = { x: number; y: number; width: number; height: number };
const overlaps = (a: Box, b: Box) => a.x < b.x + b.width && b.x < a.x + a.width && a.y < b.y + b.height && b.y < a.y + a.height;

test('two authors’ carets at the same place show both names, one above the other, neither covering the other', async () => {
  const created = await demo.as.lead.post<{ id: string }>(`/api/groups/${demo.groupId}/derivations`, { title: ownTitle('Carets at one place') });
  expect(created.status).toBe(201);
  const derivationId = created.body.id;

  const lead = await openAs(demo.cookies.lead, derivationId);
  await lead.locator('.ProseMirror').click();
  await lead.keyboard.type('The anomalous dimension at two loops.');
  const author = await openAs(demo.cookies.author, derivationId);
  await author.locator('.ProseMirror', { hasText: 'The anomalous dimension at two loops.' }).waitFor();
  await author.locator('.ProseMirror p').first().click();
  await author.keyboard.press('End');
  await lead.keyboard.press('End');

  // The reviewer follows the text read-only and sees both carets at the end of the paragraph.
  const reviewer = await openAs(demo.cookies.reviewer, derivationId);
  const leadName = demoAccount('lead').name;
  const authorName = demoAccount('author').name;
  const label = (name: string) => reviewer.locator(`.collab-caret[data-name="${name}"] .collab-caret-label`);
  await label(leadName).waitFor();
  await label(authorName).waitFor();
  const carets = await reviewer.locator('.collab-caret').evaluateAll((nodes) => nodes.map((n) => Math.round(n.getBoundingClientRect().left)));
  expect(carets).toHaveLength(2);
  expect(Math.abs(carets[0]! - carets[1]!)).toBeLessThanOrEqual(2); // the same place in the text

  const [first, second] = [(await label(leadName).boundingBox())!, (await label(authorName).boundingBox())!];
  expect(overlaps(first, second)).toBe(false);
  expect(await label(leadName).textContent()).toBe(leadName);
  expect(await label(authorName).textContent()).toBe(authorName);
  // Each name is still seen whole in the reviewer's window (not pushed out of the page).
  for (const box of [first, second]) expect(box.y).toBeGreaterThanOrEqual(0);
});
