import type { Metadata } from 'next';
import { requireUser } from '../../../../_lib/session';
import { DatasetPage } from './DatasetPage';

export const metadata: Metadata = { title: 'Dataset' };

export default async function Page({ params }: { params: Promise<{ groupId: string; datasetId: string }> }) {
  const { groupId, datasetId } = await params;
  await requireUser(`/groups/${groupId}/datasets/${datasetId}`);
  return <DatasetPage groupId={groupId} datasetId={datasetId} />;
}
