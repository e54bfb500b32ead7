'use client';
// The claims of a version with the verdict stored for exactly that content: the word and icon,
// the measured value beside the claimed one, uncertainty, tolerance, method and solver settings,
// and the evidence plots drawn in the shared plot frame (each can be saved as SVG).
import { PlotFrame, evidencePlot } from '@/components/plot';
import { StatusWord } from '@/components/StatusWord';
import type { ClaimResult, Measured, PlotData } from '@/flow/types';
import type { VersionClaim } from '@/server/versions/types';

function number(value: number): string {
  if (!Number.isFinite(value)) return String(value);
  const abs = Math.abs(value);
  return abs !== 0 && (abs < 1e-4 || abs >= 1e6) ? value.toExponential(6) : Number(value.toPrecision(10)).toString();
}

export function measuredText(value: Measured | null): string {
  if (value === null || value === undefined) return '—';
  if (typeof value === 'number') return number(value);
  if (Array.isArray(value)) return value.map((v) => (typeof v === 'number' ? number(v) : `${number(v.re)} ${v.im >= 0 ? '+' : '−'} ${number(Math.abs(v.im))}i`)).join(', ');
  return Object.entries(value)
    .map(([k, v]) => `${k} = ${number(v)}`)
    .join(', ');
}

function record(values: Record<string, number | string | boolean>): string {
  const entries = Object.entries(values);
  return entries.length === 0 ? '—' : entries.map(([k, v]) => `${k} = ${typeof v === 'number' ? number(v) : String(v)}`).join(', ');
}

/** A check's evidence plot in the plot frame's terms (shared with the live evidence panel). */
export { evidencePlot };

function Evidence({ result, claimId }: { result: ClaimResult; claimId: string }) {
  const plots = result.evidence.plots ?? [];
  return (
    <div className="mt-2 space-y-3 text-sm">
      <dl className="grid grid-cols-[10rem_1fr] gap-x-4 gap-y-1">
        <dt className="text-ink-soft">Measured</dt>
        <dd className="font-mono" data-measured>{measuredText(result.measured)}</dd>
        <dt className="text-ink-soft">Claimed</dt>
        <dd className="font-mono">{measuredText(result.expected)}</dd>
        <dt className="text-ink-soft">Uncertainty</dt>
        <dd className="font-mono">{result.uncertainty === null ? '—' : number(result.uncertainty)}</dd>
        <dt className="text-ink-soft">Tolerance</dt>
        <dd className="font-mono">{result.tolerance === null ? '—' : number(result.tolerance)}</dd>
        <dt className="text-ink-soft">Method</dt>
        <dd>{result.method}</dd>
        <dt className="text-ink-soft">Solver settings</dt>
        <dd className="font-mono">{record(result.settings)}</dd>
        <dt className="text-ink-soft">Statistics</dt>
        <dd className="font-mono">
          {record(result.stats)}; {number(result.ms)} ms
        </dd>
        {result.sanity.length > 0 && (
          <>
            <dt className="text-ink-soft">Sanity checks</dt>
            <dd>
              <ul>
                {result.sanity.map((flag) => (
                  <li key={flag.check}>
                    {flag.ok ? 'ok' : 'flagged'} — {flag.message}
                  </li>
                ))}
              </ul>
            </dd>
          </>
        )}
      </dl>
      {plots.map((plot, i) => (
        <PlotFrame key={i} {...evidencePlot(plot, `${claimId}-${i}`)} height={260} />
      ))}
      <p className="text-ink-faint">A numerical check is evidence, not a proof.</p>
    </div>
  );
}

export function ClaimVerdicts({ claims, heading = 'Claims and their verdicts' }: { claims: VersionClaim[]; heading?: string }) {
  if (claims.length === 0) return <p className="text-ink-soft">This version has no claims.</p>;
  return (
    <section aria-label={heading}>
      <ol className="space-y-2">
        {claims.map((claim) => (
          <li key={claim.stepId} className="rounded border border-rule bg-white/60 px-3 py-2" data-claim={claim.claimId}>
            <details>
              <summary className="flex cursor-pointer flex-wrap items-baseline gap-x-3">
                <StatusWord status={claim.status} />
                <span className="font-mono text-sm">{claim.claimId}</span>
                <span className="text-sm text-ink-soft">{claim.kind.replace(/-/g, ' ')}</span>
                <button
                  type="button"
                  className="ml-auto text-sm text-accent underline-offset-2 hover:underline"
                  onClick={(event) => {
                    event.preventDefault();
                    document.querySelector(`[data-step-id="${claim.stepId}"]`)?.scrollIntoView({ behavior: 'smooth', block: 'center' });
                  }}
                >
                  Show in the text
                </button>
              </summary>
              <p className="mt-1 text-sm">{claim.result.message}</p>
              <Evidence result={claim.result} claimId={claim.claimId} />
            </details>
          </li>
        ))}
      </ol>
    </section>
  );
}
