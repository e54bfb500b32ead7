import type { Metadata } from 'next';
import { requireUser } from '../../../../_lib/session';
import { UploadPage } from './UploadPage';

export const metadata: Metadata = { title: 'Upload a dataset' };

export default async function Page({ params }: { params: Promise<{ groupId: string }> }) {
  const { groupId } = await params;
  await requireUser(`/groups/${groupId}/datasets/new`);
  return <UploadPage groupId={groupId} />;
}
