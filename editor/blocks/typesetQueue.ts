// Typesetting field previews a few at a time, so that opening a long derivation (hundreds of
// fields) or a reading that changes many previews never blocks the page for long: each frame
// typesets for at most a few milliseconds, then yields.
import katex from 'katex';

const BUDGET_MS = 6;
const waiting = new Map<HTMLElement, string>();
let scheduled = false;

const now = () => performance.now();

function typesetNow(target: HTMLElement, tex: string): void {
  try {
    katex.render(tex, target, { displayMode: false, throwOnError: true, strict: 'ignore', trust: false, maxExpand: 1000, output: 'htmlAndMathml' });
  } catch {
    // TeX the solver made that KaTeX cannot read: show it as written rather than nothing.
    const code = document.createElement('code');
    code.textContent = tex;
    target.replaceChildren(code);
  }
}

function run(): void {
  scheduled = false;
  const start = now();
  for (const [target, tex] of waiting) {
    waiting.delete(target);
    if (target.isConnected) typesetNow(target, tex);
    if (now() - start > BUDGET_MS) break;
  }
  if (waiting.size > 0) schedule();
}

function schedule(): void {
  if (scheduled) return;
  scheduled = true;
  requestAnimationFrame(run);
}

/** Typesets `tex` into `target` soon (the latest request for a target wins). */
export function typesetSoon(target: HTMLElement, tex: string): void {
  waiting.set(target, tex);
  schedule();
}

export function cancelTypeset(target: HTMLElement): void {
  waiting.delete(target);
}
