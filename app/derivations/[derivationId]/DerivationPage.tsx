'use client';
// The derivation's page. For now its heading and facts; the whiteboard joins it with the editor.
import { useQuery } from '@tanstack/react-query';
import Link from 'next/link';
import { ClaimCount } from '@/components/StatusWord';
import { Loading, Notice, PageTitle, When } from '@/components/ui';
import { fetchJson } from '../../_lib/fetchJson';
import type { DerivationView, Wire } from '../../_lib/wire';

export function DerivationPage({ derivationId }: { derivationId: string }) {
  const derivation = useQuery({
    queryKey: ['derivation', derivationId],
    queryFn: () => fetchJson<Wire<DerivationView>>(`/api/derivations/${derivationId}`),
  });
  if (derivation.isPending) return <Loading what="the derivation" />;
  if (derivation.error) return <Notice kind="error">{derivation.error.message}</Notice>;
  const d = derivation.data;
  return (
    <article>
      <PageTitle
        eyebrow={
          <Link href={`/groups/${d.groupId}`} className="hover:text-ink">
            {d.groupName}
          </Link>
        }
      >
        {d.title}
      </PageTitle>
      <dl className="grid max-w-2xl grid-cols-[10rem_1fr] gap-x-4 gap-y-2">
        <dt className="text-ink-soft">Authors</dt>
        <dd>{d.authors.map((a) => a.name).join(', ') || '—'}</dd>
        <dt className="text-ink-soft">Claims</dt>
        <dd className="flex gap-4">
          <ClaimCount status="holds" count={d.claimsHolding} checked={d.claimsHolding + d.claimsFailing > 0} />
          <ClaimCount status="fails" count={d.claimsFailing} checked={d.claimsHolding + d.claimsFailing > 0} />
        </dd>
        <dt className="text-ink-soft">Last edit</dt>
        <dd>
          <When iso={d.updatedAt} />
        </dd>
        <dt className="text-ink-soft">Locked versions</dt>
        <dd>{d.lockedVersions === 0 ? 'none' : d.lockedVersions}</dd>
        <dt className="text-ink-soft">You are</dt>
        <dd>{d.role}</dd>
      </dl>
    </article>
  );
}
