import type { Metadata } from 'next';
import { requireUser } from '../../../_lib/session';
import { ImportPage } from './ImportPage';

export const metadata: Metadata = { title: 'Import a LaTeX file' };

export default async function Page({ params }: { params: Promise<{ groupId: string }> }) {
  const { groupId } = await params;
  await requireUser(`/groups/${groupId}/import`);
  return <ImportPage groupId={groupId} />;
}
