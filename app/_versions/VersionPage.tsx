'use client';
// A member's view of one version, with the lead's share links for a locked one.
import { useQuery } from '@tanstack/react-query';
import Link from 'next/link';
import { Loading, Notice } from '@/components/ui';
import { fetchJson } from '@/app/_lib/fetchJson';
import type { DerivationView, Wire } from '@/app/_lib/wire';
import type { VersionDetail } from '@/server/versions/types';
import { ShareLinks } from './ShareLinks';
import { VersionView } from './VersionView';

export function VersionPage({ derivationId, versionId }: { derivationId: string; versionId: string }) {
  const base = `/api/derivations/${derivationId}/versions/${versionId}`;
  const version = useQuery({ queryKey: ['version', versionId], queryFn: () => fetchJson<Wire<VersionDetail>>(base) });
  const derivation = useQuery({ queryKey: ['derivation', derivationId], queryFn: () => fetchJson<Wire<DerivationView>>(`/api/derivations/${derivationId}`) });
  if (version.isPending) return <Loading what="the version" />;
  if (version.error) return <Notice kind="error">{version.error.message}</Notice>;
  const v = version.data;
  const mayShare = derivation.data?.actions.includes('shareLink') ?? false;
  return (
    <VersionView
      version={v}
      filesBase={base}
      eyebrow={
        <>
          <Link href={`/groups/${v.derivation.groupId}`} className="hover:text-ink">
            {v.derivation.groupName}
          </Link>{' '}
          ·{' '}
          <Link href={`/derivations/${derivationId}`} className="hover:text-ink">
            back to the working copy
          </Link>
        </>
      }
    >
      {v.locked && mayShare && <ShareLinks derivationId={derivationId} versionId={versionId} />}
    </VersionView>
  );
}
