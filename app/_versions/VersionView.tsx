'use client';
// A version read-only: its facts, the lock (hash, exports), the text as the editor draws it, each
// claim with its stored verdict and evidence, and the figures. Used by members and by share links.
import { useState, type ReactNode } from 'react';
import type { LiveChecks } from '@/editor/blocks';
import { StatusWord } from '@/components/StatusWord';
import { PageTitle, When } from '@/components/ui';
import type { Wire } from '@/app/_lib/wire';
import type { VersionClaim, VersionDetail } from '@/server/versions/types';
import { ClaimVerdicts } from './ClaimVerdicts';
import { Figures } from './Figures';
import { LockedFacts } from './LockedFacts';
import { SnapshotDocument } from './SnapshotDocument';

export function VersionView({ version, filesBase, eyebrow, children }: { version: Wire<VersionDetail>; filesBase: string; eyebrow: ReactNode; children?: ReactNode }) {
  const s = version.summary;
  // Claims hold no dates, so their wire form is the stored form exactly (Wire<> would widen tuples).
  const claims = version.checks.claims as unknown as VersionClaim[];
  const [live, setLive] = useState<LiveChecks | null>(null);
  return (
    <article>
      <PageTitle eyebrow={eyebrow}>{version.derivation.title}</PageTitle>
      <p className="-mt-4 mb-3 text-lg">
        Version {version.number}: {version.name}{' '}
        {version.locked ? <span className="ml-2 rounded border border-accent/50 px-1.5 text-sm text-accent">locked version</span> : <span className="ml-2 text-sm text-ink-soft">read-only</span>}
      </p>
      <dl className="flex flex-wrap gap-x-8 gap-y-1 text-sm text-ink-soft">
        <div className="flex gap-2">
          <dt>Saved</dt>
          <dd className="text-ink">
            <When iso={version.createdAt} />
            {version.createdBy ? ` by ${version.createdBy.name}` : ''}
          </dd>
        </div>
        <div className="flex gap-2">
          <dt>Claims</dt>
          <dd className="flex gap-3 text-ink">
            {s.claims === 0 ? 'none' : (
              <>
                <StatusWord status="holds" label={`${s.holds} hold${s.holds === 1 ? 's' : ''}`} />
                {s.fails > 0 && <StatusWord status="fails" label={`${s.fails} fail${s.fails === 1 ? 's' : ''}`} />}
                {s.inconclusive > 0 && <StatusWord status="inconclusive" label={`${s.inconclusive} inconclusive`} />}
                {s.invalid > 0 && <StatusWord status="invalid" label={`${s.invalid} invalid input`} />}
              </>
            )}
          </dd>
        </div>
      </dl>
      <LockedFacts version={version} filesBase={filesBase} />
      {children}
      <p className="mt-6 text-sm text-ink-soft" data-stored-verdicts-note>
        The verdicts in the text and in the {version.locked ? 'check report' : 'list'} below are the server’s, stored with this version. A claim’s evidence offers
        “Check again here” to run it in your browser and see its result beside the stored one; nothing is written.
      </p>
      <section aria-label="Text" className="mt-2">
        <SnapshotDocument snapshotUrl={`${filesBase}/snapshot`} label={`${version.derivation.title}, version ${version.number}`} stored={claims} onLive={setLive} />
      </section>
      <section className="mt-8">
        <h2 className="mb-2 border-b border-rule pb-1 text-xl">{version.locked ? 'Check report' : 'Claims and their verdicts'}</h2>
        <ClaimVerdicts claims={claims} live={live} />
      </section>
      <Figures claims={claims} />
    </article>
  );
}
