// Checked steps in Debian's Chromium, on the real server: inserting flow and claim blocks with
// live previews and verdicts, a claim that fails turning to holds when its flow is corrected, the
// evidence panel, two authors editing one flow block, the check summary, and export then import
// of the claim file.
//
// The flow is the O(n) two-loop flow in minimal subtraction (REFERENCES.md: Kleinert and
// Schulte-Frohlinde 2001, from memory): beta = -eps g + (n+8)/3 g^2 - (3n+14)/3 g^3, fixed point
// 3 eps/(n+8) + 9(3n+14)/(n+8)^3 eps^2; nu = 1/2 + (n+2)/(4(n+8)) eps + ... (Wilson 1972, from
// memory), 1/16 for walks (n = 0); at d = 4 the walk's squared size goes like t^-1 |ln t|^(1/4)
// (Wegner and Riedel 1973, from memory).
import { readFile } from 'node:fs/promises';
import type { Browser, BrowserContext, Locator, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { demoSessions, launchBrowser, openDerivation, ownTitle, signedInContext, startServer, type DemoSessions, type StartedServer } from '../helpers';

let server: StartedServer;
let browser: Browser;
let demo: DemoSessions;
const contexts: BrowserContext[] = [];

const twoLoop = '-eps*g + (n+8)/3*g^2 - (3*n+14)/3*g^3';
const wrongSign = '-eps*g + (n+8)/3*g^2 + (3*n+14)/3*g^3';

function claimFile(beta: string) {
  return {
    flow: {
      couplings: ['g'],
      parameters: { n: 0, eps: 0.1 },
      convention: 'uv',
      beta: { g: beta },
      rates: { t: '2 - ((n+2)/3*g - 5*(n+2)/18*g^2)', size: 2 },
    },
    claims: [
      { id: 'fixed-point-eps2', kind: 'fixed-point', near: { g: '3*eps/(n+8)' }, value: { g: '3*eps/(n+8) + 9*(3*n+14)/(n+8)^3*eps^2' }, order: 2 },
      { id: 'nu-first-order', kind: 'epsilon-coefficient', quantity: '1/t', near: { g: '3*eps/(n+8)' }, power: 1, value: '(n+2)/(4*(n+8))' },
      { id: 'size-log', kind: 'log-exponent', scaling: 't', observable: 'size', start: { g: 0.3 }, value: '(n+2)/(n+8)', power: 1 },
    ],
  };
}

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

async function signedInPage(cookie: string): Promise<Page> {
  const context = await signedInContext(browser, server.url, cookie, { viewport: { width: 1300, height: 1000 }, acceptDownloads: true });
  contexts.push(context);
  return context.newPage();
}

async function newDerivation(title: string): Promise<string> {
  const created = await demo.as.author.post<{ id: string }>(`/api/groups/${demo.groupId}/derivations`, { title: ownTitle(title) });
  expect(created.status).toBe(201);
  return created.body.id;
}

/** Imports a claim file through the page's file field and waits for its blocks. */
async function importFile(page: Page, file: unknown, name = 'claims.json'): Promise<void> {
  const before = await page.locator('.claim-block').count();
  await page.getByLabel('Import a claim file', { exact: true }).setInputFiles({ name, mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(file)) });
  await page.getByRole('status').filter({ hasText: `Imported ${name}` }).waitFor();
  await expect.poll(() => page.locator('.claim-block').count()).toBeGreaterThan(before);
}

function claimBlock(page: Page, number: number): Locator {
  return page.locator('.claim-block', { has: page.locator('.block-title', { hasText: new RegExp(`^Claim ${number} ·`) }) });
}

function field(block: Locator, address: string): Locator {
  return block.locator(`.block-field[data-field="${address}"]`);
}

/** Puts the caret over the whole text of a field, as a triple click would, ready to type over it. */
async function selectField(fieldLocator: Locator): Promise<void> {
  await fieldLocator.locator('.block-field-text').click();
  await fieldLocator.evaluate((element) => {
    const root = element.closest('.ProseMirror') as HTMLElement & { editor: { view: { posAtDOM(n: Node, o: number): number; focus(): void }; state: { doc: { resolve(p: number): { parent: { content: { size: number } } } } }; commands: { setTextSelection(r: { from: number; to: number }): boolean } } };
    const editor = root.editor;
    const from = editor.view.posAtDOM(element.querySelector('.block-field-text')!, 0);
    editor.commands.setTextSelection({ from, to: from + editor.state.doc.resolve(from).parent.content.size });
    editor.view.focus();
  });
}

/** A field's text as written (other authors' caret labels left out). */
function fieldText(fieldLocator: Locator): Promise<string> {
  return fieldLocator.locator('.block-field-text').evaluate((element) => {
    const copy = element.cloneNode(true) as HTMLElement;
    for (const caret of copy.querySelectorAll('.collab-caret')) caret.remove();
    return copy.textContent ?? '';
  });
}

async function verdictOf(block: Locator): Promise<string | null> {
  return block.getAttribute('data-verdict');
}

async function waitForVerdict(block: Locator, verdict: string): Promise<void> {
  await expect.poll(() => verdictOf(block), { timeout: 30_000 }).toBe(verdict);
}

describe('inserting blocks', () => {
  test('a flow block typed field by field shows typeset previews, says what is wrong, and a fixed-point claim below it holds, and says invalid input while bound to no flow', async () => {
    const page = await signedInPage(demo.cookies.author);
    await openDerivation(page, server.url, await newDerivation('Blocks typed by hand'));
    await page.locator('.ProseMirror').click();
    await page.getByRole('button', { name: 'Flow block' }).click();
    const flow = page.locator('.flow-block');
    await flow.locator('.block-title', { hasText: 'Flow block 1' }).waitFor();
    // Enter moves from field to field: name, couplings, convention, then the first row.
    await page.keyboard.type('one loop');
    for (const text of ['g', 'uv', 'eps', '0.1', 'g', '-eps*g + (n+8)/3*g^2']) {
      await page.keyboard.press('Enter');
      await page.keyboard.type(text);
    }
    const beta = field(flow, 'beta[0].value');
    await beta.locator('.block-field-message', { hasText: 'Unknown symbol "n" (character 11); a flow expression may use the couplings (g), the parameters (eps) and the rate names (none)' }).waitFor();
    await field(flow, 'convention').locator('.katex').waitFor();

    await flow.getByRole('button', { name: 'Add parameter' }).click();
    await page.keyboard.type('n');
    await page.keyboard.press('Enter');
    await page.keyboard.type('0');
    await beta.locator('.katex').waitFor();
    expect(await beta.locator('.block-field-message').count()).toBe(0);
    expect(await beta.locator('.katex-mathml annotation').textContent()).toContain('\\varepsilon');

    // A claim inserted below binds to the flow block above it.
    await page.keyboard.press('Enter');
    await page.keyboard.press('Enter');
    await page.getByLabel('Insert a claim block').selectOption('fixed-point');
    const claim = claimBlock(page, 1);
    await claim.waitFor();
    expect(await claim.locator('.block-title').textContent()).toBe('Claim 1 · Fixed point');
    await page.keyboard.type('wilson-fisher');
    await page.keyboard.press('Enter');
    await page.keyboard.type('g = 3*eps/(n+8)');
    await waitForVerdict(claim, 'holds');
    expect(await claim.locator('.verdict-badge').innerText()).toBe('holds');
    // One loop at n = 0, eps = 0.1: g* = 3 eps / 8 = 0.0375.
    expect(await claim.locator('.block-verdict-message').textContent()).toContain('fixed point at g = 0.0375');
    const binding = claim.locator('.block-binding-choice');
    expect(await binding.textContent()).toBe('the flow block above (1)');
    // Choosing no flow leaves a fixed point with nothing to check against; choosing the flow again restores it.
    await binding.click();
    await claim.locator('select.block-select').selectOption('none');
    expect(await binding.textContent()).toBe('no flow');
    await waitForVerdict(claim, 'invalid');
    await binding.click();
    await claim.locator('select.block-select').selectOption('');
    await waitForVerdict(claim, 'holds');
    expect(await binding.textContent()).toBe('the flow block above (1)');
  });

  test('a claim block of every kind can be inserted, each with its own fields, and a block missing its required fields says invalid input', async () => {
    const page = await signedInPage(demo.cookies.author);
    await openDerivation(page, server.url, await newDerivation('Every kind of claim'));
    await page.locator('.ProseMirror').click();
    const kinds: [string, string, string[]][] = [
      ['identity', 'Identity', ['lhs', 'rhs', 'domain']],
      ['order', 'Order', ['lhs', 'rhs', 'variable', 'order']],
      ['coefficient', 'Coefficient', ['of', 'variable', 'at', 'power', 'value']],
      ['integral', 'Integral', ['integrand', 'variable', 'from', 'to', 'value']],
      ['fixed-point', 'Fixed point', ['near', 'value', 'order', 'parameter']],
      ['stability', 'Stability', ['near', 'eigenvalues', 'relevant', 'form']],
      ['epsilon-coefficient', 'Epsilon coefficient', ['quantity', 'near', 'power', 'value']],
      ['log-exponent', 'Log exponent', ['scaling', 'observable', 'start', 'value', 'power']],
    ];
    for (const [i, [kind, label, fields]] of kinds.entries()) {
      await page.getByLabel('Insert a claim block').selectOption(kind);
      const block = claimBlock(page, i + 1);
      await block.waitFor();
      expect(await block.locator('.block-title').textContent()).toBe(`Claim ${i + 1} · ${label}`);
      for (const key of ['name', ...fields, 'tolerance', 'settings', 'note']) await field(block, key).waitFor();
      await waitForVerdict(block, 'invalid');
      // Out of the block, below it, for the next one.
      await page.keyboard.press('Control+End');
    }
    // Identity: typed in full, it holds (the binomial square, any handbook).
    const identity = claimBlock(page, 1);
    await selectField(field(identity, 'lhs'));
    await page.keyboard.type('(1+x)^2');
    await selectField(field(identity, 'rhs'));
    await page.keyboard.type('1 + 2*x + x^2');
    await waitForVerdict(identity, 'holds');
    // A flow kind with no flow block above it says so.
    expect(await claimBlock(page, 5).locator('.block-verdict-message').textContent()).toContain('a fixed point claim needs a flow block');
    const summary = page.getByRole('list', { name: 'Claims and their verdicts' });
    expect(await summary.locator('li').count()).toBe(8);
    await page.locator('[data-check-counts]').getByText('1 holds').waitFor();
    await page.locator('[data-check-counts]').getByText('7 invalid input').waitFor();
  });
});

describe('live verdicts', () => {
  test('a claim that fails turns to holds when the sign of the two-loop term in its flow is corrected', async () => {
    const page = await signedInPage(demo.cookies.author);
    await openDerivation(page, server.url, await newDerivation('A sign to fix'));
    await page.locator('.ProseMirror').click();
    await importFile(page, claimFile(wrongSign));
    const fixedPoint = claimBlock(page, 1);
    await waitForVerdict(fixedPoint, 'fails');
    // The eps coefficient of nu comes from one loop: it holds either way.
    await waitForVerdict(claimBlock(page, 2), 'holds');

    await selectField(field(page.locator('.flow-block'), 'beta[0].value'));
    await page.keyboard.type(twoLoop);
    await waitForVerdict(fixedPoint, 'holds');
    // The verdict shown is for the flow as it now stands.
    expect(await fixedPoint.getAttribute('data-verdict-input')).toBe(await fixedPoint.getAttribute('data-input'));
    expect(await fixedPoint.locator('.block-verdict-message').textContent()).toContain('agrees with the claimed series through eps^2');
    await waitForVerdict(claimBlock(page, 2), 'holds');
  });

  test('the evidence panel shows measured beside claimed values, the method, the convergence plot, a tighter re-run, and says it is evidence, not a proof', async () => {
    const page = await signedInPage(demo.cookies.reviewer);
    const derivationId = await newDerivation('Evidence to read');
    const author = await signedInPage(demo.cookies.author);
    await openDerivation(author, server.url, derivationId);
    await author.locator('.ProseMirror').click();
    await importFile(author, claimFile(twoLoop));

    await openDerivation(page, server.url, derivationId);
    const nu = claimBlock(page, 2);
    await waitForVerdict(nu, 'holds');
    await nu.getByRole('button', { name: 'Evidence' }).click();
    const panel = page.locator('[data-evidence-panel]');
    await panel.waitFor();
    expect(await panel.locator('[data-evidence-caveat]').textContent()).toContain('A numerical check is evidence, not a proof');
    // nu = 1/2 + eps/16 + ... for walks: claimed 0.0625, measured within the tolerance.
    expect(await panel.locator('[data-value="Claimed"]').textContent()).toBe('0.0625');
    const measured = Number(await panel.locator('[data-value="Measured"]').textContent());
    expect(Math.abs(measured - 1 / 16)).toBeLessThan(1e-6);
    expect(await panel.locator('[data-value="Uncertainty"]').textContent()).toMatch(/^± \d\.\de-\d+$/);
    expect(await panel.getByRole('heading', { name: 'Method' }).count()).toBe(1);
    expect(await panel.getByText('Chebyshev', { exact: false }).count()).toBeGreaterThan(0);
    await panel.locator('svg').first().waitFor();

    await panel.getByRole('button', { name: 'Run again with tighter settings' }).click();
    await panel.locator('[data-tight-value="Measured"]').waitFor({ timeout: 30_000 });
    const tighter = Number(await panel.locator('[data-tight-value="Measured"]').textContent());
    expect(Math.abs(tighter - 1 / 16)).toBeLessThan(1e-6);
    await panel.getByRole('heading', { name: 'Tighter settings' }).waitFor();

    // The log exponent's convergence plot: the effective exponent against 1/ln of RG time.
    await page.keyboard.press('Escape');
    await panel.waitFor({ state: 'detached' });
    const log = claimBlock(page, 3);
    await waitForVerdict(log, 'holds');
    await log.getByRole('button', { name: 'Evidence' }).click();
    await panel.getByText('Effective exponent of |ln t0| for size').first().waitFor();
    expect(await panel.locator('[data-value="Measured"]').textContent()).toMatch(/^p = 0\.25\d*, x = 1/);
  });

  test('two authors edit one flow block and both see the re-checked verdict', async () => {
    const derivationId = await newDerivation('One flow, two authors');
    const author = await signedInPage(demo.cookies.author);
    const lead = await signedInPage(demo.cookies.lead);
    await openDerivation(author, server.url, derivationId);
    await author.locator('.ProseMirror').click();
    await importFile(author, claimFile(twoLoop));
    await openDerivation(lead, server.url, derivationId);
    for (const page of [author, lead]) await waitForVerdict(claimBlock(page, 1), 'holds');

    // The lead breaks the two-loop term; both see the fixed point fail.
    await selectField(field(lead.locator('.flow-block'), 'beta[0].value'));
    await lead.keyboard.type(wrongSign);
    for (const page of [author, lead]) await waitForVerdict(claimBlock(page, 1), 'fails');
    expect(await fieldText(field(author.locator('.flow-block'), 'beta[0].value'))).toBe(wrongSign);

    // The author puts it right in the same field; both see it hold again.
    await selectField(field(author.locator('.flow-block'), 'beta[0].value'));
    await author.keyboard.type(twoLoop);
    for (const page of [author, lead]) await waitForVerdict(claimBlock(page, 1), 'holds');
    expect(await fieldText(field(lead.locator('.flow-block'), 'beta[0].value'))).toBe(twoLoop);

    // Each edits another field of the block at once: both edits are kept.
    await selectField(field(lead.locator('.flow-block'), 'name'));
    await lead.keyboard.type('two loops');
    await selectField(field(author.locator('.flow-block'), 'parameter[1].value'));
    await author.keyboard.type('0.05');
    for (const page of [author, lead]) {
      await page.locator('.flow-block .block-title', { hasText: 'Flow block 1: two loops' }).waitFor();
      await expect.poll(() => fieldText(field(page.locator('.flow-block'), 'parameter[1].value'))).toBe('0.05');
      await waitForVerdict(claimBlock(page, 1), 'holds');
    }
  });
});

describe('checks that run long or cannot run', () => {
  test('a long check says it is running and can be cancelled; left alone it stops at its time bound and says so', async () => {
    const page = await signedInPage(demo.cookies.author);
    await openDerivation(page, server.url, await newDerivation('A slow integral'));
    await page.locator('.ProseMirror').click();
    // sin(1/x)/x oscillates without end near 0: asked for 1e-15, the quadrature never settles.
    const slow = { id: 'slow', kind: 'integral', integrand: 'sin(1/x)/x', variable: 'x', from: 0, to: 1, value: 0.6, settings: { maxIntervals: 10_000_000, relativeTolerance: 1e-15, absoluteTolerance: 1e-300 } };
    const deep = { id: 'deep', kind: 'identity', lhs: `${'('.repeat(600)}x${')'.repeat(600)}`, rhs: 'x' };
    await importFile(page, { flow: { couplings: [], parameters: {}, beta: {} }, claims: [slow, deep] });
    const block = claimBlock(page, 1);
    await waitForVerdict(block, 'checking');
    const cancel = block.getByRole('button', { name: 'Cancel' });
    await cancel.waitFor();
    await cancel.click();
    await waitForVerdict(block, 'cancelled');
    const again = block.getByRole('button', { name: 'Check again' });
    await again.waitFor();
    await new Promise((resolve) => setTimeout(resolve, 2500));
    expect(await verdictOf(block)).toBe('cancelled');

    await again.click();
    await waitForVerdict(block, 'inconclusive');
    expect(await block.locator('.block-verdict-message').textContent()).toBe('stopped at the time bound of 2000 ms before reaching a verdict');
    await block.getByRole('button', { name: 'Check again' }).waitFor();

    // Nothing typed can stop the checks: an expression nested 600 deep is refused with a reason.
    const nested = claimBlock(page, 2);
    await waitForVerdict(nested, 'invalid');
    expect(await nested.locator('.block-verdict-message').textContent()).toContain('nested too deeply');
    await field(nested, 'lhs').locator('.block-field-message', { hasText: 'nested too deeply' }).waitFor();
  });
});

describe('the check summary and the claim file', () => {
  test('choosing a claim in the summary brings it into view', async () => {
    const page = await signedInPage(demo.cookies.reader);
    await openDerivation(page, server.url, demo.derivationId);
    const summary = page.getByRole('list', { name: 'Claims and their verdicts' });
    // The demo derivation: five claims hold and one deliberately fails.
    await page.locator('[data-check-counts]').getByText('5 hold').waitFor({ timeout: 30_000 });
    await page.locator('[data-check-counts]').getByText('1 fails').waitFor();
    const last = summary.locator('li').last();
    expect(await last.textContent()).toContain('Log exponent');
    await last.getByRole('button').click();
    const target = claimBlock(page, 6);
    await expect.poll(() => target.evaluate((element) => {
      const box = element.getBoundingClientRect();
      return box.top >= 0 && box.top < window.innerHeight;
    })).toBe(true);
    // A reader cannot edit or import, but reads the verdicts.
    expect(await page.getByLabel('Import a claim file', { exact: true }).count()).toBe(0);
    expect(await claimBlock(page, 5).getAttribute('data-verdict')).toBe('fails');
  });

  test('a claim file exported from one derivation and imported into another gives the same verdicts; a bad file inserts nothing and names the field', async () => {
    const page = await signedInPage(demo.cookies.author);
    await openDerivation(page, server.url, demo.derivationId);
    await page.locator('[data-check-counts]').getByText('5 hold').waitFor({ timeout: 30_000 });
    const verdictsBefore = await page.locator('.claim-block').evaluateAll((blocks) => blocks.map((b) => (b as HTMLElement).dataset.verdict));

    // The demo has claims on its flow and one without a flow: two claim files to choose from.
    await page.getByRole('button', { name: 'Export claim file' }).click();
    const saveFlow = page.waitForEvent('download');
    await page.getByRole('button', { name: /^Flow block 1: .*\(5 claims\)$/ }).click();
    const flowFile = JSON.parse(await readFile((await (await saveFlow).path())!, 'utf8')) as { flow: { couplings: string[] }; claims: { id: string }[] };
    expect(flowFile.flow.couplings).toEqual(['g']);
    expect(flowFile.claims.map((c) => c.id)).toEqual(['chain-fixed-point', 'chain-fixed-point-attracts', 'nu-first-order', 'nu-second-order', 'size-log-exponent']);
    const saveAlone = page.waitForEvent('download');
    await page.getByRole('button', { name: /^Claims without a flow \(1 claim\)$/ }).click();
    const aloneFile = JSON.parse(await readFile((await (await saveAlone).path())!, 'utf8')) as unknown;

    await openDerivation(page, server.url, await newDerivation('Imported checks'));
    await page.locator('.ProseMirror').click();
    // A misspelt field: refused, naming it, nothing inserted.
    await page.getByLabel('Import a claim file', { exact: true }).setInputFiles({
      name: 'bad.json',
      mimeType: 'application/json',
      buffer: Buffer.from(JSON.stringify({ ...flowFile, claims: [{ ...flowFile.claims[0], tolerence: 1e-6 }] })),
    });
    const alert = page.getByRole('alert').filter({ hasText: 'Nothing was inserted' });
    await alert.waitFor();
    expect(await alert.textContent()).toContain('claims[0].tolerence');
    expect(await page.locator('.flow-block, .claim-block').count()).toBe(0);

    await importFile(page, flowFile, 'flow.json');
    await page.keyboard.press('Control+End');
    await importFile(page, aloneFile, 'alone.json');
    await page.locator('[data-check-counts]').getByText('5 hold').waitFor({ timeout: 30_000 });
    const verdictsAfter = await page.locator('.claim-block').evaluateAll((blocks) => blocks.map((b) => (b as HTMLElement).dataset.verdict));
    // Same claims, same verdicts (the identity now comes last).
    expect([...verdictsAfter].sort()).toEqual([...verdictsBefore].sort());
    expect(verdictsAfter).toEqual(['holds', 'holds', 'holds', 'fails', 'holds', 'holds']);
  });
});
