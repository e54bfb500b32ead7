'use client';
// A member's view of one version, with the lead's share links for a locked one.
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import Link from 'next/link';
import { Button, Loading, Notice } from '@/components/ui';
import { fetchJson } from '@/app/_lib/fetchJson';
import type { DerivationView, Wire } from '@/app/_lib/wire';
import type { VersionDetail } from '@/server/versions/types';
import { LockRefusal, requestLock } from './LockRefusal';
import { ShareLinks } from './ShareLinks';
import { VersionView } from './VersionView';

export function VersionPage({ derivationId, versionId }: { derivationId: string; versionId: string }) {
  const base = `/api/derivations/${derivationId}/versions/${versionId}`;
  const version = useQuery({ queryKey: ['version', versionId], queryFn: () => fetchJson<Wire<VersionDetail>>(base) });
  const derivation = useQuery({ queryKey: ['derivation', derivationId], queryFn: () => fetchJson<Wire<DerivationView>>(`/api/derivations/${derivationId}`) });
  const queryClient = useQueryClient();
  const lock = useMutation({
    mutationFn: () => requestLock<Wire<VersionDetail>>(`${base}/lock`, {}),
    onSuccess: (result) => {
      if (result.kind !== 'locked') return;
      void queryClient.invalidateQueries({ queryKey: ['version', versionId] });
      void queryClient.invalidateQueries({ queryKey: ['versions', derivationId] });
      void queryClient.invalidateQueries({ queryKey: ['derivation', derivationId] });
    },
  });
  if (version.isPending) return <Loading what="the version" />;
  if (version.error) return <Notice kind="error">{version.error.message}</Notice>;
  const v = version.data;
  const mayShare = derivation.data?.actions.includes('shareLink') ?? false;
  const mayLock = derivation.data?.actions.includes('lock') ?? false;
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
      {!v.locked && mayLock && (
        <div className="mt-4 rounded border border-rule bg-white/60 px-4 py-3">
          <p className="mb-2 text-sm text-ink-soft">Locking checks every claim of this version again on the server; it succeeds only if all of them hold.</p>
          <Button busy={lock.isPending} onClick={() => lock.mutate()}>
            {lock.isPending ? 'Checking every claim…' : 'Lock this version'}
          </Button>
          {lock.data?.kind === 'refused' && <LockRefusal error={lock.data.error} claims={lock.data.claims} />}
          {lock.data?.kind === 'error' && (
            <div className="mt-3">
              <Notice kind="error">{lock.data.error}</Notice>
            </div>
          )}
        </div>
      )}
      {v.locked && mayShare && <ShareLinks derivationId={derivationId} versionId={versionId} />}
    </VersionView>
  );
}
