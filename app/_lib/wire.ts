// Types of what the routes send: the server's types with dates turned into ISO strings by JSON.
export type Wire<T> = T extends Date
  ? string
  : T extends (infer U)[]
    ? Wire<U>[]
    : T extends object
      ? { [K in keyof T]: Wire<T[K]> }
      : T;

export type { DerivationRow, DerivationView } from '@/server/derivations';
export type { GroupSummary, GroupView, MemberView } from '@/server/groups';
export type { InvitationView, PendingInvitationView } from '@/server/invitations';
export type { MailMessage } from '@/server/mailbox';
export type { SessionUser } from '@/server/session';
export type { Action, Role } from '@/server/permissions';
