// Typesetting a few formulas at a time, so that opening a long derivation (hundreds of fields and
// formulas) or a reading that changes many previews never blocks the page for long: each frame
// typesets for at most its share of the frame (frameShare.ts), then yields. Nothing runs before
// KaTeX has arrived.
import { katexNow, whenKatex } from '../katex';
import { frameShareLeft, spendFrameShare } from './frameShare';

/** What to draw into each element; the latest request for an element wins. Kept in request order. */
const waiting = new Map<HTMLElement, () => void>();
let scheduled = false;

const now = () => performance.now();

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

function run(frameTime: number): void {
  scheduled = false;
  const start = now();
  const budget = frameShareLeft(frameTime);
  for (const [target, draw] of waiting) {
    waiting.delete(target);
    if (target.isConnected) draw();
    if (now() - start > budget) break;
  }
  spendFrameShare(frameTime, now() - start);
  if (waiting.size > 0) schedule();
}

function schedule(): void {
  if (scheduled) return;
  scheduled = true;
  whenKatex(() => requestAnimationFrame(run));
}

/** Draws into `target` in a coming frame (with KaTeX there); a later request for it replaces this one. */
export function drawSoon(target: HTMLElement, draw: () => void): void {
  waiting.set(target, draw);
  schedule();
}

/** Typesets a field's preview `tex` into `target` soon. */
export function typesetSoon(target: HTMLElement, tex: string): void {
  drawSoon(target, () => typesetPreview(target, tex));
}

export function cancelTypeset(target: HTMLElement): void {
  waiting.delete(target);
}
