'use client';
// The selected step in the margin: its sign-offs ("checked by" with name and time, or why the
// last one was cleared), its remark threads, a new remark, and its history.
import { useEffect, useRef, useState } from 'react';
import { Button, When } from '../ui';
import { CheckedIcon, ClearedIcon } from './reviewIcons';
import { RemarkForm } from './RemarkForm';
import { RemarkThread } from './RemarkThread';
import type { ReviewActions, ReviewWire, StepHistoryWire, StepReviewWire } from './types';

const historyWords: Record<StepHistoryWire['events'][number]['kind'], string> = {
  'signed-off': 'signed off',
  'sign-off-cleared': 'sign-off cleared',
  'sign-off-withdrawn': 'sign-off withdrawn',
  remark: 'remark',
  reply: 'reply',
  resolved: 'resolved',
  reopened: 'reopened',
};

function StepHistoryList({ stepId, actions }: { stepId: string; actions: ReviewActions }) {
  const [history, setHistory] = useState<StepHistoryWire | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [open, setOpen] = useState(false);

  async function toggle() {
    if (open) return setOpen(false);
    setOpen(true);
    setError(null);
    try {
      setHistory(await actions.history(stepId));
    } catch (failure) {
      setError(failure instanceof Error ? failure.message : 'The history could not be read.');
    }
  }

  return (
    <div>
      <Button kind="quiet" className="px-1.5 py-0 text-xs" aria-expanded={open} onClick={() => void toggle()}>
        {open ? 'Hide history' : 'History'}
      </Button>
      {open && (
        <div className="mt-1.5" aria-label="Step history">
          {error && <p role="alert" className="text-xs text-verdict-fails">{error}</p>}
          {!history && !error && <p className="text-xs text-ink-faint">Reading…</p>}
          {history && history.events.length === 0 && <p className="text-xs text-ink-faint">Nothing yet.</p>}
          {history && history.events.length > 0 && (
            <ol className="flex flex-col gap-1 border-l border-rule pl-2">
              {history.events.map((event, i) => (
                <li key={i} className="text-xs text-ink-soft">
                  <When iso={event.at} /> · <span className="text-ink">{historyWords[event.kind]}</span>
                  {event.by && <> by {event.by.name}</>}
                  {(event.kind === 'sign-off-cleared' || event.kind === 'sign-off-withdrawn') && <>: {event.detail}</>}
                </li>
              ))}
            </ol>
          )}
        </div>
      )}
    </div>
  );
}

export function SignOffLine({ step, selfId, actions, maySignOff }: { step: StepReviewWire; selfId: string; actions: ReviewActions; maySignOff: boolean }) {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const run = async (action: () => Promise<void>) => {
    setBusy(true);
    setError(null);
    try {
      await action();
    } catch (failure) {
      setError(failure instanceof Error ? failure.message : 'That did not work.');
    } finally {
      setBusy(false);
    }
  };
  return (
    <div className="flex flex-col gap-1">
      {step.signOffs.map((signOff) => (
        <div key={signOff.id} className="flex items-start gap-1.5 text-sm text-verdict-holds">
          <CheckedIcon className="mt-1 shrink-0" />
          <div className="min-w-0">
            <p data-sign-off>
              Checked by <span className="text-ink">{signOff.by.name}</span>, <When iso={signOff.signedAt} />
            </p>
            {maySignOff && signOff.by.id === selfId && (
              <button
                type="button"
                disabled={busy}
                onClick={() => void run(() => actions.withdraw(signOff.id))}
                className="text-xs text-ink-faint underline decoration-rule underline-offset-2 hover:text-ink"
              >
                Withdraw my sign-off
              </button>
            )}
          </div>
        </div>
      ))}
      {step.signOffs.length === 0 && step.lastCleared?.cleared && (
        <p className="flex items-start gap-1.5 text-xs text-verdict-unsure" data-sign-off-cleared>
          <ClearedIcon className="mt-0.5 shrink-0" />
          <span>
            Sign-off by {step.lastCleared.by.name} cleared, <When iso={step.lastCleared.cleared.at} />: {step.lastCleared.cleared.reason}
            {step.lastCleared.cleared.by && step.lastCleared.cleared.by.id !== step.lastCleared.by.id && <> (edit by {step.lastCleared.cleared.by.name})</>}.
          </span>
        </p>
      )}
      {step.signOffs.length === 0 && !step.lastCleared && <p className="text-xs text-ink-faint">Not signed off.</p>}
      {error && <p role="alert" className="text-xs text-verdict-fails">{error}</p>}
      {maySignOff && !step.signOffs.some((s) => s.by.id === selfId) && (
        <SignOffButton step={step} busy={busy} onPress={() => void run(() => actions.signOff(step.stepId, step.contentHash))} />
      )}
    </div>
  );
}

function SignOffButton({ step, busy, onPress }: { step: StepReviewWire; busy: boolean; onPress: () => void }) {
  return (
    <div data-can-sign-off={step.stepId}>
      <Button className="px-2 py-0.5 text-sm" busy={busy} onClick={onPress}>
        <CheckedIcon /> Sign off this step
      </Button>
    </div>
  );
}

export function StepCard({
  step,
  number,
  review,
  selfId,
  actions,
  focusThreadId,
  onClose,
  onMove,
}: {
  step: StepReviewWire;
  /** 1 for the first step. */
  number: number;
  review: ReviewWire;
  selfId: string;
  actions: ReviewActions;
  focusThreadId?: string | null;
  onClose: () => void;
  onMove: (by: -1 | 1) => void;
}) {
  const [writing, setWriting] = useState(false);
  const threads = review.threads.filter((t) => t.stepId === step.stepId);
  const cardRef = useRef<HTMLElement>(null);
  // Opened from a note or the chooser, the note is gone: the keyboard continues in the card.
  useEffect(() => {
    const active = document.activeElement;
    if (!active || active === document.body || active.closest('[data-review-margin]') || active.closest('[aria-label="Review margin"]')) {
      if (!cardRef.current?.contains(active)) cardRef.current?.focus({ preventScroll: true });
    }
  }, [step.stepId]);
  return (
    <section
      ref={cardRef}
      tabIndex={-1}
      aria-label={`Review of step ${number}`}
      className="flex flex-col gap-2 rounded border border-accent/50 bg-paper px-3 py-2.5 shadow-sm"
      data-step-card={step.stepId}
    >
      <header className="flex items-start justify-between gap-2">
        <div className="min-w-0">
          <p className="text-xs uppercase tracking-[0.12em] text-ink-faint">Step {number}</p>
          <p className="line-clamp-2 text-sm text-ink-soft">{step.excerpt}</p>
        </div>
        <div className="flex shrink-0 gap-0.5">
          <Button kind="quiet" className="px-1 py-0 text-xs" aria-label="Previous step" onClick={() => onMove(-1)}>
            ↑
          </Button>
          <Button kind="quiet" className="px-1 py-0 text-xs" aria-label="Next step" onClick={() => onMove(1)}>
            ↓
          </Button>
          <Button kind="quiet" className="px-1 py-0 text-xs" aria-label="Close the step's review" onClick={onClose}>
            ×
          </Button>
        </div>
      </header>

      <SignOffLine step={step} selfId={selfId} actions={actions} maySignOff={review.you.maySignOff} />

      {threads.length > 0 && (
        <div className="flex flex-col gap-1.5">
          {threads.map((thread) => (
            <RemarkThread key={thread.id} thread={thread} you={review.you} actions={actions} highlighted={thread.id === focusThreadId} />
          ))}
        </div>
      )}

      {review.you.mayRemark &&
        (writing ? (
          <RemarkForm
            label="Your remark on this step"
            submitLabel="Leave remark"
            autoFocus
            onCancel={() => setWriting(false)}
            onSubmit={async (body) => {
              await actions.remark(step.stepId, body);
              setWriting(false);
            }}
          />
        ) : (
          <div>
            <Button kind="quiet" className="px-2 py-0.5 text-sm" onClick={() => setWriting(true)}>
              Leave a remark
            </Button>
          </div>
        ))}
      <StepHistoryList key={step.stepId} stepId={step.stepId} actions={actions} />
    </section>
  );
}
