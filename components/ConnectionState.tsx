// The state of the live connection, in words with an icon (never colour alone).
import type { ReactNode, SVGProps } from 'react';

export type ConnectionPhase = 'connecting' | 'connected' | 'reconnecting' | 'offline' | 'closed';

function Icon({ children, ...props }: SVGProps<SVGSVGElement>) {
  return (
    <svg viewBox="0 0 16 16" width="1em" height="1em" fill="none" stroke="currentColor" strokeWidth={1.6}
      strokeLinecap="round" strokeLinejoin="round" aria-hidden="true" focusable="false" {...props}>
      {children}
    </svg>
  );
}

const icons: Record<ConnectionPhase, ReactNode> = {
  connected: (
    <Icon>
      <circle cx="4" cy="8" r="2.2" />
      <circle cx="12" cy="8" r="2.2" />
      <path d="M6.2 8h3.6" />
    </Icon>
  ),
  connecting: (
    <Icon>
      <circle cx="4" cy="8" r="2.2" />
      <circle cx="12" cy="8" r="2.2" />
      <path d="M6.6 8h.6M8.8 8h.6" />
    </Icon>
  ),
  reconnecting: (
    <Icon>
      <path d="M13 8a5 5 0 1 1-1.5-3.6" />
      <path d="M12 1.8v2.8H9.2" />
    </Icon>
  ),
  offline: (
    <Icon>
      <rect x="3" y="2.5" width="10" height="8" rx="1" />
      <path d="M1.8 13.5h12.4M2 2l12 12" />
    </Icon>
  ),
  closed: (
    <Icon>
      <circle cx="8" cy="8" r="6.2" />
      <path d="M5 8h6" />
    </Icon>
  ),
};

const words: Record<ConnectionPhase, string> = {
  connecting: 'Connecting…',
  connected: 'Connected',
  reconnecting: 'Reconnecting… changes kept on this device',
  offline: 'Offline — changes kept on this device',
  closed: 'Disconnected',
};

const looks: Record<ConnectionPhase, string> = {
  connecting: 'text-ink-soft',
  connected: 'text-accent',
  reconnecting: 'text-verdict-unsure',
  offline: 'text-verdict-unsure',
  closed: 'text-verdict-fails',
};

export function ConnectionState({ phase, detail }: { phase: ConnectionPhase; detail?: ReactNode }) {
  return (
    <p role="status" aria-live="polite" data-connection={phase} className={`flex items-center gap-1.5 text-sm ${looks[phase]}`}>
      <span className="shrink-0">{icons[phase]}</span>
      <span>{words[phase]}</span>
      {detail && <span className="text-ink-soft">— {detail}</span>}
    </p>
  );
}
