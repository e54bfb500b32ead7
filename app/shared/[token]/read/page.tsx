import type { Metadata } from 'next';
import { redirect } from 'next/navigation';
import { SharedVersionPage } from '@/app/_versions/SharedVersionPage';
import { openShareLink } from '@/server/versions';

export const metadata: Metadata = { title: 'Shared locked version', robots: { index: false } };

export default async function Page({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  try {
    await openShareLink(token);
  } catch {
    // The share address itself answers 404 or 410 with a page saying why.
    redirect(`/shared/${encodeURIComponent(token)}`);
  }
  return <SharedVersionPage token={token} />;
}
