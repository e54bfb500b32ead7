// A check status as a word with an icon (never colour alone).
import { FailsIcon, HoldsIcon, InconclusiveIcon, InvalidIcon } from './icons';

export type CheckStatus = 'holds' | 'fails' | 'inconclusive' | 'invalid';

const look: Record<CheckStatus, { word: string; className: string; Icon: typeof HoldsIcon }> = {
  holds: { word: 'holds', className: 'text-verdict-holds', Icon: HoldsIcon },
  fails: { word: 'fails', className: 'text-verdict-fails', Icon: FailsIcon },
  inconclusive: { word: 'inconclusive', className: 'text-verdict-unsure', Icon: InconclusiveIcon },
  invalid: { word: 'invalid input', className: 'text-verdict-invalid', Icon: InvalidIcon },
};

export function StatusWord({ status, label }: { status: CheckStatus; label?: string }) {
  const { word, className, Icon } = look[status];
  return (
    <span className={`inline-flex items-center gap-1 whitespace-nowrap ${className}`}>
      <Icon className="shrink-0" />
      <span>{label ?? word}</span>
    </span>
  );
}

/** A number of claims in one state, e.g. "3 hold"; "not checked" before any check run. */
export function ClaimCount({ status, count, checked }: { status: 'holds' | 'fails'; count: number; checked: boolean }) {
  if (!checked && count === 0) return <span className="text-ink-faint">not checked</span>;
  const word = status === 'holds' ? (count === 1 ? 'holds' : 'hold') : count === 1 ? 'fails' : 'fail';
  return <StatusWord status={status} label={`${count} ${word}`} />;
}
