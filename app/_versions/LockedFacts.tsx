'use client';
// What a locked version carries: who locked it and when, its SHA-256 and how to compute it
// again, and its exports (the LaTeX article, the JSON check report, the snapshot).
import { When } from '@/components/ui';
import type { Wire } from '@/app/_lib/wire';
import type { VersionDetail } from '@/server/versions/types';

export function LockedFacts({ version, filesBase }: { version: Wire<VersionDetail>; filesBase: string }) {
  const locked = version.locked;
  if (!locked) return null;
  return (
    <section aria-label="Lock" className="mt-4 rounded border border-accent/40 bg-accent-soft/40 px-4 py-3">
      <p>
        <span className="font-semibold">Locked</span> by {locked.lockedBy?.name ?? 'a former member'} on <When iso={locked.lockedAt} />. Every claim was checked
        again on the server at the lock: {version.summary.holds} of {version.summary.claims} hold. It no longer changes; work goes on in the working copy.
      </p>
      <p className="mt-2 text-sm text-ink-soft">SHA-256 over the snapshot and the check report</p>
      <p className="break-all font-mono text-sm" data-lock-hash>
        {locked.sha256}
      </p>
      {version.hash && (
        <details className="mt-2 text-sm">
          <summary className="cursor-pointer text-ink-soft">How to compute it again</summary>
          <p className="mt-1">
            Download the snapshot and the check report, then hash the line “{version.hash.format}”, the line “snapshot” and the snapshot’s length in bytes,
            the snapshot, a line break, the line “report” and the report’s length, and the report:
          </p>
          <pre className="mt-1 overflow-x-auto rounded bg-white/70 p-2 font-mono text-xs">{version.hash.recipe}</pre>
        </details>
      )}
      <nav aria-label="Exports" className="mt-3 flex flex-wrap gap-x-5 gap-y-1 text-sm">
        <a className="text-accent underline" href={`${filesBase}/article.tex`} download>
          LaTeX article (.tex)
        </a>
        <a className="text-accent underline" href={`${filesBase}/report.json`} download>
          Check report (JSON)
        </a>
        <a className="text-accent underline" href={`${filesBase}/snapshot`} download>
          Snapshot (.yjs)
        </a>
        <a className="text-accent underline" href="#figures">
          Figures (SVG)
        </a>
      </nav>
    </section>
  );
}
