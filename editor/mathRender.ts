// Typesetting a formula with KaTeX into an element. A malformed formula shows KaTeX's own error
// message and the source it could not read, so nothing the author wrote is hidden.
import { katexNow } from './katex';

const warningIcon =
  '<svg viewBox="0 0 16 16" width="1em" height="1em" fill="none" stroke="currentColor" stroke-width="1.6" ' +
  'stroke-linecap="round" stroke-linejoin="round" aria-hidden="true" focusable="false">' +
  '<path d="M8 1.8l6.4 11.4H1.6z"/><path d="M8 6.3v3.2M8 11.4v.1"/></svg>';

export interface TypesetResult {
  ok: boolean;
  /** KaTeX's message when the formula could not be read. */
  error?: string;
}

/** Shows the source as written until the formula is typeset (KaTeX not there yet, or later frames). */
export function showPending(target: HTMLElement, source: string, display: boolean): void {
  const pending = document.createElement('span');
  pending.className = 'math-pending';
  pending.textContent = display ? source : `$${source}$`;
  target.replaceChildren(pending);
}

/** Typesets `source` into `target`; null (and nothing drawn) while KaTeX has not arrived. */
export function typeset(target: HTMLElement, source: string, display: boolean): TypesetResult | null {
  if (source.trim() === '') {
    const empty = document.createElement('span');
    empty.className = 'math-empty';
    empty.textContent = display ? 'empty formula (click to write LaTeX)' : 'empty formula';
    target.replaceChildren(empty);
    return { ok: true };
  }
  const katex = katexNow();
  if (!katex) return null;
  try {
    katex.render(source, target, {
      displayMode: display,
      throwOnError: true,
      strict: 'ignore',
      trust: false,
      maxExpand: 1000,
      maxSize: 50,
      output: 'htmlAndMathml',
    });
    return { ok: true };
  } catch (error) {
    const message = error instanceof katex.ParseError ? error.message : error instanceof Error ? error.message : String(error);
    const box = document.createElement('span');
    box.className = 'math-error';
    box.setAttribute('role', 'note');
    const icon = document.createElement('span');
    icon.className = 'math-error-icon';
    icon.innerHTML = warningIcon;
    const words = document.createElement('span');
    words.className = 'math-error-message';
    words.textContent = message;
    const code = document.createElement('code');
    code.className = 'math-error-source';
    code.textContent = display ? source : `$${source}$`;
    box.append(icon, words, code);
    target.replaceChildren(box);
    return { ok: false, error: message };
  }
}
