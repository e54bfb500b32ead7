// The trajectory plot block in the whiteboard of the real server: an author inserts one below a
// flow block and sees the fixed point marked; editing the flow moves it; its settings change from
// buttons naming them; a reader of the group follows the same plot, hovering its fixed point, with
// its settings shown but not changeable.
//
// The flow is the O(n) two-loop flow (REFERENCES.md: Kleinert and Schulte-Frohlinde 2001, from
// memory): beta = -eps g + (n+8)/3 g^2 - (3n+14)/3 g^3, g* = 3 eps/(n+8) + 9(3n+14)/(n+8)^3 eps^2
// + O(eps^3), here at n = 0.
import type { Browser, BrowserContext, Locator, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { demoDatasetName } from '../../db/demoDataset';
import { demoSessions, launchBrowser, openDerivation, signedInContext, startServer, type DemoSessions, type StartedServer } from '../helpers';

let server: StartedServer;
let browser: Browser;
let demo: DemoSessions;
let derivationId: string;
const contexts: BrowserContext[] = [];

const claimFile = {
  flow: { couplings: ['g'], parameters: { n: 0, eps: 0.1 }, convention: 'uv', beta: { g: '-eps*g + (n+8)/3*g^2 - (3*n+14)/3*g^3' } },
  claims: [{ id: 'chain-fixed-point', kind: 'fixed-point', near: { g: '3*eps/(n+8)' } }],
};

/** g* through eps^2 at n = 0. */
const seriesFixedPoint = (eps: number) => (3 * eps) / 8 + ((9 * 14) / 512) * eps ** 2;

beforeAll(async () => {
  server = await startServer({ demo: true });
  demo = await demoSessions(server.url);
  browser = await launchBrowser();
  const created = await demo.as.author.post<{ id: string }>(`/api/groups/${demo.groupId}/derivations`, { title: 'A plotted chain coupling' });
  expect(created.status).toBe(201);
  derivationId = created.body.id;
});

afterAll(async () => {
  for (const context of contexts) await context.close().catch(() => undefined);
  await browser?.close();
  await server?.stop();
});

async function signedInPage(cookie: string): Promise<Page> {
  const context = await signedInContext(browser, server.url, cookie, { viewport: { width: 1300, height: 1100 }, acceptDownloads: true });
  contexts.push(context);
  const page = await context.newPage();
  await openDerivation(page, server.url, derivationId);
  return page;
}

function plot(page: Page): Locator {
  return page.locator('[data-trajectory-plot]').first();
}

/** The position of the attractive fixed point as the plot's key says it. */
async function attractiveAt(page: Page): Promise<number> {
  const key = (await plot(page).getByRole('list', { name: 'Marked points' }).textContent()) ?? '';
  return Number(/attractive fixed point — at g = ([\d.]+)/.exec(key)?.[1]);
}

describe('a trajectory plot in the whiteboard', () => {
  let author: Page;

  test('inserted below a flow block, it follows that flow and marks its fixed point as attractive', async () => {
    author = await signedInPage(demo.cookies.author);
    await author.getByLabel('Import a claim file', { exact: true }).setInputFiles({ name: 'chain.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(claimFile)) });
    await expect.poll(() => author.locator('.claim-block').count()).toBeGreaterThan(0);
    await author.locator('.ProseMirror').evaluate((element) => (element as HTMLElement & { editor: { commands: { focus(p: string): boolean } } }).editor.commands.focus('end'));
    await author.getByRole('button', { name: 'Trajectory plot' }).click();
    await plot(author).locator('svg.recharts-surface').waitFor({ timeout: 30_000 });
    // One coupling: the plot is drawn against RG time, from the start the block suggested.
    expect(await plot(author).locator('[data-plot-field="start"]').first().textContent()).toBe('g = 0.1');
    await expect.poll(() => plot(author).getByTestId('plot-frame').getAttribute('data-markers'), { timeout: 20_000 }).toContain('attractive fixed point');
    expect(Math.abs((await attractiveAt(author)) - seriesFixedPoint(0.1))).toBeLessThan(1e-3);
    expect(await plot(author).locator('svg.recharts-surface').textContent()).toContain('RG time l');
  });

  test('editing the flow moves the marked fixed point', async () => {
    const eps = author.locator('.flow-block [data-row="parameter"]').filter({ has: author.locator('[data-field$=".name"] .block-field-text', { hasText: /^eps$/ }) }).locator('[data-field$=".value"] .block-field-text');
    await eps.click();
    await author.keyboard.press('End');
    await author.keyboard.press('Backspace');
    await author.keyboard.type('2');
    // eps = 0.2: the eps^3 term is of order 1e-3 here.
    await expect.poll(() => attractiveAt(author), { timeout: 20_000 }).toBeGreaterThan(0.07);
    expect(Math.abs((await attractiveAt(author)) - seriesFixedPoint(0.2))).toBeLessThan(4e-3);
  });

  test('its settings are buttons naming the choice: choosing linear RG time redraws it, a span that is not a positive number is refused and said', async () => {
    const controls = plot(author).locator('.plot-block-controls');
    // No form control until one is used (Chromium's autofill reads every one on the page).
    expect(await controls.locator('select, input').count()).toBe(0);
    const attrs = () =>
      author.locator('.ProseMirror').evaluate((element) => {
        const { state } = (element as HTMLElement & { editor: { state: { doc: { descendants(f: (n: { type: { name: string }; attrs: Record<string, unknown> }) => void): void } } } }).editor;
        let found: Record<string, unknown> = {};
        state.doc.descendants((node) => {
          if (node.type.name === 'trajectoryPlot') found = node.attrs;
        });
        return found;
      });
    await controls.getByRole('button', { name: 'RG time axis: logarithmic' }).click();
    const axis = controls.getByRole('combobox', { name: 'RG time axis' });
    await axis.selectOption('linear');
    await controls.getByRole('button', { name: 'RG time axis: linear' }).waitFor();
    expect(await controls.locator('select').count()).toBe(0);
    expect((await attrs()).timeScale).toBe('linear');
    await expect.poll(() => attractiveAt(author), { timeout: 20_000 }).toBeGreaterThan(0.07);

    await controls.getByRole('button', { name: 'RG time up to: automatic' }).click();
    const span = controls.getByRole('textbox', { name: 'RG time up to' });
    await span.fill('-3');
    await span.press('Enter');
    await controls.getByRole('alert').filter({ hasText: '"-3" is not a positive number; it stays automatic' }).waitFor();
    expect(await span.getAttribute('aria-invalid')).toBe('true');
    expect((await attrs()).span ?? null).toBeNull();
    await span.fill('40');
    await span.press('Enter');
    await controls.getByRole('button', { name: 'RG time up to: 40' }).waitFor();
    expect(await controls.getByRole('alert').count()).toBe(0);
    expect((await attrs()).span).toBe(40);
    await plot(author).locator('svg.recharts-surface').waitFor();

    // The group's datasets are read when the author comes to choose one; the data are drawn beside the flow.
    await controls.getByRole('button', { name: 'Dataset beside the flow: none' }).click();
    await controls.getByRole('combobox', { name: 'Dataset beside the flow' }).selectOption({ label: `${demoDatasetName} (16 rows, error bars)` });
    await controls.getByRole('button', { name: `Dataset beside the flow: ${demoDatasetName} (16 rows, error bars)` }).waitFor();
    await expect.poll(() => plot(author).getByTestId('plot-frame').getAttribute('data-series'), { timeout: 20_000 }).toContain(demoDatasetName);
  });

  test('a reader follows the same plot: hovering the fixed point reads g, and the settings cannot be changed', async () => {
    const reader = await signedInPage(demo.cookies.reader);
    await plot(reader).locator('svg.recharts-surface').waitFor({ timeout: 30_000 });
    await expect.poll(() => plot(reader).getByTestId('plot-frame').getAttribute('data-markers'), { timeout: 20_000 }).toContain('attractive fixed point');
    const marker = plot(reader).locator('[data-marker-label="attractive fixed point"] circle').first();
    await plot(reader).getByTestId('plot-frame').scrollIntoViewIfNeeded();
    const box = (await marker.boundingBox())!;
    await reader.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
    await expect.poll(() => plot(reader).getByTestId('plot-readout').textContent()).toMatch(/attractive fixed point: g = 0\.08\d*/);
    const settings = plot(reader).locator('.plot-block-controls button');
    expect(await settings.count()).toBeGreaterThan(5);
    for (const setting of await settings.all()) expect(await setting.isDisabled()).toBe(true);
    expect(await plot(reader).getByRole('button', { name: 'RG time up to: 40' }).count()).toBe(1);
    expect(await plot(reader).getByRole('button', { name: 'Remove plot' }).count()).toBe(0);
  });
});
