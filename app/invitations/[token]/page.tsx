import type { Metadata } from 'next';
import { currentUser } from '../../_lib/session';
import { InvitationPage } from './InvitationPage';

export const metadata: Metadata = { title: 'Invitation' };

export default async function Page({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const user = await currentUser();
  return <InvitationPage token={token} signedInAs={user ? { email: user.email, name: user.name } : null} />;
}
