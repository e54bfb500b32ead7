// Where the checked-steps page spends its main thread (a tool beside `npm run bench:steps`, for
// finding costs, not for figures): the demo derivation grown as in the benchmark, then one load
// and a few keystrokes in Chromium under the CPU profiler. Prints each task over PROFILE_TASK_MS
// (default 40 ms) with the functions that took its time, and writes the profiles to
// PROFILE_DIR (default /tmp) for DevTools. A build without mangling names the functions:
// `MARGINALIA_DIST_DIR=.next-profile npx next build --no-mangling`, then
// `MARGINALIA_DIST_DIR=.next-profile npx tsx tests/bench/steps.profile.ts`.
import { writeFileSync } from 'node:fs';
import path from 'node:path';
import type { Browser, BrowserContext, CDPSession, Page } from 'playwright-core';
import { demoSessions, launchBrowser, signedInContext, startServer } from '../helpers';
import { BENCH_VIEWPORT, growDemoDerivation, waitForDocumentShown, waitForEveryVerdict } from './stepsDocument';

const TASK_MS = Number(process.env.PROFILE_TASK_MS ?? 40);
const OUT = process.env.PROFILE_DIR ?? '/tmp';
const KEYS = Number(process.env.PROFILE_KEYSTROKES ?? 4);
/** PROFILE_TRACE=1: a performance trace (style, layout, paint in each long task) instead of the CPU profile. */
const TRACE = process.env.PROFILE_TRACE === '1' || process.env.PROFILE_TRACE === 'light';
/** PROFILE_TRACE=light: only the tasks and their parts (no stacks, no invalidations), which cost the page far less. */
const LIGHT = process.env.PROFILE_TRACE === 'light';
/** PROFILE_PLAIN=1: neither, only the page's marks and what it fetched (the timeline as the benchmark meets it). */
const PLAIN = process.env.PROFILE_PLAIN === '1';

interface ProfileNode {
  id: number;
  callFrame: { functionName: string; url: string; lineNumber: number; columnNumber: number };
  children?: number[];
}
interface Profile {
  nodes: ProfileNode[];
  startTime: number;
  endTime: number;
  samples: number[];
  timeDeltas: number[];
}

function frameName(node: ProfileNode): string {
  const { functionName, url, lineNumber, columnNumber } = node.callFrame;
  const file = url ? url.split('/').pop()!.split('?')[0] : '';
  // Built code is a few long lines: the column tells an anonymous function from its neighbours.
  return `${functionName || '(anonymous)'}${file ? ` ${file}:${lineNumber + 1}:${columnNumber + 1}` : ''}`;
}

/** Tasks (runs of samples that are not idle) over TASK_MS, with their top functions by self and total time. */
function summarise(profile: Profile, label: string): void {
  const byId = new Map(profile.nodes.map((n) => [n.id, n]));
  const parent = new Map<number, number>();
  for (const node of profile.nodes) for (const child of node.children ?? []) parent.set(child, node.id);
  const times: number[] = [];
  let t = profile.startTime;
  for (const delta of profile.timeDeltas) times.push((t += delta));
  const idle = (id: number) => byId.get(id)!.callFrame.functionName === '(idle)';
  const tasks: { from: number; to: number }[] = [];
  let start = -1;
  for (let i = 0; i < profile.samples.length; i++) {
    if (!idle(profile.samples[i]!)) {
      if (start < 0) start = i;
    } else if (start >= 0) {
      tasks.push({ from: start, to: i });
      start = -1;
    }
  }
  if (start >= 0) tasks.push({ from: start, to: profile.samples.length });
  console.log(`\n== ${label}: ${((profile.endTime - profile.startTime) / 1000).toFixed(0)} ms profiled`);
  for (const task of tasks) {
    const ms = (times[task.to - 1]! - times[task.from]!) / 1000;
    if (ms < TASK_MS) continue;
    const self = new Map<string, number>();
    const total = new Map<string, number>();
    for (let i = task.from; i < task.to; i++) {
      const dt = ((times[i + 1] ?? times[i]!) - times[i]!) / 1000;
      const leaf = byId.get(profile.samples[i]!)!;
      self.set(frameName(leaf), (self.get(frameName(leaf)) ?? 0) + dt);
      const seen = new Set<string>();
      for (let id: number | undefined = leaf.id; id !== undefined; id = parent.get(id)) {
        const name = frameName(byId.get(id)!);
        if (seen.has(name)) continue;
        seen.add(name);
        total.set(name, (total.get(name) ?? 0) + dt);
      }
    }
    const top = (m: Map<string, number>, n: number) =>
      [...m].sort((a, b) => b[1] - a[1]).slice(0, n).map(([name, v]) => `      ${v.toFixed(1).padStart(7)} ms  ${name}`).join('\n');
    console.log(`  task at ${((times[task.from]! - profile.startTime) / 1000).toFixed(0)} ms, ${ms.toFixed(0)} ms`);
    console.log(`    self:\n${top(self, 12)}`);
    console.log(`    total:\n${top(total, 30)}`);
  }
}

interface TraceEvent {
  name: string;
  ph: string;
  ts: number;
  dur?: number;
  /** CPU time of the thread within the event (µs); beside `dur`, it shows how long the thread waited for a core. */
  tdur?: number;
  tid: number;
  pid: number;
  args?: { name?: string; data?: { stackTrace?: { functionName: string; url: string; lineNumber: number }[] }; beginData?: { stackTrace?: { functionName: string; url: string; lineNumber: number }[] } };
}

const TASK_NAMES = ['RunTask', 'ThreadControllerImpl::RunTask', 'ThreadPool_RunTask', 'TaskGraphRunner::RunTask'];
const ms = (us: number) => (us / 1000).toFixed(0);

/** Each thread's CPU time between two trace times, from its top-level tasks: what shares the cores with the page. */
function cpuByThread(events: TraceEvent[], from: number, to: number): [string, number][] {
  const threadNames = new Map<string, string>();
  const processNames = new Map<number, string>();
  for (const e of events) {
    if (e.name === 'thread_name' && e.args?.name) threadNames.set(`${e.pid}:${e.tid}`, e.args.name);
    if (e.name === 'process_name' && e.args?.name) processNames.set(e.pid, e.args.name);
  }
  const cpu = new Map<string, number>();
  for (const e of events) {
    if (e.ph !== 'X' || !e.dur || !TASK_NAMES.includes(e.name)) continue;
    const inside = Math.min(e.ts + e.dur, to) - Math.max(e.ts, from);
    if (inside <= 0) continue;
    const key = `${processNames.get(e.pid) ?? e.pid} / ${threadNames.get(`${e.pid}:${e.tid}`) ?? e.tid}`;
    cpu.set(key, (cpu.get(key) ?? 0) + ((e.tdur ?? e.dur) * inside) / e.dur);
  }
  return [...cpu].sort((a, b) => b[1] - a[1]);
}

/**
 * The browser's own work (style, layout, paint) inside each main-thread task over TASK_MS, with its
 * CPU time beside its wall time; and each thread's CPU time while the first checks run.
 */
function summariseTrace(events: TraceEvent[], label: string): void {
  const main = events.find((e) => e.name === 'thread_name' && e.args?.name === 'CrRendererMain');
  if (!main) return;
  const onMain = events.filter((e) => e.tid === main.tid && e.pid === main.pid && e.ph === 'X' && typeof e.dur === 'number');
  const tasks = onMain.filter((e) => TASK_NAMES.includes(e.name) && e.dur! / 1000 >= TASK_MS);
  const start = Math.min(...onMain.map((e) => e.ts));
  // The page's marks (blink.user_timing): tasks after the check worker came ready are the window's.
  const ready = events.find((e) => e.name === 'marginalia:check-worker-ready');
  const settled = events.find((e) => e.name === 'marginalia:verdicts-settled');
  console.log(`\n== ${label}: browser work inside tasks over ${TASK_MS} ms (trace clock)`);
  if (ready && settled) {
    console.log(`  the first checks run from ${ms(ready.ts - start)} to ${ms(settled.ts - start)} ms; CPU time of each thread then:`);
    for (const [thread, cpu] of cpuByThread(events, ready.ts, settled.ts).slice(0, 8)) console.log(`    ${ms(cpu).padStart(5)} ms  ${thread}`);
  }
  const kinds = ['UpdateLayoutTree', 'Layout', 'PrePaint', 'Paint', 'Layerize', 'Commit', 'HitTest', 'ParseHTML', 'EvaluateScript', 'FunctionCall', 'TimerFire', 'FireAnimationFrame', 'EventDispatch', 'v8.compile', 'MajorGC', 'MinorGC', 'IntersectionObserverController::computeIntersections', 'ResizeObserverController::DeliverObservations'];
  for (const task of tasks) {
    const inside = onMain.filter((e) => e !== task && e.ts >= task.ts && e.ts + e.dur! <= task.ts + task.dur!);
    const sums = new Map<string, number>();
    for (const e of inside) if (kinds.includes(e.name)) sums.set(e.name, (sums.get(e.name) ?? 0) + e.dur! / 1000);
    const parts = [...sums].sort((a, b) => b[1] - a[1]).map(([n, v]) => `${n} ${v.toFixed(0)}`).join(', ');
    const inWindow = ready && settled && task.ts + task.dur! > ready.ts && task.ts < settled.ts ? ' (while the first checks run)' : '';
    console.log(`  task at ${ms(task.ts - start)} ms, ${ms(task.dur!)} ms, CPU ${task.tdur === undefined ? '?' : ms(task.tdur)} ms${inWindow}: ${parts}`);
    for (const e of inside) {
      if ((e.name === 'Layout' || e.name === 'UpdateLayoutTree') && e.dur! / 1000 >= 5) {
        const stack = e.args?.beginData?.stackTrace ?? e.args?.data?.stackTrace;
        const where = stack?.slice(0, 4).map((f) => `${f.functionName || '(anonymous)'} ${f.url.split('/').pop()}:${f.lineNumber}`).join(' < ');
        console.log(`      ${e.name} ${ms(e.dur!)} ms, CPU ${e.tdur === undefined ? '?' : ms(e.tdur)} ms${where ? ` forced by ${where}` : ''}`);
      }
    }
  }
}

async function traced<T>(browser: Browser, page: Page, label: string, run: () => Promise<T>): Promise<T> {
  const categories = LIGHT
    ? ['toplevel', 'devtools.timeline', 'v8', 'blink.user_timing']
    : ['toplevel', 'disabled-by-default-toplevel.flow', 'devtools.timeline', 'disabled-by-default-devtools.timeline', 'disabled-by-default-devtools.timeline.stack', 'disabled-by-default-devtools.timeline.invalidationTracking', 'v8', 'blink.user_timing'];
  await browser.startTracing(page, { categories });
  const value = await run();
  const buffer = await browser.stopTracing();
  const file = path.join(OUT, `marginalia-${label.replace(/\W+/g, '-')}.trace.json`);
  writeFileSync(file, buffer);
  const parsed = JSON.parse(buffer.toString()) as { traceEvents: TraceEvent[] } | TraceEvent[];
  summariseTrace(Array.isArray(parsed) ? parsed : parsed.traceEvents, `${label} (${file})`);
  return value;
}

async function profiled<T>(cdp: CDPSession, label: string, run: () => Promise<T>): Promise<T> {
  if (TRACE || PLAIN) return run();
  await cdp.send('Profiler.enable');
  await cdp.send('Profiler.setSamplingInterval', { interval: 200 });
  await cdp.send('Profiler.start');
  const value = await run();
  const { profile } = (await cdp.send('Profiler.stop')) as unknown as { profile: Profile };
  const file = path.join(OUT, `marginalia-${label.replace(/\W+/g, '-')}.cpuprofile`);
  writeFileSync(file, JSON.stringify(profile));
  summarise(profile, `${label} (${file})`);
  return value;
}

async function marks(page: Page): Promise<void> {
  const entries = await page.evaluate(() =>
    [...performance.getEntriesByType('mark'), ...performance.getEntriesByType('navigation'), ...performance.getEntriesByType('paint')].map((e) => {
      const nav = e as PerformanceNavigationTiming;
      return { name: e.name || e.entryType, at: e.entryType === 'navigation' ? nav.responseEnd : e.startTime, extra: e.entryType === 'navigation' ? `dcl ${nav.domContentLoadedEventEnd.toFixed(0)}` : '' };
    }),
  );
  for (const e of entries.sort((a, b) => a.at - b.at)) console.log(`  ${e.at.toFixed(0).padStart(6)} ms  ${e.name} ${e.extra}`);
  // What the page fetched, and when (scripts, the API, workers): the waterfall before the text shows.
  const resources = await page.evaluate(() =>
    (performance.getEntriesByType('resource') as PerformanceResourceTiming[]).map((r) => ({ name: r.name.replace(location.origin, ''), start: r.startTime, end: r.responseEnd, size: r.encodedBodySize, kind: r.initiatorType })),
  );
  for (const r of resources.filter((r) => r.end - r.start > 30 || r.kind !== 'script').sort((a, b) => a.start - b.start)) {
    console.log(`  ${r.start.toFixed(0).padStart(6)}-${r.end.toFixed(0).padEnd(6)} ms  ${r.kind} ${r.name.slice(0, 90)} ${(r.size / 1024).toFixed(0)} kB`);
  }
}

interface LongFrame {
  start: number;
  duration: number;
  styleAndLayout: number;
  scripts: string[];
}

/** Keeps the page's frames over 50 ms (Chromium's long-animation-frame timing) and its long tasks from its start. */
async function recordLongFrames(context: BrowserContext): Promise<void> {
  await context.addInitScript(() => {
    const frames: unknown[] = [];
    const tasks: { start: number; duration: number }[] = [];
    (window as unknown as { __longFrames: unknown[] }).__longFrames = frames;
    (window as unknown as { __longTasksSeen: unknown[] }).__longTasksSeen = tasks;
    try {
      new PerformanceObserver((list) => {
        for (const entry of list.getEntries()) tasks.push({ start: entry.startTime, duration: entry.duration });
      }).observe({ type: 'longtask', buffered: true });
    } catch {
      // no long-task timing in this browser
    }
    try {
      new PerformanceObserver((list) => {
        for (const entry of list.getEntries()) {
          const frame = entry as PerformanceEntry & {
            styleAndLayoutStart: number;
            scripts: { invoker: string; invokerType: string; sourceFunctionName: string; sourceURL: string; sourceCharPosition: number; duration: number; forcedStyleAndLayoutDuration: number }[];
          };
          frames.push({
            start: frame.startTime,
            duration: frame.duration,
            styleAndLayout: frame.styleAndLayoutStart ? frame.startTime + frame.duration - frame.styleAndLayoutStart : 0,
            scripts: frame.scripts.map(
              (script) =>
                `${script.invokerType} ${script.invoker} ${script.sourceFunctionName}@${script.sourceURL.split('/').pop()}:${script.sourceCharPosition} ${script.duration.toFixed(0)} ms` +
                (script.forcedStyleAndLayoutDuration > 1 ? `, forced layout ${script.forcedStyleAndLayoutDuration.toFixed(0)} ms` : ''),
            ),
          });
        }
      }).observe({ type: 'long-animation-frame', buffered: true });
    } catch {
      // no long-animation-frame timing in this browser
    }
  });
}

/** Prints the long frames from the check worker starting on: their scripts, and their style, layout and paint. */
async function longFrames(page: Page): Promise<void> {
  const { frames, tasks, ready } = await page.evaluate(() => ({
    frames: (window as unknown as { __longFrames: LongFrame[] }).__longFrames,
    tasks: (window as unknown as { __longTasksSeen: { start: number; duration: number }[] }).__longTasksSeen,
    ready: performance.getEntriesByName('marginalia:check-worker-ready')[0]?.startTime ?? 0,
  }));
  // The benchmark counts these (one task each); a long frame may hold several shorter tasks.
  const taskList = tasks.filter((t) => t.start + t.duration > ready).map((t) => `${t.start.toFixed(0)} ms ${t.duration.toFixed(0)} ms`);
  console.log(`long tasks from the check worker starting: ${taskList.join(', ') || 'none'}`);
  console.log('frames over 50 ms from the check worker starting (style, layout and paint; then the scripts):');
  for (const frame of frames.filter((f) => f.start + f.duration > ready)) {
    console.log(`  ${frame.start.toFixed(0).padStart(6)} ms  ${frame.duration.toFixed(0)} ms (style, layout, paint ${frame.styleAndLayout.toFixed(0)} ms)`);
    for (const script of frame.scripts) console.log(`      ${script}`);
  }
}

async function main(): Promise<void> {
  const server = await startServer({ demo: true });
  const browser = await launchBrowser();
  try {
    const demo = await demoSessions(server.url);
    const grown = await growDemoDerivation(server, demo);
    const signedIn = () => signedInContext(browser, server.url, demo.cookies.author, { viewport: BENCH_VIEWPORT });
    // One load first, as the benchmark's later loads meet the server: its pages' code loaded.
    const warm = await signedIn();
    const warmPage = await warm.newPage();
    await warmPage.goto(`${server.url}/derivations/${demo.derivationId}`);
    await waitForDocumentShown(warmPage);
    await warm.close();

    const context = await signedIn();
    await recordLongFrames(context);
    const page = await context.newPage();
    const cdp = await context.newCDPSession(page);
    const measure = <T,>(label: string, run: () => Promise<T>) => (TRACE && !PLAIN ? traced(browser, page, label, run) : profiled(cdp, label, run));
    await measure('load', async () => {
      await page.goto(`${server.url}/derivations/${demo.derivationId}`);
      console.log(`document shown at ${(await waitForDocumentShown(page)).toFixed(0)} ms`);
      console.log(`every verdict at ${(await waitForEveryVerdict(page)).toFixed(0)} ms`);
      await page.waitForTimeout(1500);
    });
    await marks(page);
    await longFrames(page);
    const sizes = await page.evaluate(() => {
      const text = document.querySelector('.derivation-text')!;
      const byKind = new Map<string, number>();
      for (const child of text.children) {
        const kind = `${child.tagName.toLowerCase()}.${child.classList[0] ?? ''}`;
        byKind.set(kind, (byKind.get(kind) ?? 0) + child.querySelectorAll('*').length + 1);
      }
      return { page: document.querySelectorAll('*').length, text: text.querySelectorAll('*').length, byKind: [...byKind].sort((a, b) => b[1] - a[1]).slice(0, 8) };
    });
    console.log(`elements: ${sizes.page} on the page, ${sizes.text} in the text; by top-level kind: ${sizes.byKind.map(([k, n]) => `${k} ${n}`).join(', ')}`);

    const rows = page.locator(`[data-step-id="${grown.editedFlow}"] [data-row="parameter"]`);
    let field = rows.first().locator('[data-field$=".value"] .block-field-text');
    for (let i = 0; i < (await rows.count()); i++) {
      if (((await rows.nth(i).locator('[data-field$=".name"] .block-field-text').textContent()) ?? '').trim() === 'eps') field = rows.nth(i).locator('[data-field$=".value"] .block-field-text');
    }
    await field.click();
    await page.keyboard.press('End');
    await page.waitForTimeout(500);
    await measure('keystrokes', async () => {
      for (let k = 0; k < KEYS; k++) {
        const pressed = await page.evaluate(() => performance.now());
        await page.keyboard.press(String((k % 9) + 1));
        await page.waitForTimeout(1200);
        // When the claims were read and the verdicts settled, after this keystroke.
        const after = await page.evaluate(
          (t0) => performance.getEntriesByType('mark').filter((m) => m.startTime > t0 && m.name.startsWith('marginalia:')).map((m) => `${m.name.replace('marginalia:', '')} +${(m.startTime - t0).toFixed(0)}`),
          pressed,
        );
        console.log(`  keystroke ${k + 1}: ${after.join(', ')}`);
      }
    });
    await context.close();
  } finally {
    await browser.close();
    await server.stop();
  }
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});
