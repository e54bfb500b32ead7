// Line icons of review, drawn like components/icons.tsx (decorative: a word always stands beside).
import { Icon, type IconProps } from '../icons';

/** A sign-off: a tick beneath a short rule, like a mark in a margin. */
export const CheckedIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M3 8.6l3 3 7-7.2" />
    <path d="M3 14h10" opacity={0.5} />
  </Icon>
);

/** A remark: a note with a folded corner. */
export const RemarkIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M2.5 2.5h11v8h-4l-3 3v-3h-4z" />
  </Icon>
);

/** A resolved remark: the note with a tick. */
export const ResolvedIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M2.5 2.5h11v8h-4l-3 3v-3h-4z" />
    <path d="M5.5 6.5l1.7 1.7 3.3-3.4" />
  </Icon>
);

/** A sign-off that no longer stands: the tick struck through. */
export const ClearedIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M3 8.6l3 3 7-7.2" opacity={0.45} />
    <path d="M2.5 13.5l11-11" />
  </Icon>
);
