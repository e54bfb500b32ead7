// The local mail sink: an SMTP server on a loopback port that keeps every message it receives in
// the database, for the mailbox page. It stands in for real mail when no SMTP_URL is configured.
import type { AddressInfo } from 'node:net';
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import { getDb, schema } from '../db/client';

const MAX_MESSAGE_BYTES = 5 * 1024 * 1024;

function addresses(field: AddressObject | AddressObject[] | undefined): string[] {
  const list = field === undefined ? [] : Array.isArray(field) ? field : [field];
  return list.flatMap((entry) => entry.value.map((a) => (a.address ?? '').toLowerCase()).filter(Boolean));
}

export interface MailSink {
  host: string;
  port: number;
  stop(): Promise<void>;
}

export async function startMailSink(port: number): Promise<MailSink> {
  const host = '127.0.0.1';
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    size: MAX_MESSAGE_BYTES,
    logger: false,
    banner: 'Marginalia mail sink',
    onData(stream, session, callback) {
      simpleParser(stream)
        .then(async (parsed) => {
          const envelopeTo = session.envelope.rcptTo.map((r) => r.address.toLowerCase());
          const recipients = envelopeTo.length > 0 ? envelopeTo : addresses(parsed.to);
          const sender = addresses(parsed.from)[0] ?? (session.envelope.mailFrom ? session.envelope.mailFrom.address : '');
          await getDb()
            .insert(schema.mailMessages)
            .values({
              sender,
              recipients,
              subject: parsed.subject ?? '',
              text: parsed.text ?? '',
              html: typeof parsed.html === 'string' ? parsed.html : null,
            });
          callback();
        })
        .catch((error: Error) => callback(error));
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, host, () => {
      server.off('error', reject);
      resolve();
    });
  });
  server.on('error', (error) => console.error('mail sink:', error.message));
  const actualPort = (server.server.address() as AddressInfo).port;
  return {
    host,
    port: actualPort,
    stop: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
