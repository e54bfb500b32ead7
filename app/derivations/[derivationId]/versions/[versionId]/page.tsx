import type { Metadata } from 'next';
import { VersionPage } from '@/app/_versions/VersionPage';
import { requireUser } from '../../../../_lib/session';

export const metadata: Metadata = { title: 'Version' };

export default async function Page({ params }: { params: Promise<{ derivationId: string; versionId: string }> }) {
  const { derivationId, versionId } = await params;
  await requireUser(`/derivations/${derivationId}/versions/${versionId}`);
  return <VersionPage derivationId={derivationId} versionId={versionId} />;
}
