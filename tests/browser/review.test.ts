// In Debian's Chromium, the reviewer's story: a student (reviewer) opens a derivation read-only,
// picks a step, leaves a remark on it and signs it off ("checked by" with name and time, shown in
// the margin at the step); the author's edit of that step clears the sign-off, saying why; the
// author follows the mail's link to the remark.
import { randomUUID } from 'node:crypto';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { demoAccount, demoSessions, launchBrowser, linkIn, readMailbox, startServer, waitForMail, type DemoSessions, type StartedServer } from '../helpers';
import { connectClient, type CollabClient } from '../integration/collabClients';
import { appendSteps, appendToParagraph, paragraph } from '../integration/reviewDocuments';

let server: StartedServer;
let browser: Browser;
let demo: DemoSessions;
const contexts: BrowserContext[] = [];
const clients: CollabClient[] = [];

beforeAll(async () => {
  server = await startServer({ demo: true, env: { MARGINALIA_STEP_AUTHORS_MS: '100', MARGINALIA_SIGNOFF_CHECK_MS: '50' } });
  demo = await demoSessions(server.url);
  browser = await launchBrowser();
});

afterAll(async () => {
  for (const client of clients) client.destroy();
  for (const context of contexts) await context.close();
  await browser?.close();
  await server?.stop();
});

async function signedInPage(cookie: string): Promise<Page> {
  const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
  contexts.push(context);
  const [name, value] = cookie.split(/=(.*)/s) as [string, string];
  await context.addCookies([{ name, value, url: server.url }]);
  return context.newPage();
}

test('a reviewer leaves a remark on a step and signs it off; an edit clears the sign-off with the reason; the author follows the mail to the remark', async () => {
  const created = await demo.as.author.post<{ id: string }>(`/api/groups/${demo.groupId}/derivations`, { title: 'Review: one-loop flow at d = 4' });
  const id = created.body.id;
  const author = connectClient(server.url, id, { cookie: demo.cookies.author });
  clients.push(author);
  await author.synced();
  const steps = [randomUUID(), randomUUID(), randomUUID()];
  appendSteps(author.doc, [
    paragraph('At four dimensions the quartic coupling is marginal.', steps[0]),
    paragraph('The flow is dg/dl = -b g^2 with b = (n+8)/6.', steps[1]),
    paragraph('So g(l) falls like 1/(b l) far in the infrared.', steps[2]),
  ]);

  const reviewer = await signedInPage(demo.cookies.reviewer);
  await reviewer.goto(`${server.url}/derivations/${id}`);
  const text = reviewer.getByRole('textbox', { name: 'Review: one-loop flow at d = 4' });
  await text.getByText('The flow is dg/dl').waitFor();
  expect(await text.getAttribute('aria-readonly')).toBe('true');

  // Clicking the step opens its card in the margin.
  await text.getByText('The flow is dg/dl').click();
  const card = reviewer.getByRole('region', { name: 'Review of step 2' });
  await card.waitFor();
  expect(await card.textContent()).toContain('Not signed off.');

  await card.getByRole('button', { name: 'Leave a remark' }).click();
  await card.getByLabel('Your remark on this step', { exact: true }).fill('Which convention for l? With l = -ln mu the sign of b flips.');
  const beforeMail = await readMailbox(server.url, { to: demoAccount('author').email });
  await card.getByRole('button', { name: 'Leave remark' }).click();
  await card.getByRole('article', { name: `Remark thread by ${demoAccount('reviewer').name}` }).waitFor();
  expect(await card.textContent()).toContain('Which convention for l?');

  await card.getByRole('button', { name: 'Sign off this step' }).click();
  const checked = card.locator('[data-sign-off]');
  await checked.waitFor();
  expect(await checked.textContent()).toMatch(new RegExp(`^Checked by ${demoAccount('reviewer').name}, \\d{1,2} \\w{3} \\d{4}, \\d{2}:\\d{2}`));

  // The margin's note beside the step says it in words; keyboard users reach it too.
  await card.getByRole('button', { name: 'Close the step\'s review' }).click();
  const note = reviewer.getByRole('button', { name: /^Step 2: checked by Ilse Brandvold; 1 open remark\. Open its review\.$/ });
  await note.waitFor();
  await note.focus();
  await reviewer.keyboard.press('Enter');
  await card.waitFor();
  await reviewer.screenshot({ path: '/tmp/review-signed-off.png', fullPage: true });

  // The author edits the step: the sign-off goes, and the card says why and whose edit it was.
  appendToParagraph(author.doc, steps[1]!, ' (one loop)');
  const cleared = card.locator('[data-sign-off-cleared]');
  await cleared.waitFor({ timeout: 20_000 });
  expect(await cleared.textContent()).toContain('the step was edited after the sign-off');
  expect(await cleared.textContent()).toContain(`(edit by ${demoAccount('author').name})`);
  expect(await card.getByRole('button', { name: 'Sign off this step' }).isVisible()).toBe(true);

  // The author's mail links to the remark, which opens at its step.
  const mail = await waitForMail(server.url, { to: demoAccount('author').email, subject: /remark on your step/, notIn: beforeMail });
  const authorPage = await signedInPage(demo.cookies.author);
  await authorPage.goto(linkIn(mail, `/derivations/${id}`));
  const authorCard = authorPage.getByRole('region', { name: 'Review of step 2' });
  await authorCard.waitFor();
  expect(await authorCard.textContent()).toContain('Which convention for l?');
  // An author may reply but not sign off.
  expect(await authorCard.getByRole('button', { name: 'Sign off this step' }).count()).toBe(0);
  await authorCard.getByRole('button', { name: 'Reply' }).click();
  await authorCard.getByLabel('Your reply', { exact: true }).fill('l = ln(mu0/mu): the infrared is l to infinity.');
  await authorCard.getByRole('button', { name: 'Reply', exact: true }).click();
  await authorCard.getByText('l = ln(mu0/mu)').waitFor();

  // Every remark is listed below the text as well.
  const list = reviewer.getByRole('region', { name: 'Remarks' });
  await list.getByText('Step 2').waitFor();
  await list.getByText('1 reply').waitFor({ timeout: 15_000 });
});
