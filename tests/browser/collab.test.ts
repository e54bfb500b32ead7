// In Debian's Chromium: authors write one derivation together and see each other's text, carets
// and names; a reader's page is read-only; formulas typeset, every one of a long text's too (and a
// malformed one shows KaTeX's error with its source kept); edits typed while the server is away
// survive a closed tab and merge when it is back; a removed member is told why the connection closed.
import { randomBytes } from 'node:crypto';
import { mkdtemp, rm } from 'node:fs/promises';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import {
  demoAccount,
  demoSessions,
  ownTitle,
  launchBrowser,
  linkIn,
  openDerivation,
  readMailbox,
  registerAndSignIn,
  signedInContext,
  startServer,
  waitForMail,
  type DemoSessions,
  type StartedServer,
} from '../helpers';
import { connectClient } from '../integration/collabClients';
import { appendBlocks } from '../integration/checksDocument';
import type { DocNode } from '../../flow/document';

let server: StartedServer;
let browser: Browser;
let demo: DemoSessions;
let dataDir: string;
let port: number;
const secret = randomBytes(32).toString('base64url');
const contexts: BrowserContext[] = [];

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.once('error', reject);
    probe.listen(0, '127.0.0.1', () => {
      const { port: found } = probe.address() as { port: number };
      probe.close(() => resolve(found));
    });
  });
}

function start(): Promise<StartedServer> {
  // A fixed port: the browser keeps a derivation's offline copy per origin.
  return startServer({ demo: true, dataDir, env: { PORT: String(port), NEXTAUTH_SECRET: secret, MARGINALIA_COLLAB_RECHECK_MS: '500' } });
}

async function signedInPage(cookie: string): Promise<Page> {
  const context = await signedInContext(browser, server.url, cookie);
  contexts.push(context);
  return context.newPage();
}

async function newDerivation(title: string): Promise<string> {
  const created = await demo.as.lead.post<{ id: string }>(`/api/groups/${demo.groupId}/derivations`, { title: ownTitle(title) });
  expect(created.status).toBe(201);
  return created.body.id;
}

/** The text as written: blocks one per line, other authors' caret labels left out. */
const editorText = (page: Page) =>
  page.locator('.ProseMirror').evaluate((element) => {
    const copy = element.cloneNode(true) as HTMLElement;
    for (const caret of copy.querySelectorAll('.collab-caret')) caret.remove();
    return [...copy.children].map((block) => (block.textContent ?? '').trim()).join('\n');
  });

beforeAll(async () => {
  dataDir = await mkdtemp(path.join(tmpdir(), 'marginalia-collab-browser-'));
  port = await freePort();
  server = await start();
  demo = await demoSessions(server.url);
  browser = await launchBrowser();
});

afterAll(async () => {
  for (const context of contexts) await context.close().catch(() => undefined);
  await browser?.close();
  await server?.stop();
  await rm(dataDir, { recursive: true, force: true });
});

describe('writing together', () => {
  test("two authors type into the same derivation and each sees the other's text, caret and name", async () => {
    const derivationId = await newDerivation('Typing together');
    const lead = await signedInPage(demo.cookies.lead);
    const author = await signedInPage(demo.cookies.author);
    await openDerivation(lead, server.url, derivationId);
    await openDerivation(author, server.url, derivationId);

    await lead.locator('.ProseMirror').click();
    await lead.keyboard.type('The beta function at one loop.');
    await author.locator('.ProseMirror', { hasText: 'The beta function at one loop.' }).waitFor();

    await author.locator('.ProseMirror').click();
    await author.keyboard.press('End');
    await author.keyboard.press('Enter');
    await author.keyboard.type('Its fixed point comes next.');
    await lead.locator('.ProseMirror', { hasText: 'Its fixed point comes next.' }).waitFor();
    expect(await editorText(lead)).toBe(await editorText(author));

    // Each sees the other's caret, labelled with their name, and both in the list of who is here.
    await lead.locator(`.collab-caret[data-name="${demoAccount('author').name}"]`).waitFor();
    await author.locator(`.collab-caret[data-name="${demoAccount('lead').name}"]`).waitFor();
    expect(await lead.locator('.collab-caret-label').first().textContent()).toBe(demoAccount('author').name);
    const here = lead.getByRole('region', { name: 'Who is here' });
    await here.getByText(demoAccount('author').name).waitFor();
    expect(await here.textContent()).toContain(`${demoAccount('lead').name} (you)`);
  });

  test("a reader's page is read-only: typing changes nothing, here or for the authors", async () => {
    const derivationId = await newDerivation('Read only for readers');
    const author = await signedInPage(demo.cookies.author);
    const reader = await signedInPage(demo.cookies.reader);
    await openDerivation(author, server.url, derivationId);
    await author.locator('.ProseMirror').click();
    await author.keyboard.type('Only authors write here.');
    await openDerivation(reader, server.url, derivationId);
    await reader.locator('.ProseMirror', { hasText: 'Only authors write here.' }).waitFor();

    expect(await reader.locator('.ProseMirror').getAttribute('contenteditable')).toBe('false');
    expect(await reader.locator('[data-read-only]').textContent()).toMatch(/Read-only: as reader/);
    expect(await reader.getByRole('toolbar', { name: 'Formatting' }).count()).toBe(0);
    await reader.locator('.ProseMirror').click();
    await reader.keyboard.type('A reader tries to write.');
    await author.getByRole('region', { name: 'Who is here' }).getByText(demoAccount('reader').name).waitFor();
    await new Promise((resolve) => setTimeout(resolve, 500));
    expect(await editorText(reader)).toBe('Only authors write here.');
    expect(await editorText(author)).toBe('Only authors write here.');
  });
});

describe('steps', () => {
  test('every block is a step with its own id: a split keeps the first part\'s id, a pasted copy gets a new one, and both authors see the same ids', async () => {
    const derivationId = await newDerivation('Steps and their ids');
    const author = await signedInPage(demo.cookies.author);
    const lead = await signedInPage(demo.cookies.lead);
    await openDerivation(author, server.url, derivationId);
    await openDerivation(lead, server.url, derivationId);
    await author.locator('.ProseMirror').click();
    await author.keyboard.type('First step of the flow.');
    await author.keyboard.press('Enter');
    await author.keyboard.type('Second step.');
    const ids = (page: Page) => page.locator('.ProseMirror > *').evaluateAll((blocks) => blocks.map((b) => b.getAttribute('data-step-id')));
    await author.waitForFunction(() => [...document.querySelectorAll('.ProseMirror > *')].every((b) => b.getAttribute('data-step-id')));
    const [first, second] = await ids(author);
    expect(first).toBeTruthy();
    expect(second).toBeTruthy();
    expect(first).not.toBe(second);

    // Split the first line after "First step": the first part keeps the step's id.
    await author.locator('.ProseMirror > p').first().click();
    await author.keyboard.press('Home');
    for (let i = 0; i < 'First step'.length; i++) await author.keyboard.press('ArrowRight');
    await author.keyboard.press('Enter');
    await author.waitForFunction(() => document.querySelectorAll('.ProseMirror > *').length === 3 && [...document.querySelectorAll('.ProseMirror > *')].every((b) => b.getAttribute('data-step-id')));
    const afterSplit = await ids(author);
    expect(afterSplit[0]).toBe(first);
    expect(afterSplit[2]).toBe(second);
    expect(new Set(afterSplit).size).toBe(3);

    // Paste a copy of the first step (with its id) at the end: the copy gets a fresh id.
    await author.locator('.ProseMirror > p').last().click();
    await author.keyboard.press('End');
    await author.locator('.ProseMirror').evaluate((element, id) => {
      const data = new DataTransfer();
      data.setData('text/html', `<p data-step-id="${id}">A pasted copy.</p><p data-step-id="${id}">And another.</p>`);
      data.setData('text/plain', 'A pasted copy.\n\nAnd another.');
      element.dispatchEvent(new ClipboardEvent('paste', { clipboardData: data, bubbles: true, cancelable: true }));
    }, first);
    await author.locator('.ProseMirror', { hasText: 'And another.' }).waitFor();
    await author.waitForFunction(() => {
      const all = [...document.querySelectorAll('.ProseMirror > *')].map((b) => b.getAttribute('data-step-id'));
      return all.every(Boolean) && new Set(all).size === all.length;
    });
    const afterPaste = await ids(author);
    expect(afterPaste[0]).toBe(first);
    expect(new Set(afterPaste).size).toBe(afterPaste.length);
    await lead.locator('.ProseMirror', { hasText: 'And another.' }).waitFor();
    await lead.waitForFunction((count) => document.querySelectorAll('.ProseMirror > *').length === count, afterPaste.length);
    expect(await ids(lead)).toEqual(afterPaste);
  });
});

describe('math', () => {
  test('inline and display math typeset as the caret leaves them; a malformed formula shows its error and keeps its source', async () => {
    const derivationId = await newDerivation('Formulas');
    const author = await signedInPage(demo.cookies.author);
    const lead = await signedInPage(demo.cookies.lead);
    await openDerivation(author, server.url, derivationId);
    await openDerivation(lead, server.url, derivationId);
    await author.locator('.ProseMirror').click();
    await author.keyboard.type('The coupling $g^2$ flows');
    const inline = author.locator('.math-inline').first();
    await inline.locator('.katex').waitFor();
    expect(await inline.locator('annotation').textContent()).toBe('g^2');
    await lead.locator('.math-inline .katex').waitFor(); // the other author sees it typeset too

    // Clicking the typeset formula shows its source for editing.
    await inline.locator('.math-rendered').click();
    await author.locator('.math-inline.math-editing .math-source').waitFor();
    expect(await author.locator('.math-inline.math-editing .math-source').textContent()).toBe('g^2');
    await author.keyboard.press('Escape');
    await author.locator('.math-inline.math-editing').waitFor({ state: 'detached' });

    await author.keyboard.press('End');
    await author.keyboard.type(' and $\\frac{1}{2$ is broken.');
    const broken = author.locator('.math-inline.math-has-error');
    await broken.waitFor();
    expect(await broken.locator('.math-error-message').textContent()).toMatch(/^KaTeX parse error: /);
    expect(await broken.locator('.math-error-source').textContent()).toBe('$\\frac{1}{2$');
    expect(await broken.locator('.math-source').textContent()).toBe('\\frac{1}{2'); // the source is kept as written
    await lead.locator('.math-inline.math-has-error .math-error-message').waitFor();

    await author.keyboard.press('Enter');
    await author.keyboard.type('$$ ');
    // The block becomes display math before its source is typed (on a busy machine the editor may
    // read keys typed before it has turned the line into a formula as one change of plain text).
    await author.locator('.math-display.math-editing').waitFor();
    await author.keyboard.type('\\beta(g) = -\\epsilon g + \\frac{3}{2} g^2');
    await author.keyboard.press('Escape');
    const display = author.locator('.math-display').first();
    await display.locator('.katex-display').waitFor();
    expect(await display.locator('annotation').textContent()).toBe('\\beta(g) = -\\epsilon g + \\frac{3}{2} g^2');
    await lead.locator('.math-display .katex-display').waitFor();
  });
  test('a long text opens with every formula typeset, the last ones as the first (a screenful at once, those near the screen in the next frames, the rest while the page is idle)', async () => {
    const derivationId = await newDerivation('Many formulas');
    const writer = connectClient(server.url, derivationId, { cookie: demo.cookies.author, origin: server.url });
    await writer.synced();
    // 150 steps, each with an inline formula, every fifth followed by a display: far more than one
    // task typesets at once (editor/math.ts).
    const steps: DocNode[] = [];
    for (let i = 1; i <= 150; i++) {
      steps.push({ type: 'paragraph', content: [{ type: 'text', text: `Step ${i}: ` }, { type: 'mathInline', content: [{ type: 'text', text: `g_{${i}}^2` }] }] });
      if (i % 5 === 0) steps.push({ type: 'mathDisplay', content: [{ type: 'text', text: `\\beta_{${i}}(g) = -\\epsilon g + g^2` }] });
    }
    appendBlocks(writer.doc, steps);
    // Stored by the server: a second connection reads all of it.
    await expect
      .poll(async () => {
        const check = connectClient(server.url, derivationId, { cookie: demo.cookies.author, origin: server.url });
        await check.synced();
        const length = check.doc.getXmlFragment('body').length;
        check.destroy();
        return length;
      })
      .toBeGreaterThanOrEqual(180);
    writer.destroy();

    const reader = await signedInPage(demo.cookies.reader);
    await openDerivation(reader, server.url, derivationId);
    await reader.locator('.math-inline').nth(149).waitFor({ state: 'attached' });
    // A moment later nothing is left waiting, and the last formulas are typeset like the first.
    await reader.waitForFunction(() => document.querySelectorAll('.math-pending').length === 0 && document.querySelectorAll('.math-rendered .katex').length === 180, null, {
      timeout: 20_000,
    });
    expect(await reader.locator('.math-inline').nth(149).locator('annotation').textContent()).toBe('g_{150}^2');
    expect(await reader.locator('.math-display').nth(29).locator('annotation').textContent()).toBe('\\beta_{150}(g) = -\\epsilon g + g^2');
  });
});

describe('connection', () => {
  test('edits typed while the server is away survive a closed tab and reach the other author when it is back', async () => {
    const derivationId = await newDerivation('Away and back');
    const lead = await signedInPage(demo.cookies.lead);
    const author = await signedInPage(demo.cookies.author);
    await openDerivation(lead, server.url, derivationId);
    await openDerivation(author, server.url, derivationId);
    await author.locator('.ProseMirror').click();
    await author.keyboard.type('Written while connected.');
    await lead.locator('.ProseMirror', { hasText: 'Written while connected.' }).waitFor();

    await author.context().setOffline(true);
    await author.locator('[data-connection="offline"]', { hasText: 'Offline — changes kept on this device' }).waitFor();
    await author.context().setOffline(false);

    await server.kill('SIGKILL');
    await author.locator('[data-connection="reconnecting"]', { hasText: 'changes kept on this device' }).waitFor();
    await author.keyboard.press('End');
    await author.keyboard.type(' Then written while the server was away.');
    await new Promise((resolve) => setTimeout(resolve, 500)); // the browser stores the change
    await author.close();

    server = await start();
    await lead.locator('[data-connection="connected"]').waitFor({ timeout: 30_000 });
    expect(await editorText(lead)).not.toContain('while the server was away');
    const reopened = await author.context().newPage();
    await openDerivation(reopened, server.url, derivationId);
    await lead.locator('.ProseMirror', { hasText: 'Then written while the server was away.' }).waitFor();
    expect(await editorText(reopened)).toBe('Written while connected. Then written while the server was away.');
    expect(await editorText(lead)).toBe(await editorText(reopened));
  });

  test('a member removed from the group is told in words that their access was removed', async () => {
    const email = 'briefly-here@chains.example';
    const before = await readMailbox(server.url, { to: email });
    expect((await demo.as.lead.post(`/api/groups/${demo.groupId}/invitations`, { email, role: 'author' })).status).toBe(201);
    const link = linkIn(await waitForMail(server.url, { to: email, notIn: before }), '/invitations/');
    const cookie = await registerAndSignIn(server.url, {
      name: 'Briefly Here',
      email,
      password: 'briefly-here-password',
      invitation: new URL(link).pathname.split('/').pop()!,
    });
    const members = await demo.as.lead.get<{ members: { userId: string; email: string }[] }>(`/api/groups/${demo.groupId}/members`);
    const member = members.body.members.find((m) => m.email === email)!;
    const page = await signedInPage(cookie);
    await openDerivation(page, server.url, demo.derivationId);
    expect((await demo.as.lead.delete(`/api/groups/${demo.groupId}/members/${member.userId}`)).status).toBe(200);
    await page.locator('[data-connection="closed"]').waitFor();
    await page.getByRole('alert').getByText('Your access to this derivation was removed.').waitFor();
    expect(await page.locator('.ProseMirror').getAttribute('contenteditable')).toBe('false');
  });
});
