// Reading what the local mail sink kept, for the mailbox page (only while the sink is in use).
import { and, arrayContains, desc, eq } from 'drizzle-orm';
import { getDb, schema } from '../db/client';
import { notFound } from './api/errors';
import { sinkInUse } from './mail';

export type MailMessage = typeof schema.mailMessages.$inferSelect;

function ensureSink(): void {
  if (!sinkInUse()) throw notFound('There is no mailbox: mail is sent through SMTP.');
}

export async function listMail(options: { to?: string; limit: number }): Promise<MailMessage[]> {
  ensureSink();
  const where = options.to ? arrayContains(schema.mailMessages.recipients, [options.to.toLowerCase()]) : undefined;
  return getDb().select().from(schema.mailMessages).where(where).orderBy(desc(schema.mailMessages.receivedAt)).limit(options.limit);
}

export async function mailById(id: string): Promise<MailMessage> {
  ensureSink();
  const [row] = await getDb().select().from(schema.mailMessages).where(and(eq(schema.mailMessages.id, id)));
  if (!row) throw notFound('No such message.');
  return row;
}
