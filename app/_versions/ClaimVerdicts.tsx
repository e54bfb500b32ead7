'use client';
// The claims of a version with the verdict stored for exactly that content (word and icon), each
// opening the shared evidence panel on its stored result: measured beside claimed, uncertainty,
// method, solver settings and statistics, sanity flags and convergence plots.
import { useState } from 'react';
import { EvidencePanel } from '@/components/checks/EvidencePanel';
import { MessageText } from '@/components/checks/MessageText';
import { VerdictBadge } from '@/components/checks/VerdictBadge';
import { KIND_LABELS, isClaimKind } from '@/flow/document';
import type { VersionClaim } from '@/server/versions/types';

function kindLabel(kind: string): string {
  return isClaimKind(kind) ? KIND_LABELS[kind] : kind.replace(/-/g, ' ');
}

function showInText(stepId: string): void {
  document.querySelector(`[data-step-id="${stepId}"]`)?.scrollIntoView({ behavior: 'smooth', block: 'center' });
}

const nothing = () => undefined;

export function ClaimVerdicts({ claims }: { claims: VersionClaim[] }) {
  const [open, setOpen] = useState<string | null>(null);
  if (claims.length === 0) return <p className="text-ink-soft">This version has no claims.</p>;
  return (
    <ol className="space-y-2">
      {claims.map((claim, i) => (
        <li key={claim.stepId} className="rounded border border-rule bg-white/60 px-3 py-2" data-claim={claim.claimId}>
          <div className="flex flex-wrap items-baseline gap-x-3">
            <VerdictBadge state={claim.status} />
            <span className="font-mono text-sm">{claim.claimId}</span>
            <span className="text-sm text-ink-soft">{kindLabel(claim.kind)}</span>
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
              <EvidencePanel
                title={`Claim ${i + 1} · ${kindLabel(claim.kind)}`}
                name={claim.claimId}
                note=""
                flowLabel={null}
                written={[]}
                run={{ state: claim.status, result: claim.result, message: claim.result.message }}
                tight={null}
                notice={null}
                canRunTight={false}
                onRunTight={nothing}
                onCancel={nothing}
                onClose={() => setOpen(null)}
                onShowInText={() => showInText(claim.stepId)}
              />
            </div>
          )}
        </li>
      ))}
    </ol>
  );
}
