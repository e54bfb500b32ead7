import type { Metadata } from 'next';
import { requireUser } from '../../../_lib/session';
import { DatasetsPage } from './DatasetsPage';

export const metadata: Metadata = { title: 'Datasets' };

export default async function Page({ params }: { params: Promise<{ groupId: string }> }) {
  const { groupId } = await params;
  await requireUser(`/groups/${groupId}/datasets`);
  return <DatasetsPage groupId={groupId} />;
}
