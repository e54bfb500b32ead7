'use client';
// Every remark thread of the derivation in one list, in document order: threads on steps that are
// gone stay here, marked "on a removed step" with the text the step had, so no remark is lost.
import { useState } from 'react';
import { Button } from '../ui';
import { RemarkThread, ThreadState } from './RemarkThread';
import type { RemarkThreadWire, ReviewActions, ReviewWire } from './types';

function Summary({ thread }: { thread: RemarkThreadWire }) {
  const first = thread.entries.find((e) => e.kind === 'remark');
  const replies = thread.entries.filter((e) => e.kind === 'remark').length - 1;
  return (
    <>
      <ThreadState thread={thread} />{' '}
      <span className="text-sm text-ink">
        {thread.startedBy.name}: {first?.body.slice(0, 140)}
        {first && first.body.length > 140 ? '…' : ''}
      </span>
      {replies > 0 && <span className="text-xs text-ink-faint"> · {replies === 1 ? '1 reply' : `${replies} replies`}</span>}
    </>
  );
}

export function RemarkIndex({
  review,
  actions,
  onShow,
}: {
  review: ReviewWire;
  actions: ReviewActions;
  /** Select a step in the margin and bring it into view. */
  onShow: (stepId: string, threadId: string) => void;
}) {
  const [filter, setFilter] = useState<'open' | 'all'>('open');
  const [expanded, setExpanded] = useState<string | null>(null);
  const numberOf = new Map(review.steps.map((s, i) => [s.stepId, i + 1]));
  const threads = review.threads.filter((t) => filter === 'all' || !t.resolved);
  const open = review.threads.filter((t) => !t.resolved).length;

  return (
    <section aria-label="Remarks" className="mt-8">
      <div className="mb-2 flex items-baseline justify-between gap-4 border-b border-rule pb-1">
        <h2 className="text-xl">Remarks</h2>
        <div role="group" aria-label="Which remarks" className="flex gap-1 text-sm">
          <Button kind="quiet" className="px-2 py-0 text-sm" aria-pressed={filter === 'open'} onClick={() => setFilter('open')}>
            Open ({open})
          </Button>
          <Button kind="quiet" className="px-2 py-0 text-sm" aria-pressed={filter === 'all'} onClick={() => setFilter('all')}>
            All ({review.threads.length})
          </Button>
        </div>
      </div>
      {threads.length === 0 ? (
        <p className="text-sm text-ink-faint">{filter === 'open' ? 'No open remarks.' : 'No remarks yet.'}</p>
      ) : (
        <ul className="flex flex-col divide-y divide-rule">
          {threads.map((thread) => (
            <li key={thread.id} className="py-2" data-remark-index={thread.id}>
              <p className="text-xs text-ink-faint">
                {thread.stepPresent ? (
                  <>Step {numberOf.get(thread.stepId)}</>
                ) : (
                  <span className="text-verdict-unsure">on a removed step</span>
                )}{' '}
                · <span className="italic">{thread.excerpt}</span>
              </p>
              <div className="flex flex-wrap items-baseline justify-between gap-2">
                <p className="min-w-0">
                  <Summary thread={thread} />
                </p>
                {thread.stepPresent ? (
                  <Button kind="quiet" className="px-2 py-0 text-xs" onClick={() => onShow(thread.stepId, thread.id)}>
                    Show at the step
                  </Button>
                ) : (
                  <Button kind="quiet" className="px-2 py-0 text-xs" aria-expanded={expanded === thread.id} onClick={() => setExpanded(expanded === thread.id ? null : thread.id)}>
                    {expanded === thread.id ? 'Hide' : 'Read the thread'}
                  </Button>
                )}
              </div>
              {expanded === thread.id && (
                <div className="mt-2 max-w-xl">
                  <RemarkThread thread={thread} you={review.you} actions={actions} />
                </div>
              )}
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
