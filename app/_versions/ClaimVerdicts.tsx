'use client';
// The claims of a version with the verdict stored for exactly that content (word and icon), each
// opening the shared evidence panel on its stored result: measured beside claimed, uncertainty,
// method, solver settings and statistics, sanity flags and convergence plots. Once the text is
// open, "Check again here" runs a claim in this browser and shows that result beside the stored one.
import { useState } from 'react';
import { MessageText } from '@/components/checks/MessageText';
import { VerdictBadge } from '@/components/checks/VerdictBadge';
import type { LiveChecks } from '@/editor/blocks';
import type { VersionClaim } from '@/server/versions/types';
import { StoredClaimEvidence, kindLabel, useLiveSnapshot } from './StoredEvidence';

function showInText(stepId: string): void {
  document.querySelector(`[data-step-id="${CSS.escape(stepId)}"]`)?.scrollIntoView({ behavior: 'smooth', block: 'center' });
}

export function ClaimVerdicts({ claims, live = null }: { claims: VersionClaim[]; live?: LiveChecks | null }) {
  const [open, setOpen] = useState<string | null>(null);
  const snapshot = useLiveSnapshot(live);
  if (claims.length === 0) return <p className="text-ink-soft">This version has no claims.</p>;
  return (
    <ol className="space-y-2">
      {claims.map((claim, i) => {
        const here = snapshot?.claims.find((c) => c.info.stepId === claim.stepId)?.here;
        return (
          <li key={claim.stepId} className="rounded border border-rule bg-white/60 px-3 py-2" data-claim={claim.claimId}>
            <div className="flex flex-wrap items-baseline gap-x-3">
              <VerdictBadge state={claim.status} />
              <span className="font-mono text-sm">{claim.claimId}</span>
              <span className="text-sm text-ink-soft">{kindLabel(claim.kind)}</span>
              {here?.state === 'done' && here.result && (
                <span className="flex items-baseline gap-1 text-sm text-ink-soft" data-checked-here={here.result.status}>
                  checked here: <VerdictBadge state={here.result.status} />
                </span>
              )}
              <span className="ml-auto flex gap-3 text-sm">
                <button type="button" className="text-accent underline-offset-2 hover:underline" onClick={() => showInText(claim.stepId)}>
                  Show in the text
                </button>
                <button
                  type="button"
                  className="text-accent underline-offset-2 hover:underline"
                  aria-expanded={open === claim.stepId}
                  onClick={() => setOpen(open === claim.stepId ? null : claim.stepId)}
                >
                  {open === claim.stepId ? 'Hide the evidence' : 'Evidence'}
                </button>
              </span>
            </div>
            <p className="mt-1 text-sm">
              <MessageText message={claim.result.message} />
            </p>
            {open === claim.stepId && (
              <div className="mt-2">
                <StoredClaimEvidence claim={claim} number={i + 1} live={live} editor={null} onClose={() => setOpen(null)} />
              </div>
            )}
          </li>
        );
      })}
    </ol>
  );
}
