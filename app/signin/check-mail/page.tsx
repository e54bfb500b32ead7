import Link from 'next/link';
import { sinkInUse } from '@/server/mail';
import { PageTitle } from '@/components/ui';

export const dynamic = 'force-dynamic';

export default function CheckMailPage() {
  return (
    <div className="max-w-md">
      <PageTitle>Check your mail</PageTitle>
      <p className="text-lg">A sign-in link is on its way. Open it in this browser; it works once.</p>
      {sinkInUse() && (
        <p className="mt-4 text-ink-soft">
          This server keeps its mail in a local <Link href="/mailbox" className="text-accent underline">mailbox</Link> instead of sending it.
        </p>
      )}
    </div>
  );
}
