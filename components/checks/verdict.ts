// How a claim's verdict is shown: a word and an icon, never colour alone. Shared by the React
// badge (VerdictBadge) and the editor's claim blocks, which draw the same badge in plain DOM.
import type { Status } from '@/flow/types';

/** A verdict, or where a claim is on its way to one. */
export type VerdictState = Status | 'checking' | 'queued' | 'cancelled' | 'unchecked';

export interface VerdictLook {
  word: string;
  /** Colour class (Tailwind, from the theme's verdict colours). */
  className: string;
  /** SVG path data on a 16 x 16 grid, stroked. */
  paths: readonly string[];
  circle: boolean;
}

export const VERDICT_LOOKS: Readonly<Record<VerdictState, VerdictLook>> = {
  holds: { word: 'holds', className: 'text-verdict-holds', paths: ['M5.2 8.3l1.9 1.9 3.7-4'], circle: true },
  fails: { word: 'fails', className: 'text-verdict-fails', paths: ['M5.8 5.8l4.4 4.4M10.2 5.8l-4.4 4.4'], circle: true },
  inconclusive: { word: 'inconclusive', className: 'text-verdict-unsure', paths: ['M5.3 8h5.4'], circle: true },
  invalid: { word: 'invalid input', className: 'text-verdict-invalid', paths: ['M8 1.8l6.4 11.4H1.6z', 'M8 6.3v3.2M8 11.4v.1'], circle: false },
  checking: { word: 'checking', className: 'text-ink-soft', paths: ['M8 4.6V8l2.3 1.5'], circle: true },
  queued: { word: 'waiting to be checked', className: 'text-ink-faint', paths: ['M5.2 8h.1M8 8h.1M10.8 8h.1'], circle: true },
  cancelled: { word: 'check cancelled', className: 'text-ink-soft', paths: ['M6.3 5.6v4.8M9.7 5.6v4.8'], circle: true },
  unchecked: { word: 'not checked yet', className: 'text-ink-faint', paths: [], circle: true },
};

export const SVG_NS = 'http://www.w3.org/2000/svg';

/** The badge as plain DOM (for views outside React): icon and word in one span. */
export function verdictBadgeElement(state: VerdictState, label?: string): HTMLElement {
  const look = VERDICT_LOOKS[state];
  const badge = document.createElement('span');
  badge.className = `verdict-badge inline-flex items-center gap-1 whitespace-nowrap ${look.className}`;
  badge.dataset.verdict = state;
  const svg = document.createElementNS(SVG_NS, 'svg');
  svg.setAttribute('viewBox', '0 0 16 16');
  svg.setAttribute('width', '1em');
  svg.setAttribute('height', '1em');
  svg.setAttribute('fill', 'none');
  svg.setAttribute('stroke', 'currentColor');
  svg.setAttribute('stroke-width', '1.6');
  svg.setAttribute('stroke-linecap', 'round');
  svg.setAttribute('stroke-linejoin', 'round');
  svg.setAttribute('aria-hidden', 'true');
  svg.setAttribute('focusable', 'false');
  if (look.circle) {
    const circle = document.createElementNS(SVG_NS, 'circle');
    circle.setAttribute('cx', '8');
    circle.setAttribute('cy', '8');
    circle.setAttribute('r', '6.2');
    svg.append(circle);
  }
  for (const d of look.paths) {
    const path = document.createElementNS(SVG_NS, 'path');
    path.setAttribute('d', d);
    svg.append(path);
  }
  const word = document.createElement('span');
  word.className = 'verdict-word';
  word.textContent = label ?? look.word;
  badge.append(svg, word);
  return badge;
}
