'use client';
// The margin beside the derivation's text: for each step with a sign-off or remarks a small note at
// the step's height (word and icon), and the selected step's card. Notes never overlap: one that
// would is moved down below the one above. The text itself is left alone: steps are found by their
// data-step-id in the editor's DOM and followed as the text changes.
import { useCallback, useEffect, useLayoutEffect, useMemo, useRef, useState, type CSSProperties, type ReactNode } from 'react';
import { CheckedIcon, ClearedIcon, RemarkIcon, ResolvedIcon } from './reviewIcons';
import type { StepReviewWire } from './types';

interface Box {
  top: number;
  height: number;
}

const GAP = 6;

/** The outermost element of a step in the editor (a nested block may carry a stale id). */
export function stepElement(root: HTMLElement, stepId: string): HTMLElement | null {
  const text = root.querySelector('.ProseMirror') ?? root;
  for (const element of text.querySelectorAll<HTMLElement>(`[data-step-id="${CSS.escape(stepId)}"]`)) {
    const outer = element.parentElement?.closest('[data-step-id]');
    if (!outer || !text.contains(outer)) return element;
  }
  return null;
}

/**
 * The outermost element of every step in the editor, by step id, in one pass over the text's
 * top-level elements (each step is one of them, or the first element with an id inside one).
 */
export function stepElements(root: HTMLElement): Map<string, HTMLElement> {
  const text = root.querySelector('.ProseMirror') ?? root;
  const found = new Map<string, HTMLElement>();
  for (const child of text.children) {
    const element = child.hasAttribute('data-step-id') ? child : child.querySelector('[data-step-id]');
    const id = element?.getAttribute('data-step-id');
    if (element instanceof HTMLElement && id && !found.has(id)) found.set(id, element);
  }
  return found;
}

/** The step an event happened in (its outermost element's id), or null. */
export function stepIdAt(root: HTMLElement, target: EventTarget | null): string | null {
  if (!(target instanceof Element)) return null;
  const text = root.querySelector('.ProseMirror');
  if (!text || !text.contains(target)) return null;
  let found: Element | null = null;
  for (let at: Element | null = target.closest('[data-step-id]'); at && text.contains(at); at = at.parentElement?.closest('[data-step-id]') ?? null) {
    found = at;
  }
  return found?.getAttribute('data-step-id') ?? null;
}

function plural(count: number, one: string, many: string): string {
  return `${count} ${count === 1 ? one : many}`;
}

/** What the note of a step says, in words (its accessible name too). */
export function noteWords(step: StepReviewWire): string[] {
  const words: string[] = [];
  if (step.signOffs.length > 0) words.push(`checked by ${step.signOffs.map((s) => s.by.name).join(', ')}`);
  else if (step.lastCleared) words.push('sign-off cleared');
  if (step.openThreads > 0) words.push(plural(step.openThreads, 'open remark', 'open remarks'));
  if (step.resolvedThreads > 0) words.push(plural(step.resolvedThreads, 'resolved remark', 'resolved remarks'));
  return words;
}

export function hasNote(step: StepReviewWire): boolean {
  return step.signOffs.length > 0 || step.lastCleared !== null || step.openThreads > 0 || step.resolvedThreads > 0;
}

function Note({ step, number, onOpen }: { step: StepReviewWire; number: number; onOpen: () => void }) {
  const words = noteWords(step);
  return (
    <button
      type="button"
      onClick={onOpen}
      aria-label={`Step ${number}: ${words.join('; ') || 'no remarks'}. Open its review.`}
      data-step-note={step.stepId}
      className="flex w-full flex-col items-start gap-0.5 rounded border border-transparent px-1.5 py-0.5 text-left text-xs hover:border-rule"
    >
      {step.signOffs.length > 0 && (
        <span className="inline-flex items-center gap-1 text-verdict-holds">
          <CheckedIcon className="shrink-0" /> checked · {step.signOffs.map((s) => s.by.name.split(' ')[0]).join(', ')}
        </span>
      )}
      {step.signOffs.length === 0 && step.lastCleared && (
        <span className="inline-flex items-center gap-1 text-verdict-unsure">
          <ClearedIcon className="shrink-0" /> sign-off cleared
        </span>
      )}
      {step.openThreads > 0 && (
        <span className="inline-flex items-center gap-1 text-accent">
          <RemarkIcon className="shrink-0" /> {plural(step.openThreads, 'remark', 'remarks')}
        </span>
      )}
      {step.openThreads === 0 && step.resolvedThreads > 0 && (
        <span className="inline-flex items-center gap-1 text-ink-faint">
          <ResolvedIcon className="shrink-0" /> {plural(step.resolvedThreads, 'resolved', 'resolved')}
        </span>
      )}
    </button>
  );
}

export function StepMargin({
  main,
  steps,
  selectedStepId,
  onSelect,
  selectOnClick,
  renderCard,
}: {
  /** The element holding the editor. */
  main: HTMLElement | null;
  steps: StepReviewWire[];
  selectedStepId: string | null;
  onSelect: (stepId: string | null) => void;
  /** Clicking a step in the text selects it: always (read-only roles), or only when it has a note. */
  selectOnClick: 'always' | 'noted';
  renderCard: (step: StepReviewWire, number: number) => ReactNode;
}) {
  const marginRef = useRef<HTMLDivElement>(null);
  const [boxes, setBoxes] = useState<Record<string, Box>>({});
  const [heights, setHeights] = useState<Record<string, number>>({});
  const [hovered, setHovered] = useState<string | null>(null);
  const itemRefs = useRef(new Map<string, HTMLElement>());
  const pending = useRef<{ frame: number | null; timer: ReturnType<typeof setTimeout> | null }>({ frame: null, timer: null });

  // Only the steps with something in the margin are measured.
  const stepIds = useMemo(
    () => steps.filter((s) => s.stepId === selectedStepId || hasNote(s) || s.stepId === hovered).map((s) => s.stepId).join(' '),
    [steps, selectedStepId, hovered],
  );

  const measure = useCallback(() => {
    pending.current.timer = null;
    const margin = marginRef.current;
    if (!main || !margin) return;
    const origin = margin.getBoundingClientRect().top;
    const next: Record<string, Box> = {};
    const elements = stepElements(main);
    for (const id of stepIds.split(' ')) {
      if (!id) continue;
      const element = elements.get(id);
      if (!element) continue;
      const rect = element.getBoundingClientRect();
      next[id] = { top: Math.round(rect.top - origin), height: Math.round(rect.height) };
    }
    setBoxes((before) => (JSON.stringify(before) === JSON.stringify(next) ? before : next));
    const measured: Record<string, number> = {};
    for (const [id, element] of itemRefs.current) measured[id] = Math.round(element.getBoundingClientRect().height);
    setHeights((before) => (JSON.stringify(before) === JSON.stringify(measured) ? before : measured));
  }, [main, stepIds]);

  // The timer runs the latest measure (the steps to measure may change while it waits).
  const latestMeasure = useRef(measure);
  latestMeasure.current = measure;
  // Measured just after the next frame is drawn, when its layout is done and reading it costs
  // nothing: a read inside the frame, before the text's own changes, lays a long text out twice
  // (10-40 ms a frame while a derivation's first verdicts come in).
  const schedule = useCallback(() => {
    const at = pending.current;
    if (at.frame !== null || at.timer !== null) return;
    at.frame = requestAnimationFrame(() => {
      at.frame = null;
      at.timer = setTimeout(() => latestMeasure.current(), 0);
    });
  }, []);

  // After every render, measured after the next frame: never a layout forced in the middle of
  // React's commit or of a change to the text.
  useLayoutEffect(() => {
    schedule();
  });

  useEffect(() => {
    if (!main) return;
    const mutations = new MutationObserver(schedule);
    mutations.observe(main, { subtree: true, childList: true, characterData: true, attributes: true });
    const sizes = new ResizeObserver(schedule);
    sizes.observe(main);
    if (marginRef.current) sizes.observe(marginRef.current);
    window.addEventListener('resize', schedule);
    const onClick = (event: MouseEvent) => {
      const id = stepIdAt(main, event.target);
      if (!id) return;
      const step = steps.find((s) => s.stepId === id);
      if (step && (selectOnClick === 'always' || hasNote(step))) onSelect(id);
    };
    const onOver = (event: MouseEvent) => setHovered(stepIdAt(main, event.target));
    main.addEventListener('click', onClick);
    main.addEventListener('mouseover', onOver);
    return () => {
      mutations.disconnect();
      sizes.disconnect();
      window.removeEventListener('resize', schedule);
      main.removeEventListener('click', onClick);
      main.removeEventListener('mouseover', onOver);
      const at = pending.current;
      if (at.frame !== null) cancelAnimationFrame(at.frame);
      if (at.timer !== null) clearTimeout(at.timer);
      at.frame = null;
      at.timer = null;
    };
  }, [main, schedule, steps, selectOnClick, onSelect]);

  const numberOf = new Map(steps.map((s, i) => [s.stepId, i + 1]));
  const shown = steps.filter((s) => s.stepId === selectedStepId || hasNote(s) || s.stepId === hovered);

  // Each note at its step's height, or just below the note above it.
  let floor = 0;
  const placed = shown
    .filter((s) => boxes[s.stepId])
    .map((step) => {
      const top = Math.max(boxes[step.stepId]!.top, floor);
      floor = top + (heights[step.stepId] ?? 24) + GAP;
      return { step, top };
    });
  const selectedBox = selectedStepId ? boxes[selectedStepId] : undefined;

  return (
    <div
      ref={marginRef}
      className="relative flex flex-col gap-1.5 lg:block lg:min-h-[var(--margin-height)]"
      style={{ '--margin-height': `${floor}px` } as CSSProperties}
      data-review-margin
    >
      {selectedBox && (
        <span
          aria-hidden="true"
          className="absolute -left-3 hidden w-0.5 rounded bg-accent lg:block"
          style={{ top: selectedBox.top, height: selectedBox.height }}
        />
      )}
      {placed.map(({ step, top }) => {
        const number = numberOf.get(step.stepId) ?? 0;
        const selected = step.stepId === selectedStepId;
        return (
          <div
            key={step.stepId}
            ref={(element) => {
              if (element) itemRefs.current.set(step.stepId, element);
              else itemRefs.current.delete(step.stepId);
            }}
            className="w-full transition-[top] duration-150 lg:absolute lg:top-[var(--note-top)]"
            style={{ '--note-top': `${top}px` } as CSSProperties}
          >
            {selected ? (
              renderCard(step, number)
            ) : hasNote(step) ? (
              <Note step={step} number={number} onOpen={() => onSelect(step.stepId)} />
            ) : (
              <button
                type="button"
                onClick={() => onSelect(step.stepId)}
                className="px-1.5 py-0.5 text-xs text-ink-faint hover:text-ink"
                aria-label={`Step ${number}: open its review`}
              >
                + review
              </button>
            )}
          </div>
        );
      })}
    </div>
  );
}
