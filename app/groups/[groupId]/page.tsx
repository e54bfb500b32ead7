import type { Metadata } from 'next';
import { requireUser } from '../../_lib/session';
import { DerivationsPage } from './DerivationsPage';

export const metadata: Metadata = { title: 'Derivations' };

export default async function Page({ params }: { params: Promise<{ groupId: string }> }) {
  const { groupId } = await params;
  await requireUser(`/groups/${groupId}`);
  return <DerivationsPage groupId={groupId} />;
}
