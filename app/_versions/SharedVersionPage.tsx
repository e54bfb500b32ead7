'use client';
// What a share link shows: that locked version and nothing else, signed in or not.
import { useQuery } from '@tanstack/react-query';
import { Loading, Notice } from '@/components/ui';
import { fetchJson } from '@/app/_lib/fetchJson';
import type { Wire } from '@/app/_lib/wire';
import type { VersionDetail } from '@/server/versions/types';
import { VersionView } from './VersionView';

export function SharedVersionPage({ token }: { token: string }) {
  const base = `/api/shared/${encodeURIComponent(token)}`;
  const shared = useQuery({ queryKey: ['shared', token], queryFn: () => fetchJson<{ version: Wire<VersionDetail>; expiresAt: string }>(base), retry: false });
  if (shared.isPending) return <Loading what="the shared version" />;
  if (shared.error) return <Notice kind="error">{shared.error.message}</Notice>;
  const { version } = shared.data;
  return <VersionView version={version} filesBase={base} eyebrow={<>{version.derivation.groupName} · shared locked version</>} />;
}
