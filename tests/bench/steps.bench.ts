// Benchmark of checked steps in Chromium (`npm run bench:steps`; needs a production build in
// MARGINALIA_DIST_DIR, e.g. `MARGINALIA_DIST_DIR=.next-bench npx next build` first): the demo
// derivation grown to 200 steps with 40 claims (tests/bench/stepsDocument.ts), then
// - first render: from navigation to the first paint, to the whole document in the editor, and to
//   a verdict on every claim (a fresh browser profile each time, so nothing comes from the device);
// - keystroke to every dependent verdict: a digit typed into a parameter of a flow block with ten
//   claims, until each of them shows its verdict for the new input;
// - the main thread's longest task (PerformanceObserver 'longtask') while those checks run.
// Goals: first render under 1.5 s, verdicts within 300 ms, no main-thread task over 50 ms.
// Reports medians (and the spread); asserts nothing about time.
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { demoSessions, launchBrowser, signedInContext, startServer, type DemoSessions, type StartedServer } from '../helpers';
import { BENCH_VIEWPORT, FINAL_VERDICTS, growDemoDerivation, TARGET_CLAIMS, TARGET_STEPS, waitForDocumentShown, waitForEveryVerdict } from './stepsDocument';

const LOADS = Number(process.env.BENCH_LOADS ?? 7);
const KEYSTROKES = Number(process.env.BENCH_KEYSTROKES ?? 15);
const GOALS = { firstRenderMs: 1500, verdictsMs: 300, longestTaskMs: 50 };

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = Math.floor(sorted.length / 2);
  return sorted.length % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
}

function spread(values: number[]): string {
  const sorted = [...values].sort((a, b) => a - b);
  return `median ${median(values).toFixed(0)} ms (min ${sorted[0]!.toFixed(0)}, max ${sorted.at(-1)!.toFixed(0)}, n = ${values.length})`;
}

/** A signed-in browser profile of its own that keeps the page's long tasks from its very start. */
async function benchContext(browser: Browser, server: StartedServer, cookie: string): Promise<BrowserContext> {
  const context = await signedInContext(browser, server.url, cookie, { viewport: BENCH_VIEWPORT });
  // Long tasks from the very start of the page, kept on the window.
  await context.addInitScript(() => {
    const w = window as unknown as { __longTasks: { start: number; duration: number }[] };
    w.__longTasks = [];
    try {
      new PerformanceObserver((list) => {
        for (const entry of list.getEntries()) w.__longTasks.push({ start: entry.startTime, duration: entry.duration });
      }).observe({ type: 'longtask', buffered: true });
    } catch {
      // no long-task timing in this browser
    }
  });
  return context;
}

interface LoadTimes {
  firstPaint: number;
  documentShown: number;
  everyVerdict: number;
  longestTask: number;
  /** The longest task from the check worker starting to every claim showing a verdict. */
  longestWhileChecking: number;
}

async function loadOnce(browser: Browser, server: StartedServer, demo: DemoSessions): Promise<LoadTimes> {
  const context = await benchContext(browser, server, demo.cookies.author);
  const page = await context.newPage();
  await page.goto(`${server.url}/derivations/${demo.derivationId}`);
  const documentShown = await waitForDocumentShown(page);
  const everyVerdict = await waitForEveryVerdict(page);
  const paint = await page.evaluate(() => performance.getEntriesByName('first-contentful-paint')[0]?.startTime ?? NaN);
  const { longestTask, longestWhileChecking } = await page.evaluate((until) => {
    const tasks = (window as unknown as { __longTasks: { start: number; duration: number }[] }).__longTasks;
    const from = performance.getEntriesByName('marginalia:check-worker-ready', 'mark')[0]?.startTime ?? Infinity;
    const checking = tasks.filter((t) => t.start + t.duration > from && t.start <= until);
    return { longestTask: Math.max(0, ...tasks.map((t) => t.duration)), longestWhileChecking: Math.max(0, ...checking.map((t) => t.duration)) };
  }, everyVerdict);
  await context.close();
  return { firstPaint: paint, documentShown, everyVerdict, longestTask, longestWhileChecking };
}

/** The text of the value of the flow block's parameter `name` (its editable field text). */
async function parameterField(page: Page, flowStepId: string, name: string) {
  const rows = page.locator(`[data-step-id="${flowStepId}"] [data-row="parameter"]`);
  const count = await rows.count();
  for (let i = 0; i < count; i++) {
    const text = rows.nth(i).locator('[data-field$=".name"] .block-field-text');
    if (((await text.textContent()) ?? '').trim() === name) return rows.nth(i).locator('[data-field$=".value"] .block-field-text');
  }
  throw new Error(`no parameter ${name} in the flow block`);
}

/**
 * Waits until each dependent claim shows a final verdict for the input its block holds now (after
 * at least one change); returns the time of the last change. Evaluated when a verdict changes, not
 * on every frame, so the wait adds no work to the frames measured. A string, not a function: the
 * test runner's compiler would name the inner function with a helper the page does not have.
 */
async function dependentVerdictsChecked(page: Page, ids: string[]): Promise<number> {
  return (await page.evaluate(`new Promise((resolve, reject) => {
    const ids = ${JSON.stringify(ids)};
    const blocks = ids.map((id) => document.querySelector('[data-step-id="' + id + '"]'));
    const final = ${JSON.stringify(FINAL_VERDICTS)};
    const limit = setTimeout(() => reject(new Error('the dependent verdicts did not all come within 30 s')), 30000);
    const check = () => {
      let last = 0;
      for (let i = 0; i < ids.length; i++) {
        const changes = window.__verdicts[ids[i]];
        const block = blocks[i];
        // Checked: a final verdict, for the input the block holds now (data-verdict-input).
        const checked = final.includes(block.dataset.verdict ?? '') && block.dataset.verdictInput === block.dataset.input;
        if (changes.length === 0 || !checked) return;
        last = Math.max(last, changes[changes.length - 1].at);
      }
      window.__onVerdictChange = undefined;
      clearTimeout(limit);
      resolve(last);
    };
    window.__onVerdictChange = check;
    check();
  })`)) as number;
}

async function keystrokes(browser: Browser, server: StartedServer, demo: DemoSessions, grown: { editedFlow: string; dependentClaims: string[] }) {
  const context = await benchContext(browser, server, demo.cookies.author);
  const page = await context.newPage();
  await page.goto(`${server.url}/derivations/${demo.derivationId}`);
  await page.waitForFunction(
    ({ ids, final }) => ids.every((id) => final.includes((document.querySelector(`[data-step-id="${id}"]`) as HTMLElement | null)?.dataset.verdict ?? '')),
    { ids: grown.dependentClaims, final: FINAL_VERDICTS },
    { timeout: 120_000, polling: 'raf' },
  );
  // Each dependent claim's verdict changes are recorded with their time.
  await page.evaluate((ids) => {
    const w = window as unknown as { __verdicts: Record<string, { at: number; state: string }[]>; __onVerdictChange?: () => void };
    w.__verdicts = {};
    for (const id of ids) {
      const block = document.querySelector(`[data-step-id="${id}"]`) as HTMLElement;
      w.__verdicts[id] = [];
      new MutationObserver(() => {
        w.__verdicts[id]!.push({ at: performance.now(), state: block.dataset.verdict ?? '' });
        w.__onVerdictChange?.();
      }).observe(block, { attributes: true, attributeFilter: ['data-verdict', 'data-verdict-input'] });
    }
  }, grown.dependentClaims);

  const field = await parameterField(page, grown.editedFlow, 'eps');
  await field.click();
  await page.keyboard.press('End');
  // The click brought the flow's plot near the screen: it is followed and drawn first (a plot's
  // first drawing belongs to scrolling to it, not to the keystrokes measured).
  await page.waitForFunction(
    () =>
      [...document.querySelectorAll('[data-trajectory-plot]')]
        .filter((plot) => {
          const box = plot.getBoundingClientRect();
          return box.bottom > -600 && box.top < innerHeight + 600;
        })
        .every((plot) => plot.querySelector('svg.recharts-surface') !== null),
    undefined,
    { timeout: 60_000, polling: 100 },
  );
  await page.waitForTimeout(300);
  const delays: number[] = [];
  const longest: number[] = [];
  for (let k = 0; k < KEYSTROKES; k++) {
    const started = await page.evaluate(() => {
      const w = window as unknown as { __verdicts: Record<string, unknown[]>; __longTasks: unknown[] };
      for (const list of Object.values(w.__verdicts)) list.length = 0;
      w.__longTasks.length = 0;
      return performance.now();
    });
    // A new digit each time (0.1 → 0.11 → 0.112 …, each round starting from another digit), so no
    // value comes back: a value typed before would find its verdicts in the cache and not re-check.
    await page.keyboard.press(String((((k % 8) + Math.floor(k / 8)) % 9) + 1));
    const done = await dependentVerdictsChecked(page, grown.dependentClaims);
    delays.push(done - started);
    longest.push(await page.evaluate(() => Math.max(0, ...(window as unknown as { __longTasks: { duration: number }[] }).__longTasks.map((t) => t.duration))));
    // A pause between keystrokes, as between bursts of typing.
    await page.waitForTimeout(300);
    if ((k + 1) % 8 === 0) {
      for (let d = 0; d < 8; d++) await page.keyboard.press('Backspace');
      await page.waitForTimeout(1500);
    }
  }
  await context.close();
  return { delays, longest };
}

async function main(): Promise<void> {
  const server = await startServer({ demo: true });
  let browser: Browser | null = null;
  try {
    const demo = await demoSessions(server.url);
    const grown = await growDemoDerivation(server, demo);
    browser = await launchBrowser();
    const loads: LoadTimes[] = [];
    for (let i = 0; i < LOADS; i++) loads.push(await loadOnce(browser, server, demo));
    const typed = await keystrokes(browser, server, demo, grown);

    // Each one in order too (0: none over 50 ms), to tell a first load or keystroke from the rest.
    const tasks = (values: number[]) =>
      values.every((v) => v === 0) ? 'none over 50 ms' : `${spread(values)}; ${values.filter((v) => v > 0).length} of ${values.length} had one over 50 ms (in order: ${values.map((v) => v.toFixed(0)).join(', ')})`;
    const rows = [
      ['first contentful paint', spread(loads.map((l) => l.firstPaint))],
      [`whole document (${TARGET_STEPS} steps) in the editor`, spread(loads.map((l) => l.documentShown))],
      [`a verdict on every claim (${TARGET_CLAIMS})`, spread(loads.map((l) => l.everyVerdict))],
      ['longest main-thread task while loading', tasks(loads.map((l) => l.longestTask))],
      ['  of which while the first checks run', tasks(loads.map((l) => l.longestWhileChecking))],
      [`keystroke to every dependent verdict (${grown.dependentClaims.length} claims)`, spread(typed.delays)],
      ['longest main-thread task per keystroke while checks run', tasks(typed.longest)],
    ];
    console.log('\nChecked steps in Chromium (medians; the goals are 1.5 s, 300 ms, 50 ms):');
    for (const [what, figure] of rows) console.log(`  ${what!.padEnd(62)} ${figure}`);
    const ratio = (value: number, goal: number) => `${(value / goal).toFixed(2)} of the goal`;
    console.log('\nAgainst the goals:');
    console.log(`  whole document in the editor: ${ratio(median(loads.map((l) => l.documentShown)), GOALS.firstRenderMs)}`);
    console.log(`  keystroke to every dependent verdict: ${ratio(median(typed.delays), GOALS.verdictsMs)}`);
    const largest = Math.max(...typed.longest);
    console.log(`  longest task while checks run: ${largest === 0 ? 'no task over 50 ms (the long-task timing reports only those)' : `${largest.toFixed(0)} ms at most, ${ratio(largest, GOALS.longestTaskMs)}`}`);
  } finally {
    await browser?.close();
    await server.stop();
  }
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});
