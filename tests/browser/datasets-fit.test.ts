// The dataset fit in Chromium on a page of its own (the fit panel and its fit worker, built by
// Vite; no server): a million-row dataset is fitted off the page's main thread — the panel says
// "Fitting…", keeps painting meanwhile, keeps the last fit on screen, faded, while a new one runs —
// and the worker's answer is the fit flow/fit.ts gives in Node for the same numbers, which recovers
// the law the data were drawn from within its reported uncertainty.
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import type { ViteDevServer } from 'vite';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { formatNumber } from '../../components/datasets/FitPanel';
import { fitPowerLog } from '../../flow/fit';
import { launchBrowser, repoRoot } from '../helpers';
import { serveHarness } from '../helpers/harness';
import { LAW, walkSeries } from './fit-harness/walkData';

const ROWS = 1_000_000;
let vite: ViteDevServer;
let pageUrl: string;
let browser: Browser;
let page: Page;

beforeAll(async () => {
  ({ vite, url: pageUrl } = await serveHarness('fit-harness'));
  browser = await launchBrowser();
  page = await (await browser.newContext({ viewport: { width: 1100, height: 1400 } })).newPage();
});

afterAll(async () => {
  await browser?.close();
  await vite?.close();
});

/** Whether the page paints two frames while the panel still says "Fitting…" (a fit on the main thread would hold the frames until it is done). */
function paintsWhileFitting(): Promise<boolean> {
  return page.evaluate(
    () => new Promise<boolean>((resolve) => requestAnimationFrame(() => requestAnimationFrame(() => resolve(document.querySelector('[data-testid="fitting"]') !== null)))),
  );
}

test('a million-row dataset is fitted in the fit worker: the panel says "Fitting…", then shows the fit', async () => {
  await page.goto(`${pageUrl}?rows=${ROWS}`);
  const fitting = page.getByTestId('fitting').first();
  await fitting.waitFor({ timeout: 90_000 });
  expect(await fitting.textContent()).toContain('1,000,000 points');
  expect(page.workers().some((worker) => worker.url().includes('fit.worker'))).toBe(true);
  await page.getByTestId('fit-result').waitFor({ timeout: 90_000 });
  await expect.poll(() => page.getByTestId('fitting').count(), { timeout: 90_000 }).toBe(0);
});

test('a new setting keeps the last fit on screen, faded, until the worker answers; the answer is the fit Node computes and recovers the law', async () => {
  const result = page.getByTestId('fit-result');
  const before = await page.getByTestId('fit-a').textContent();
  await page.getByRole('radio').nth(2).check(); // p: free
  await page.getByTestId('fitting').first().waitFor();
  expect(await paintsWhileFitting()).toBe(true);
  expect(await result.getAttribute('aria-busy')).toBe('true');
  expect(await page.getByTestId('fit-a').textContent()).toBe(before);
  await expect.poll(() => result.getAttribute('aria-busy'), { timeout: 90_000 }).toBe('false');

  // The same numbers fitted by flow/fit.ts in Node: the worker's answer, digit for digit as shown.
  const series = walkSeries(ROWS);
  const fit = fitPowerLog({ x: series.x.values, y: series.y.values, sigma: series.sigma!.values }, { a: null, p: null });
  const shown = (name: 'a' | 'p') => page.getByTestId(`fit-${name}`).textContent();
  expect(await shown('a')).toBe(`${formatNumber(fit.a.value, 6)} ± ${formatNumber(fit.a.uncertainty, 2)}`);
  expect(await shown('p')).toBe(`${formatNumber(fit.p.value, 6)} ± ${formatNumber(fit.p.uncertainty, 2)}`);
  // The law the data were drawn from (walkData.ts), within four reported standard deviations.
  expect(Math.abs(fit.a.value - LAW.a)).toBeLessThan(4 * fit.a.uncertainty);
  expect(Math.abs(fit.p.value - LAW.p)).toBeLessThan(4 * fit.p.uncertainty);

  const agreement = page.getByTestId('agreement');
  await expect.poll(() => agreement.getAttribute('data-verdict'), { timeout: 90_000 }).toBe('agrees');
  expect(await agreement.textContent()).toMatch(/The data agree with p = 0\.25/);
});

test('a y-axis label longer than the plot is tall is wrapped and shown whole inside the frame', async () => {
  await page.goto(`${pageUrl}?rows=200&y=${encodeURIComponent('mean-square end-to-end distance of the walk, averaged over every sample')}`);
  const frame = page.getByTestId('plot-frame');
  const label = frame.locator('[data-axis-label="y"] text');
  await expect.poll(() => label.count(), { timeout: 60_000 }).toBeGreaterThan(1);
  expect((await label.allTextContents()).join(' ')).toBe('mean-square end-to-end distance of the walk, averaged over every sample');
  const chart = (await frame.locator('svg.recharts-surface').first().boundingBox())!;
  const ticks = await frame.locator('.recharts-yAxis .recharts-cartesian-axis-tick-value').evaluateAll((nodes) => nodes.map((n) => n.getBoundingClientRect().left));
  for (const line of await label.all()) {
    const box = (await line.boundingBox())!;
    expect(box.y).toBeGreaterThanOrEqual(chart.y);
    expect(box.y + box.height).toBeLessThanOrEqual(chart.y + chart.height);
    expect(box.x).toBeGreaterThanOrEqual(chart.x);
    // Left of every tick value: the lines do not run into the axis' numbers.
    expect(box.x + box.width).toBeLessThanOrEqual(Math.min(...ticks));
  }
  await page.screenshot({ path: path.join(repoRoot, 'tests/.artifacts/plot-long-y-label.png') });
});
