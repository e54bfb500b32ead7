// Small line icons drawn for Marginalia. Decorative: the word beside each icon carries the meaning.
import type { SVGProps } from 'react';

export type IconProps = SVGProps<SVGSVGElement>;

/** The frame every line icon of ours is drawn in: 16 units square, a 1.6 stroke in the text's colour. */
export function Icon({ children, ...props }: IconProps) {
  return (
    <svg
      viewBox="0 0 16 16"
      width="1em"
      height="1em"
      fill="none"
      stroke="currentColor"
      strokeWidth={1.6}
      strokeLinecap="round"
      strokeLinejoin="round"
      aria-hidden="true"
      focusable="false"
      {...props}
    >
      {children}
    </svg>
  );
}

export const HoldsIcon = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="8" cy="8" r="6.2" />
    <path d="M5.2 8.3l1.9 1.9 3.7-4" />
  </Icon>
);

export const FailsIcon = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="8" cy="8" r="6.2" />
    <path d="M5.8 5.8l4.4 4.4M10.2 5.8l-4.4 4.4" />
  </Icon>
);

export const InconclusiveIcon = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="8" cy="8" r="6.2" />
    <path d="M5.3 8h5.4" />
  </Icon>
);

export const InvalidIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M8 1.8l6.4 11.4H1.6z" />
    <path d="M8 6.3v3.2M8 11.4v.1" />
  </Icon>
);

export const LockIcon = (p: IconProps) => (
  <Icon {...p}>
    <rect x="3.2" y="7" width="9.6" height="6.8" rx="1.2" />
    <path d="M5.3 7V5a2.7 2.7 0 015.4 0v2" />
  </Icon>
);

export const SortIcon = ({ sorted, ...p }: IconProps & { sorted: 'asc' | 'desc' | false }) => (
  <Icon {...p}>
    <path d="M5 6.5l3-3 3 3" opacity={sorted === 'desc' ? 0.25 : 1} />
    <path d="M5 9.5l3 3 3-3" opacity={sorted === 'asc' ? 0.25 : 1} />
  </Icon>
);

export const MailIcon = (p: IconProps) => (
  <Icon {...p}>
    <rect x="1.8" y="3.5" width="12.4" height="9" rx="1.2" />
    <path d="M2.2 4.2L8 8.6l5.8-4.4" />
  </Icon>
);
