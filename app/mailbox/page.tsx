import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { sinkInUse } from '@/server/mail';
import { MailboxPage } from './MailboxPage';

export const metadata: Metadata = { title: 'Mailbox' };
export const dynamic = 'force-dynamic';

export default function Page() {
  if (!sinkInUse()) notFound();
  return <MailboxPage />;
}
