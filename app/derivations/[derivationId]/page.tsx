import type { Metadata } from 'next';
import { requireUser } from '../../_lib/session';
import { DerivationPage } from './DerivationPage';

export const metadata: Metadata = { title: 'Derivation' };

export default async function Page({ params }: { params: Promise<{ derivationId: string }> }) {
  const { derivationId } = await params;
  const user = await requireUser(`/derivations/${derivationId}`);
  return <DerivationPage derivationId={derivationId} user={{ id: user.id, name: user.name }} />;
}
