// A claim's verdict as a word with an icon (holds, fails, inconclusive, invalid input), or where
// the claim is on its way to one (checking, waiting, cancelled).
import { VERDICT_LOOKS, type VerdictState } from './verdict';

export function VerdictBadge({ state, label, className = '' }: { state: VerdictState; label?: string; className?: string }) {
  const look = VERDICT_LOOKS[state];
  return (
    <span className={`inline-flex items-center gap-1 whitespace-nowrap ${look.className} ${className}`} data-verdict={state}>
      <svg viewBox="0 0 16 16" width="1em" height="1em" fill="none" stroke="currentColor" strokeWidth={1.6} strokeLinecap="round" strokeLinejoin="round" aria-hidden="true" focusable="false" className="shrink-0">
        {look.circle && <circle cx="8" cy="8" r="6.2" />}
        {look.paths.map((d) => (
          <path key={d} d={d} />
        ))}
      </svg>
      <span>{label ?? look.word}</span>
    </span>
  );
}
