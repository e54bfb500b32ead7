import type { Metadata } from 'next';
import { requireUser } from '../../../_lib/session';
import { MembersPage } from './MembersPage';

export const metadata: Metadata = { title: 'Members' };

export default async function Page({ params }: { params: Promise<{ groupId: string }> }) {
  const { groupId } = await params;
  const user = await requireUser(`/groups/${groupId}/members`);
  return <MembersPage groupId={groupId} userId={user.id} />;
}
