'use client';
// The check summary beside the document: every claim with its verdict (word and icon), counts at
// the top; choosing a claim takes the reader to it in the text.
import type { VerdictState } from './verdict';
import { VerdictBadge } from './VerdictBadge';

export interface SummaryEntry {
  stepId: string;
  number: number;
  kindLabel: string;
  /** The claim's name, or its note, or nothing. */
  name: string;
  flowLabel: string | null;
  state: VerdictState;
  /** The previous verdict is shown while the claim is checked again. */
  stale: boolean;
}

const COUNTED: { state: VerdictState; one: string; many: string }[] = [
  { state: 'holds', one: 'holds', many: 'hold' },
  { state: 'fails', one: 'fails', many: 'fail' },
  { state: 'inconclusive', one: 'inconclusive', many: 'inconclusive' },
  { state: 'invalid', one: 'invalid input', many: 'invalid input' },
];

export function CheckSummary({ entries, selected, onSelect, checking }: { entries: SummaryEntry[]; selected: string | null; onSelect: (stepId: string) => void; checking: boolean }) {
  if (entries.length === 0) {
    return <p className="text-sm text-ink-faint">No claims yet. Insert a claim block to have a step checked.</p>;
  }
  const counts = COUNTED.map((c) => ({ ...c, count: entries.filter((e) => e.state === c.state).length })).filter((c) => c.count > 0);
  return (
    <div>
      <p className="mb-2 flex flex-wrap gap-x-3 gap-y-1 text-sm" aria-live="polite" data-check-counts>
        {counts.map((c) => (
          <VerdictBadge key={c.state} state={c.state} label={`${c.count} ${c.count === 1 ? c.one : c.many}`} />
        ))}
        {checking && <VerdictBadge state="checking" label="checking…" />}
      </p>
      <ol className="flex flex-col gap-0.5" aria-label="Claims and their verdicts">
        {entries.map((entry) => (
          <li key={entry.stepId}>
            <button
              type="button"
              onClick={() => onSelect(entry.stepId)}
              aria-current={selected === entry.stepId ? 'true' : undefined}
              data-summary-step={entry.stepId}
              className="flex w-full items-baseline gap-2 rounded px-2 py-1 text-left text-sm hover:bg-accent-soft/60 aria-[current=true]:bg-accent-soft"
            >
              <span className="w-6 shrink-0 text-right text-ink-faint">{entry.number}</span>
              <span className="min-w-0 flex-1">
                <span className="text-ink">{entry.kindLabel}</span>
                {entry.name && <span className="text-ink-soft"> · {entry.name}</span>}
                {entry.flowLabel && <span className="block text-xs text-ink-faint">{entry.flowLabel}</span>}
              </span>
              <span className={entry.stale ? 'opacity-60' : undefined}>
                <VerdictBadge state={entry.state} />
              </span>
            </button>
          </li>
        ))}
      </ol>
    </div>
  );
}
