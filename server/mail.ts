// Sending mail. The server decides at start-up where mail goes (SMTP_URL, or the local sink) and
// registers it here on globalThis, so route handlers bundled by Next.js send through the same one.
import nodemailer, { type Transporter } from 'nodemailer';

export type MailRoute = { kind: 'smtp'; url: string } | { kind: 'sink'; host: string; port: number };

interface MailRegistration {
  route: MailRoute;
  from: string;
}

const KEY = Symbol.for('marginalia.mail');
type GlobalWithMail = typeof globalThis & { [KEY]?: MailRegistration };

export function registerMailRoute(registration: MailRegistration | undefined): void {
  (globalThis as GlobalWithMail)[KEY] = registration;
}

export function mailRegistration(): MailRegistration | undefined {
  return (globalThis as GlobalWithMail)[KEY];
}

/** True while mail goes to the local sink (then the mailbox page is open). */
export function sinkInUse(): boolean {
  return mailRegistration()?.route.kind === 'sink';
}

let cached: { registration: MailRegistration; transporter: Transporter } | undefined;

function transporter(registration: MailRegistration): Transporter {
  if (cached?.registration === registration) return cached.transporter;
  const { route } = registration;
  const created =
    route.kind === 'smtp'
      ? nodemailer.createTransport(route.url)
      : nodemailer.createTransport({ host: route.host, port: route.port, secure: false, ignoreTLS: true });
  cached = { registration, transporter: created };
  return created;
}

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
}

export async function sendMail(mail: OutgoingMail): Promise<void> {
  const registration = mailRegistration();
  if (!registration) throw new Error('Mail is not set up: Marginalia must be started through server/index.ts.');
  await transporter(registration).sendMail({ from: registration.from, ...mail });
}

/** Escapes text for the HTML part of a message. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}
