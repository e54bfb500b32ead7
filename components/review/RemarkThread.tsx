'use client';
// One remark thread: its entries in order (remarks, resolved, reopened), a reply, resolve or reopen.
import { useState } from 'react';
import { Button, When } from '../ui';
import { RemarkIcon, ResolvedIcon } from './reviewIcons';
import { RemarkForm } from './RemarkForm';
import type { RemarkThreadWire, ReviewActions, ReviewWire } from './types';

export function ThreadState({ thread }: { thread: RemarkThreadWire }) {
  return thread.resolved ? (
    <span className="inline-flex items-center gap-1 text-xs text-verdict-holds">
      <ResolvedIcon /> resolved
    </span>
  ) : (
    <span className="inline-flex items-center gap-1 text-xs text-accent">
      <RemarkIcon /> open
    </span>
  );
}

export function RemarkThread({
  thread,
  you,
  actions,
  highlighted = false,
}: {
  thread: RemarkThreadWire;
  you: ReviewWire['you'];
  actions: ReviewActions;
  highlighted?: boolean;
}) {
  const [replying, setReplying] = useState(false);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);

  async function toggleResolved() {
    setBusy(true);
    setError(null);
    try {
      await actions.setResolved(thread.id, !thread.resolved);
    } catch (failure) {
      setError(failure instanceof Error ? failure.message : 'That did not work.');
    } finally {
      setBusy(false);
    }
  }

  return (
    <article
      id={`remark-${thread.id}`}
      aria-label={`Remark thread by ${thread.startedBy.name}`}
      className={`rounded border bg-white/60 px-2.5 py-2 ${highlighted ? 'border-accent' : 'border-rule'}`}
    >
      <div className="mb-1 flex items-center justify-between gap-2">
        <ThreadState thread={thread} />
        {you.mayResolve && (
          <Button kind="quiet" className="px-1.5 py-0 text-xs" busy={busy} onClick={() => void toggleResolved()}>
            {thread.resolved ? 'Reopen' : 'Resolve'}
          </Button>
        )}
      </div>
      <ol className="flex flex-col gap-1.5">
        {thread.entries.map((entry) =>
          entry.kind === 'remark' ? (
            <li key={entry.id} className="text-sm">
              <p className="text-xs text-ink-faint">
                <span className="text-ink-soft">{entry.by.name}</span> · <When iso={entry.at} />
              </p>
              <p className="whitespace-pre-wrap text-ink">{entry.body}</p>
            </li>
          ) : (
            <li key={entry.id} className="text-xs italic text-ink-faint">
              {entry.kind === 'resolved' ? 'Resolved' : 'Reopened'} by {entry.by.name} · <When iso={entry.at} />
            </li>
          ),
        )}
      </ol>
      {error && (
        <p role="alert" className="mt-1 text-xs text-verdict-fails">
          {error}
        </p>
      )}
      {you.mayRemark && !thread.resolved && (
        <div className="mt-2">
          {replying ? (
            <RemarkForm
              label="Your reply"
              submitLabel="Reply"
              autoFocus
              onCancel={() => setReplying(false)}
              onSubmit={async (body) => {
                await actions.reply(thread.id, body);
                setReplying(false);
              }}
            />
          ) : (
            <Button kind="quiet" className="px-1.5 py-0 text-xs" onClick={() => setReplying(true)}>
              Reply
            </Button>
          )}
        </div>
      )}
    </article>
  );
}
