// Typesetting a few formulas at a time, so that opening a long derivation (hundreds of fields and
// formulas) or a reading that changes many previews never blocks the page for long. A formula on
// or near the screen is typeset in the coming frames, each taking at most its share of the frame
// (frameShare.ts); one further away waits for the page to be idle, so that it never lengthens a
// frame while the page has other work (its first verdicts coming in), and is moved up when it
// nears the screen. Nothing runs before KaTeX has arrived.
import { katexNow, whenKatex } from '../katex';
import { FRAME_SHARE_MS, workWithinShare } from './frameShare';

/** What to draw into each element; the latest request for an element wins. Kept in request order. */
const soon = new Map<HTMLElement, () => void>();
const idle = new Map<HTMLElement, () => void>();
/** Elements on or within a screen's height of the screen, as last reported. */
const nearScreen = new WeakSet<HTMLElement>();
let frameScheduled = false;
let idleScheduled = false;


let watcher: IntersectionObserver | null | undefined;
function nearnessWatcher(): IntersectionObserver | null {
  if (watcher !== undefined) return watcher;
  watcher =
    typeof IntersectionObserver === 'function'
      ? new IntersectionObserver(
          (entries) => {
            for (const entry of entries) {
              const target = entry.target as HTMLElement;
              if (!entry.isIntersecting) {
                nearScreen.delete(target);
                continue;
              }
              nearScreen.add(target);
              const draw = idle.get(target);
              if (draw) {
                idle.delete(target);
                soon.set(target, draw);
                scheduleFrame();
              }
            }
          },
          { rootMargin: '100% 0px' },
        )
      : null;
  return watcher;
}

/** A field's preview: TeX the solver made, shown as written if KaTeX cannot read it. */
function typesetPreview(target: HTMLElement, tex: string): void {
  const katex = katexNow()!;
  try {
    katex.render(tex, target, { displayMode: false, throwOnError: true, strict: 'ignore', trust: false, maxExpand: 1000, output: 'htmlAndMathml' });
  } catch {
    const code = document.createElement('code');
    code.textContent = tex;
    target.replaceChildren(code);
  }
}

/** Draws the first element waiting in `queue`; says whether any are left. */
function drawFirst(queue: Map<HTMLElement, () => void>): boolean {
  const first = queue.entries().next();
  if (first.done) return false;
  const [target, draw] = first.value;
  queue.delete(target);
  if (target.isConnected) draw();
  return queue.size > 0;
}

function runFrame(frameTime: number): void {
  frameScheduled = false;
  if (workWithinShare(frameTime, () => drawFirst(soon))) scheduleFrame();
}

function runIdle(deadline: { timeRemaining: () => number }): void {
  idleScheduled = false;
  if (workWithinShare(undefined, () => drawFirst(idle), Math.min(FRAME_SHARE_MS, deadline.timeRemaining()))) scheduleIdle();
}

function scheduleFrame(): void {
  if (frameScheduled) return;
  frameScheduled = true;
  whenKatex(() => requestAnimationFrame(runFrame));
}

function scheduleIdle(): void {
  if (idleScheduled) return;
  idleScheduled = true;
  whenKatex(() => {
    if (typeof requestIdleCallback === 'function') requestIdleCallback(runIdle, { timeout: 2000 });
    else setTimeout(() => runIdle({ timeRemaining: () => FRAME_SHARE_MS }), 50);
  });
}

/** Draws into `target` soon (with KaTeX there): in a coming frame near the screen, when the page is
 * idle further away. A later request for it replaces this one. */
export function drawSoon(target: HTMLElement, draw: () => void): void {
  const watching = nearnessWatcher();
  // Observing an element already observed does nothing (IntersectionObserver.observe).
  watching?.observe(target);
  if (!watching || nearScreen.has(target)) {
    idle.delete(target);
    soon.set(target, draw);
    scheduleFrame();
  } else {
    soon.delete(target);
    idle.set(target, draw);
    scheduleIdle();
  }
}

/** Typesets a field's preview `tex` into `target` soon. */
export function typesetSoon(target: HTMLElement, tex: string): void {
  drawSoon(target, () => typesetPreview(target, tex));
}

export function cancelTypeset(target: HTMLElement): void {
  soon.delete(target);
  idle.delete(target);
}
