'use client';
// Two versions side by side, drawn by the editor with the steps that differ marked, and above
// them the differences in words: steps changed (the words that differ struck and added), added,
// removed or moved, and every claim whose verdict changed.
import { useQuery } from '@tanstack/react-query';
import Link from 'next/link';
import { StatusWord } from '@/components/StatusWord';
import { Loading, Notice, PageTitle } from '@/components/ui';
import { fetchJson } from '@/app/_lib/fetchJson';
import type { VersionComparison } from '@/server/versions/compare';
import { SnapshotDocument, type StepMark } from './SnapshotDocument';

function Verdict({ status }: { status: 'holds' | 'fails' | 'inconclusive' | 'invalid' | null }) {
  return status ? <StatusWord status={status} /> : <span className="text-ink-faint">not there</span>;
}

export function ComparePage({ derivationId, from, to }: { derivationId: string; from: string; to: string }) {
  const comparison = useQuery({
    queryKey: ['compare', derivationId, from, to],
    queryFn: () => fetchJson<VersionComparison>(`/api/derivations/${derivationId}/versions/compare?from=${from}&to=${to}`),
  });
  if (comparison.isPending) return <Loading what="the comparison" />;
  if (comparison.error) return <Notice kind="error">{comparison.error.message}</Notice>;
  const c = comparison.data;
  const left: Record<string, StepMark> = {};
  const right: Record<string, StepMark> = {};
  for (const step of c.steps) {
    if (step.change === 'removed') left[step.stepId] = 'removed';
    else if (step.change === 'added') right[step.stepId] = 'added';
    else if (step.change !== 'same') {
      left[step.stepId] = step.change;
      right[step.stepId] = step.change;
    }
  }
  const differing = c.steps.filter((s) => s.change !== 'same');
  const turned = c.claims.filter((claim) => claim.verdictChanged);
  const snapshot = (id: string) => `/api/derivations/${derivationId}/versions/${id}/snapshot`;

  return (
    <article>
      <PageTitle
        eyebrow={
          <Link href={`/derivations/${derivationId}`} className="hover:text-ink">
            back to the derivation
          </Link>
        }
      >
        {c.from.label} compared with {c.to.label.toLowerCase() === 'working copy' ? 'the working copy' : c.to.label}
      </PageTitle>
      <p className="mb-4 text-ink-soft" data-compare-counts>
        {c.counts.changed} step{c.counts.changed === 1 ? '' : 's'} changed, {c.counts.added} added, {c.counts.removed} removed, {c.counts.moved} moved;{' '}
        {c.counts.verdictsChanged} claim verdict{c.counts.verdictsChanged === 1 ? '' : 's'} changed.
      </p>

      {turned.length > 0 && (
        <section aria-label="Verdicts that changed" className="mb-5 rounded border border-accent/40 bg-accent-soft/40 px-4 py-2">
          <h2 className="text-lg">Verdicts that changed</h2>
          <ul>
            {turned.map((claim) => (
              <li key={claim.stepId} className="flex flex-wrap items-center gap-2" data-verdict-changed={claim.claimId}>
                <span className="font-mono text-sm">{claim.claimId}</span>
                <Verdict status={claim.before} />
                <span aria-label="became">→</span>
                <Verdict status={claim.after} />
              </li>
            ))}
          </ul>
        </section>
      )}

      <section aria-label="Differences" className="mb-6">
        <h2 className="mb-2 text-lg">Differences</h2>
        {differing.length === 0 ? (
          <p className="text-ink-soft">The two have the same text and blocks.</p>
        ) : (
          <ol className="space-y-2">
            {differing.map((step) => (
              <li key={step.stepId} className="rounded border border-rule bg-white/60 px-3 py-2" data-step-change={step.change}>
                <p className="text-sm text-ink-soft">
                  {step.change} · {step.type.replace(/([A-Z])/g, ' $1').toLowerCase()}
                </p>
                <p className="whitespace-pre-wrap font-mono text-sm">
                  {step.parts
                    ? step.parts.map((part, i) =>
                        part.added ? (
                          <ins key={i} className="bg-verdict-holds/15 text-verdict-holds no-underline" title="added">
                            {part.value}
                          </ins>
                        ) : part.removed ? (
                          <del key={i} className="bg-verdict-fails/10 text-verdict-fails" title="removed">
                            {part.value}
                          </del>
                        ) : (
                          <span key={i}>{part.value}</span>
                        ),
                      )
                    : step.change === 'removed'
                      ? <del className="text-verdict-fails">{step.before}</del>
                      : <ins className="text-verdict-holds no-underline">{step.after}</ins>}
                </p>
              </li>
            ))}
          </ol>
        )}
      </section>

      <div className="grid gap-6 lg:grid-cols-2">
        <section aria-label={c.from.label}>
          <h2 className="mb-2 text-lg">{c.from.label}</h2>
          <SnapshotDocument snapshotUrl={snapshot(c.from.id)} label={c.from.label} marks={left} />
        </section>
        <section aria-label={c.to.label}>
          <h2 className="mb-2 text-lg">{c.to.label}</h2>
          {c.to.id === 'working' ? (
            <p className="text-ink-soft">
              The working copy is open on{' '}
              <Link className="underline" href={`/derivations/${derivationId}`}>
                the derivation’s page
              </Link>
              ; its differences are listed above.
            </p>
          ) : (
            <SnapshotDocument snapshotUrl={snapshot(c.to.id)} label={c.to.label} marks={right} />
          )}
        </section>
      </div>
    </article>
  );
}
