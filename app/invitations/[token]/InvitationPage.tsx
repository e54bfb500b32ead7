'use client';
import { useMutation, useQuery } from '@tanstack/react-query';
import { signOut } from 'next-auth/react';
import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { Button, Loading, Notice, PageTitle, When } from '@/components/ui';
import { fetchJson } from '../../_lib/fetchJson';
import type { InvitationView, Wire } from '../../_lib/wire';

const stateWords = {
  accepted: 'This invitation has already been used.',
  revoked: 'This invitation was withdrawn by the group lead.',
  expired: 'This invitation has expired. Ask the group lead for a new one.',
} as const;

export function InvitationPage({ token, signedInAs }: { token: string; signedInAs: { email: string; name: string } | null }) {
  const router = useRouter();
  const invitation = useQuery({
    queryKey: ['invitation', token],
    queryFn: () => fetchJson<Wire<InvitationView>>(`/api/invitations/${encodeURIComponent(token)}`),
  });
  const accept = useMutation({
    mutationFn: () => fetchJson<{ groupId: string }>(`/api/invitations/${encodeURIComponent(token)}/accept`, { method: 'POST', body: {} }),
    onSuccess: ({ groupId }) => {
      router.push(`/groups/${groupId}`);
      router.refresh();
    },
  });

  if (invitation.isPending) return <Loading what="the invitation" />;
  if (invitation.error) {
    return (
      <div className="max-w-xl">
        <PageTitle>Invitation</PageTitle>
        <Notice kind="error">{invitation.error.message}</Notice>
      </div>
    );
  }
  const inv = invitation.data;
  const here = `/invitations/${encodeURIComponent(token)}`;
  return (
    <div className="max-w-xl">
      <PageTitle eyebrow="Invitation">Join {inv.groupName}</PageTitle>
      <p className="text-lg">
        {inv.invitedBy ?? 'The group lead'} invites <strong>{inv.email}</strong> to the research group “{inv.groupName}” as{' '}
        <strong>{inv.role}</strong>.
      </p>
      {inv.state !== 'pending' ? (
        <div className="mt-6">
          <Notice kind="error">{stateWords[inv.state]}</Notice>
        </div>
      ) : signedInAs && signedInAs.email === inv.email ? (
        <div className="mt-6 flex flex-col items-start gap-3">
          <Button busy={accept.isPending} onClick={() => accept.mutate()}>
            Accept and join {inv.groupName}
          </Button>
          <p className="text-sm text-ink-faint">
            The link works once and expires <When iso={inv.expiresAt} />.
          </p>
          {accept.error && <Notice kind="error">{accept.error.message}</Notice>}
        </div>
      ) : signedInAs ? (
        <div className="mt-6 flex flex-col items-start gap-3">
          <Notice kind="info">
            You are signed in as {signedInAs.email}, but this invitation is for {inv.email}.
          </Notice>
          <Button kind="quiet" onClick={() => void signOut({ callbackUrl: here })}>
            Sign out, then continue as {inv.email}
          </Button>
        </div>
      ) : inv.hasAccount ? (
        <div className="mt-6">
          <Link href={`/signin?callbackUrl=${encodeURIComponent(here)}&email=${encodeURIComponent(inv.email)}`} className="rounded border border-accent bg-accent px-4 py-2 text-paper hover:bg-accent-strong">
            Sign in to accept
          </Link>
        </div>
      ) : (
        <div className="mt-6">
          <Link href={`/register?invitation=${encodeURIComponent(token)}&email=${encodeURIComponent(inv.email)}`} className="rounded border border-accent bg-accent px-4 py-2 text-paper hover:bg-accent-strong">
            Register to accept
          </Link>
        </div>
      )}
    </div>
  );
}
