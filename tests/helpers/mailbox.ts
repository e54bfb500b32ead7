// Reading the local mail sink through the running server's mailbox route (no database access).
export interface SinkMessage {
  id: string;
  receivedAt: string;
  sender: string;
  recipients: string[];
  subject: string;
  text: string;
  html: string | null;
}

export async function readMailbox(url: string, options: { to?: string } = {}): Promise<SinkMessage[]> {
  const query = options.to ? `?to=${encodeURIComponent(options.to)}` : '';
  const response = await fetch(`${url}/api/mailbox${query}`);
  if (!response.ok) throw new Error(`The mailbox answered ${response.status}.`);
  return ((await response.json()) as { messages: SinkMessage[] }).messages;
}

/** Waits for the newest message to an address (optionally with a subject matching) that was not there before. */
export async function waitForMail(
  url: string,
  options: { to: string; subject?: RegExp; notIn?: SinkMessage[]; timeoutMs?: number },
): Promise<SinkMessage> {
  const seen = new Set((options.notIn ?? []).map((m) => m.id));
  const deadline = Date.now() + (options.timeoutMs ?? 15_000);
  for (;;) {
    const messages = await readMailbox(url, { to: options.to });
    const found = messages.find((m) => !seen.has(m.id) && (!options.subject || options.subject.test(m.subject)));
    if (found) return found;
    if (Date.now() > deadline) throw new Error(`No mail to ${options.to} arrived in time.`);
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

/** The first link in a message whose path starts with the given prefix, e.g. '/invitations/'. */
export function linkIn(message: SinkMessage, pathPrefix: string): string {
  for (const match of message.text.matchAll(/https?:\/\/[^\s<>"]+/g)) {
    const link = match[0];
    if (new URL(link).pathname.startsWith(pathPrefix)) return link;
  }
  throw new Error(`No link to ${pathPrefix} in the message "${message.subject}".`);
}
