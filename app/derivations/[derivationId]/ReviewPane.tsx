'use client';
// Review beside the whiteboard: the margin with each step's sign-offs and remarks (and the selected
// step's card), and the list of every remark below. It wraps the whiteboard without touching it:
// steps are found in the editor's DOM by their data-step-id.
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useCallback, useEffect, useMemo, useRef, useState, type ReactNode } from 'react';
import { ChoiceButton } from '@/components/ChoiceButton';
import { RemarkIndex } from '@/components/review/RemarkIndex';
import { StepCard } from '@/components/review/StepCard';
import { StepMargin, stepElement } from '@/components/review/StepMargin';
import type { ReviewActions, ReviewWire, StepHistoryWire } from '@/components/review/types';
import type { ReviewView, StepHistory } from '@/server/review';
import { fetchJson } from '../../_lib/fetchJson';
import type { Wire } from '../../_lib/wire';

// The components' own description of the answers must match the server's.
type Matches<A, B> = A extends B ? (B extends A ? true : false) : false;
const reviewTypesMatch: Matches<Wire<ReviewView>, ReviewWire> & Matches<Wire<StepHistory>, StepHistoryWire> = true;
void reviewTypesMatch;

/** How often the margin asks again while nothing happens on the page (ms). */
const QUIET_REFRESH_MS = 5_000;
/** After the text changes, the margin asks again this long after the last change (ms). */
const EDIT_REFRESH_MS = 1_200;

function stepFromAddress(): { stepId: string | null; threadId: string | null } {
  if (typeof window === 'undefined') return { stepId: null, threadId: null };
  const params = new URLSearchParams(window.location.search);
  return { stepId: params.get('step'), threadId: params.get('thread') };
}

export function ReviewPane({
  derivationId,
  user,
  canEdit,
  textShown = true,
  children,
}: {
  derivationId: string;
  user: { id: string; name: string };
  canEdit: boolean;
  /** The text is on the page: the margin is asked for then, not while the text and its code load. */
  textShown?: boolean;
  children: ReactNode;
}) {
  const queryClient = useQueryClient();
  const key = useMemo(() => ['review', derivationId], [derivationId]);
  const review = useQuery({
    queryKey: key,
    queryFn: () => fetchJson<ReviewWire>(`/api/derivations/${derivationId}/review`),
    refetchInterval: QUIET_REFRESH_MS,
    enabled: textShown,
  });
  const [main, setMain] = useState<HTMLElement | null>(null);
  const [selected, setSelected] = useState<string | null>(null);
  const [focusThread, setFocusThread] = useState<string | null>(null);
  const scrolledTo = useRef<string | null>(null);

  const refresh = useCallback(() => queryClient.invalidateQueries({ queryKey: key }), [queryClient, key]);

  // A link from a mail (?step=…&thread=…) opens that step's card.
  useEffect(() => {
    const { stepId, threadId } = stepFromAddress();
    if (stepId) setSelected(stepId);
    if (threadId) setFocusThread(threadId);
  }, []);

  // Edits (anyone's) change hashes, excerpts and sign-offs: ask again once the text rests.
  useEffect(() => {
    if (!main) return;
    let timer: ReturnType<typeof setTimeout> | null = null;
    const observer = new MutationObserver(() => {
      if (timer) clearTimeout(timer);
      timer = setTimeout(() => void refresh(), EDIT_REFRESH_MS);
    });
    observer.observe(main, { subtree: true, childList: true, characterData: true });
    return () => {
      observer.disconnect();
      if (timer) clearTimeout(timer);
    };
  }, [main, refresh]);

  // Bring the selected step into view once its text is on the page.
  useEffect(() => {
    if (!main || !selected || scrolledTo.current === selected) return;
    let tries = 0;
    const interval = setInterval(() => {
      const element = stepElement(main, selected);
      if (element || ++tries > 50) {
        clearInterval(interval);
        if (element) {
          scrolledTo.current = selected;
          element.scrollIntoView({ block: 'center', behavior: 'smooth' });
        }
      }
    }, 100);
    return () => clearInterval(interval);
  }, [main, selected]);

  const actions = useMemo<ReviewActions>(() => {
    const base = `/api/derivations/${derivationId}`;
    const after = async <T,>(request: Promise<T>): Promise<void> => {
      try {
        await request;
      } finally {
        await refresh();
      }
    };
    return {
      remark: (stepId, body) => after(fetchJson(`${base}/remarks`, { method: 'POST', body: { stepId, body } })),
      reply: (threadId, body) => after(fetchJson(`${base}/remarks/${threadId}/replies`, { method: 'POST', body: { body } })),
      setResolved: (threadId, resolved) => after(fetchJson(`${base}/remarks/${threadId}`, { method: 'PATCH', body: { resolved } })),
      signOff: (stepId, contentHash) => after(fetchJson(`${base}/sign-offs`, { method: 'POST', body: { stepId, contentHash } })),
      withdraw: (signOffId) => after(fetchJson(`${base}/sign-offs/${signOffId}`, { method: 'DELETE' })),
      history: (stepId) => fetchJson<StepHistoryWire>(`${base}/steps/${encodeURIComponent(stepId)}/history`),
    };
  }, [derivationId, refresh]);

  const data = review.data;
  const steps = data?.steps ?? [];
  const select = useCallback((stepId: string | null) => {
    setSelected(stepId);
    setFocusThread(null);
    scrolledTo.current = stepId; // chosen here, so already in view
  }, []);
  const move = (by: -1 | 1) => {
    const at = steps.findIndex((s) => s.stepId === selected);
    const next = steps[Math.min(steps.length - 1, Math.max(0, at + by))];
    if (next) {
      setSelected(next.stepId);
      scrolledTo.current = null;
    }
  };

  return (
    <div>
      <div className="lg:grid lg:grid-cols-[minmax(0,1fr)_16rem] lg:gap-6">
        <div ref={setMain}>{children}</div>
        <aside aria-label="Review margin" className="mt-6">
          {review.error && (
            <p role="alert" className="mb-2 text-xs text-verdict-fails">
              Review could not be read: {review.error.message}
            </p>
          )}
          {data && steps.length > 0 && (
            <div className="mb-3">
              <StepChooser steps={steps} selected={selected} onChoose={select} />
            </div>
          )}
          {data && (
            <StepMargin
              main={main}
              steps={steps}
              selectedStepId={selected}
              onSelect={select}
              selectOnClick={canEdit ? 'noted' : 'always'}
              renderCard={(step, number) => (
                <StepCard
                  step={step}
                  number={number}
                  review={data}
                  selfId={user.id}
                  actions={actions}
                  focusThreadId={focusThread}
                  onClose={() => {
                    select(null);
                    // Back to the step's note, where the keyboard came from.
                    setTimeout(() => document.querySelector<HTMLElement>(`[data-step-note="${CSS.escape(step.stepId)}"]`)?.focus(), 0);
                  }}
                  onMove={move}
                />
              )}
            />
          )}
        </aside>
      </div>
      {data && (
        <RemarkIndex
          review={data}
          actions={actions}
          onShow={(stepId, threadId) => {
            setSelected(stepId);
            setFocusThread(threadId);
            scrolledTo.current = null;
          }}
        />
      )}
    </div>
  );
}

/** A keyboard way to any step: choose it by its number and text (a select only while choosing, as a
 * long derivation's margin would otherwise hold a select of every step for the browser's autofill to read). */
function StepChooser({ steps, selected, onChoose }: { steps: ReviewWire['steps']; selected: string | null; onChoose: (stepId: string | null) => void }) {
  const options = useMemo(() => [{ value: '', label: 'Choose a step…' }, ...steps.map((step, i) => ({ value: step.stepId, label: `${i + 1}. ${step.excerpt.slice(0, 60)}` }))], [steps]);
  return (
    <div className="flex flex-col gap-0.5 text-xs text-ink-soft">
      <span className="font-semibold tracking-wide" aria-hidden="true">
        Review a step
      </span>
      <span className="text-sm">
        <ChoiceButton label="Review a step" value={selected ?? ''} options={options} onChange={(value) => onChoose(value || null)} />
      </span>
    </div>
  );
}
