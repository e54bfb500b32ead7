// In Debian's Chromium, the reviewer's story: a student (reviewer) opens a derivation read-only,
// opens a claim's evidence, runs it again with tighter settings, leaves a remark on the claim's
// step and signs it off ("checked by" with name and time, shown in the margin at the step); the
// author's edit of the flow block the claim depends on clears the sign-off, saying why; the author
// follows the mail's link to the remark and replies.
import { randomUUID } from 'node:crypto';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { claimBlockNode, flowBlockNode } from '../../flow/document';
import { demoAccount, demoSessions, launchBrowser, linkIn, ownTitle, readMailbox, signedInContext, startServer, waitForMail, type DemoSessions, type StartedServer } from '../helpers';
import { connectClient, type CollabClient } from '../integration/collabClients';
import { appendSteps, paragraph, setField, withStepId } from '../integration/reviewDocuments';

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
  const context = await signedInContext(browser, server.url, cookie, { viewport: { width: 1280, height: 900 } });
  contexts.push(context);
  return context.newPage();
}

test('a reviewer opens a claim, sees the evidence, runs it again, remarks on the step and signs it off; an edit of its flow clears the sign-off; the author follows the mail to the remark', async () => {
  const title = ownTitle('Review: one-loop flow below d = 4');
  const created = await demo.as.author.post<{ id: string }>(`/api/groups/${demo.groupId}/derivations`, { title });
  const id = created.body.id;
  const author = connectClient(server.url, id, { cookie: demo.cookies.author });
  clients.push(author);
  await author.synced();
  const flowStep = randomUUID();
  const claimStep = randomUUID();
  appendSteps(author.doc, [
    paragraph('Below four dimensions the quartic coupling flows to a fixed point of order eps.', randomUUID()),
    // dg/dl = eps g - g^2 has its nontrivial fixed point at g* = eps (common practice).
    withStepId(flowBlockNode({ couplings: ['g'], convention: 'ir', parameters: { eps: 0.1 }, beta: { g: 'eps*g - g^2' } }, { name: 'one loop' }), flowStep),
    withStepId(claimBlockNode({ kind: 'fixed-point', id: 'gstar', near: { g: 0.08 }, value: { g: 'eps' } }), claimStep),
    paragraph('So the coupling at the fixed point is small when eps is.', randomUUID()),
  ]);

  const reviewer = await signedInPage(demo.cookies.reviewer);
  await reviewer.goto(`${server.url}/derivations/${id}`);
  const text = reviewer.getByRole('textbox', { name: title });
  await text.getByText('Below four dimensions').waitFor();
  expect(await text.getAttribute('aria-readonly')).toBe('true');

  // The claim's evidence: what the solver measured, then the same check with tighter settings.
  const claim = reviewer.locator(`[data-step-id="${claimStep}"]`);
  await claim.getByText('holds', { exact: true }).first().waitFor({ timeout: 60_000 });
  await claim.getByRole('button', { name: 'Evidence' }).click();
  const evidence = reviewer.getByRole('article', { name: /^Evidence: Claim 1/ });
  await evidence.waitFor();
  expect(await evidence.textContent()).toContain('Measured and claimed');
  expect(await evidence.textContent()).toContain('A numerical check is evidence, not a proof');
  await evidence.getByRole('button', { name: 'Run again with tighter settings' }).click();
  await evidence.getByText('With tighter settings:').waitFor({ timeout: 60_000 });
  expect(await evidence.locator('th', { hasText: 'tighter settings' }).count()).toBe(1);
  await evidence.getByRole('button', { name: 'Close' }).click();

  // Choosing the claim's step opens its card in the margin (the keyboard way: the chooser).
  await reviewer.getByRole('button', { name: /^Review a step: / }).click();
  await reviewer.getByRole('combobox', { name: 'Review a step' }).selectOption({ label: '3. Claim "gstar" (fixed point)' });
  const card = reviewer.getByRole('region', { name: 'Review of step 3' });
  await card.waitFor();
  expect(await card.textContent()).toContain('Not signed off.');

  await card.getByRole('button', { name: 'Leave a remark' }).click();
  await card.getByLabel('Your remark on this step', { exact: true }).fill('Newton from g = 0.08 finds g* = eps; is the trivial fixed point ruled out as the intended one?');
  const beforeMail = await readMailbox(server.url, { to: demoAccount('author').email });
  await card.getByRole('button', { name: 'Leave remark' }).click();
  await card.getByRole('article', { name: `Remark thread by ${demoAccount('reviewer').name}` }).waitFor();
  expect(await card.textContent()).toContain('is the trivial fixed point ruled out');

  await card.getByRole('button', { name: 'Sign off this step' }).click();
  const checked = card.locator('[data-sign-off]');
  await checked.waitFor();
  expect(await checked.textContent()).toMatch(new RegExp(`^Checked by ${demoAccount('reviewer').name}, \\d{1,2} \\w{3} \\d{4}, \\d{2}:\\d{2}`));

  // The margin's note beside the step says it in words; keyboard users reach it too.
  await card.getByRole('button', { name: "Close the step's review" }).click();
  const note = reviewer.getByRole('button', { name: /^Step 3: checked by Ilse Brandvold; 1 open remark\. Open its review\.$/ });
  await note.waitFor();
  expect(await note.evaluate((element) => element === document.activeElement)).toBe(true);
  await reviewer.keyboard.press('Enter');
  await card.waitFor();
  await reviewer.screenshot({ path: '/tmp/review-signed-off.png', fullPage: true });

  // The author changes the flow the claim is checked against: the sign-off goes, and the card says why.
  setField(author.doc, flowStep, 'value', 'eps*g - 2*g^2', 'beta');
  const cleared = card.locator('[data-sign-off-cleared]');
  await cleared.waitFor({ timeout: 20_000 });
  expect(await cleared.textContent()).toContain('the flow block it depends on was edited after the sign-off');
  expect(await cleared.textContent()).toContain(`(edit by ${demoAccount('author').name})`);
  expect(await card.getByRole('button', { name: 'Sign off this step' }).isVisible()).toBe(true);

  // The author's mail links to the remark, which opens at its step.
  const mail = await waitForMail(server.url, { to: demoAccount('author').email, subject: new RegExp(`remark on your step in "${title.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}"`), notIn: beforeMail });
  const authorPage = await signedInPage(demo.cookies.author);
  await authorPage.goto(linkIn(mail, `/derivations/${id}`));
  const authorCard = authorPage.getByRole('region', { name: 'Review of step 3' });
  await authorCard.waitFor();
  expect(await authorCard.textContent()).toContain('is the trivial fixed point ruled out');
  // An author may reply but not sign off.
  expect(await authorCard.getByRole('button', { name: 'Sign off this step' }).count()).toBe(0);
  await authorCard.getByRole('button', { name: 'Reply' }).click();
  await authorCard.getByLabel('Your reply', { exact: true }).fill('Yes: g* = 0 is unstable below d = 4; the claim names the start near eps.');
  await authorCard.getByRole('button', { name: 'Reply', exact: true }).click();
  await authorCard.getByText('g* = 0 is unstable').waitFor();

  // Every remark is listed below the text as well.
  const list = reviewer.getByRole('region', { name: 'Remarks' });
  await list.getByText('Step 3').waitFor();
  await list.getByText('1 reply').waitFor({ timeout: 15_000 });
});
