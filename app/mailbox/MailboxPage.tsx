'use client';
// Every message the local mail sink received, newest first, with its links clickable.
import { useQuery } from '@tanstack/react-query';
import { Fragment, useState } from 'react';
import { MailIcon } from '@/components/icons';
import { Loading, Notice, PageTitle, When } from '@/components/ui';
import { fetchJson } from '../_lib/fetchJson';
import type { MailMessage, Wire } from '../_lib/wire';

type Message = Wire<MailMessage>;

function TextWithLinks({ text }: { text: string }) {
  const parts = text.split(/(https?:\/\/[^\s<>"]+)/g);
  return (
    <>
      {parts.map((part, i) =>
        /^https?:\/\//.test(part) ? (
          <a key={i} href={part} className="break-all text-accent underline">
            {part}
          </a>
        ) : (
          <Fragment key={i}>{part}</Fragment>
        ),
      )}
    </>
  );
}

export function MailboxPage() {
  const [open, setOpen] = useState<string | null>(null);
  const mail = useQuery({
    queryKey: ['mailbox'],
    queryFn: () => fetchJson<{ messages: Message[] }>('/api/mailbox'),
    refetchInterval: 3000,
  });
  return (
    <div>
      <PageTitle eyebrow="Local mail sink">Mailbox</PageTitle>
      <p className="mb-6 max-w-3xl text-ink-soft">
        No SMTP server is configured, so Marginalia keeps the mail it would send here. Anyone who can open this server
        can read it: set SMTP_URL before others use it.
      </p>
      {mail.isPending && <Loading what="mail" />}
      {mail.error && <Notice kind="error">{mail.error.message}</Notice>}
      {mail.data && mail.data.messages.length === 0 && <p className="text-ink-faint">No mail yet.</p>}
      {mail.data && mail.data.messages.length > 0 && (
        <ul className="divide-y divide-rule border-y border-rule" aria-label="Messages">
          {mail.data.messages.map((m) => (
            <li key={m.id} className="py-2">
              <button
                type="button"
                aria-expanded={open === m.id}
                onClick={() => setOpen(open === m.id ? null : m.id)}
                className="flex w-full flex-wrap items-baseline gap-x-4 rounded text-left"
              >
                <MailIcon className="self-center text-ink-faint" />
                <span className="font-semibold">{m.subject || '(no subject)'}</span>
                <span className="text-ink-soft">to {m.recipients.join(', ')}</span>
                <span className="flex-1" />
                <span className="text-sm text-ink-faint">
                  <When iso={m.receivedAt} />
                </span>
              </button>
              {open === m.id && (
                <pre className="mt-2 whitespace-pre-wrap font-mono text-sm leading-relaxed">
                  <TextWithLinks text={m.text} />
                </pre>
              )}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
