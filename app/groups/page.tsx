import type { Metadata } from 'next';
import { requireUser } from '../_lib/session';
import { GroupsPage } from './GroupsPage';

export const metadata: Metadata = { title: 'Groups' };

export default async function Page() {
  const user = await requireUser('/groups');
  return <GroupsPage userName={user.name} />;
}
