import type { Metadata } from 'next';
import { ComparePage } from '@/app/_versions/ComparePage';
import { requireUser } from '../../../../_lib/session';

export const metadata: Metadata = { title: 'Compare versions' };

export default async function Page({
  params,
  searchParams,
}: {
  params: Promise<{ derivationId: string }>;
  searchParams: Promise<{ from?: string; to?: string }>;
}) {
  const { derivationId } = await params;
  const { from = '', to = 'working' } = await searchParams;
  await requireUser(`/derivations/${derivationId}/versions/compare?from=${from}&to=${to}`);
  return <ComparePage derivationId={derivationId} from={from} to={to} />;
}
