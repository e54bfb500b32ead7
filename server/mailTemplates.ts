// Every mail Marginalia sends, in one place and one shape: a subject, a plain-text body (always)
// and an HTML part made from the same pieces, each with a link back to the page it is about and a
// line saying why the recipient gets it. Senders call a template, then sendMail with the result.
import { escapeHtml } from './mail';

export interface MailContent {
  subject: string;
  text: string;
  html: string;
}

/** A piece of a message: a paragraph, a quotation (e.g. the text of a step), or a list. */
export type MailBlock = { paragraph: string } | { quote: string } | { list: string[] };

export interface MailLayout {
  subject: string;
  blocks: MailBlock[];
  /** The page the mail is about. */
  link: { href: string; label: string };
  /** Why this person gets the mail (a last, smaller line). */
  reason?: string;
}

function quoteText(text: string): string {
  return text
    .split('\n')
    .map((line) => `> ${line}`)
    .join('\n');
}

/** Lays a message out as plain text and HTML from the same pieces. */
export function composeMail(layout: MailLayout): MailContent {
  const textParts: string[] = [];
  const htmlParts: string[] = [];
  for (const block of layout.blocks) {
    if ('paragraph' in block) {
      textParts.push(block.paragraph);
      htmlParts.push(`<p>${escapeHtml(block.paragraph).replace(/\n/g, '<br>')}</p>`);
    } else if ('quote' in block) {
      textParts.push(quoteText(block.quote));
      htmlParts.push(`<blockquote style="border-left:3px solid #d9e9e6;margin:0;padding-left:0.75em">${escapeHtml(block.quote).replace(/\n/g, '<br>')}</blockquote>`);
    } else {
      textParts.push(block.list.map((item) => `- ${item}`).join('\n'));
      htmlParts.push(`<ul>${block.list.map((item) => `<li>${escapeHtml(item)}</li>`).join('')}</ul>`);
    }
  }
  textParts.push(`${layout.link.label}:\n${layout.link.href}`);
  htmlParts.push(`<p><a href="${escapeHtml(layout.link.href)}">${escapeHtml(layout.link.label)}</a></p>`);
  if (layout.reason) {
    textParts.push(`--\n${layout.reason}`);
    htmlParts.push(`<p style="color:#8a857c;font-size:0.9em">${escapeHtml(layout.reason)}</p>`);
  }
  return { subject: layout.subject, text: `${textParts.join('\n\n')}\n`, html: htmlParts.join('\n') };
}

function plural(count: number, one: string, many: string): string {
  return count === 1 ? one : many;
}

function names(list: readonly string[]): string {
  if (list.length <= 1) return list[0] ?? '';
  return `${list.slice(0, -1).join(', ')} and ${list[list.length - 1]}`;
}

// ---- the templates ---------------------------------------------------------------------------

export function invitationMail(input: { inviter: string; groupName: string; role: string; link: string; days: number }): MailContent {
  const lifetime = `${input.days} ${plural(input.days, 'day', 'days')}`;
  return composeMail({
    subject: `${input.inviter} invites you to ${input.groupName} on Marginalia`,
    blocks: [
      { paragraph: `${input.inviter} invites you to join the research group "${input.groupName}" on Marginalia as ${input.role}.` },
    ],
    link: { href: input.link, label: 'Accept the invitation' },
    reason: `The link works once and expires in ${lifetime}. If you do not know the group, ignore this message.`,
  });
}

export function signInLinkMail(input: { link: string; lifetime: string }): MailContent {
  return composeMail({
    subject: 'Your Marginalia sign-in link',
    blocks: [{ paragraph: 'Open this link to sign in to Marginalia.' }],
    link: { href: input.link, label: 'Sign in' },
    reason: `It works once, within ${input.lifetime}. If you did not ask for it, ignore this message.`,
  });
}

export interface RemarkMailInput {
  writer: string;
  derivationTitle: string;
  groupName: string;
  /** The step's text as it reads now (or as it read when the thread began). */
  stepExcerpt: string;
  body: string;
  /** A reply in a thread, rather than a new thread. */
  reply: boolean;
  /** The recipient wrote the step (else: they took part in the thread). */
  onTheirStep: boolean;
  link: string;
}

export function remarkMail(input: RemarkMailInput): MailContent {
  const what = input.reply ? 'replied to a remark' : 'left a remark';
  const where = input.onTheirStep ? 'on a step you wrote' : 'in a thread you took part in';
  return composeMail({
    subject: `${input.writer} ${what}${input.onTheirStep ? ' on your step' : ''} in "${input.derivationTitle}"`,
    blocks: [
      { paragraph: `${input.writer} ${what} ${where} in "${input.derivationTitle}" (${input.groupName}).` },
      ...(input.stepExcerpt ? [{ paragraph: 'The step:' }, { quote: input.stepExcerpt }] : []),
      { paragraph: `${input.reply ? 'The reply' : 'The remark'}:` },
      { quote: input.body },
    ],
    link: { href: input.link, label: 'Read and answer it' },
    reason: input.onTheirStep
      ? 'You get this mail because you wrote this step.'
      : 'You get this mail because you wrote in this remark thread.',
  });
}

export interface TurnedClaim {
  /** The claim's name (its id in the claim file). */
  name: string;
  kind: string;
  message: string;
}

export function claimsTurnedFailingMail(input: {
  derivationTitle: string;
  groupName: string;
  claims: readonly TurnedClaim[];
  editors: readonly string[];
  link: string;
}): MailContent {
  const count = input.claims.length;
  const after = input.editors.length > 0 ? ` after edits by ${names(input.editors)}` : ' after recent edits';
  return composeMail({
    subject:
      count === 1
        ? `A claim that held now fails in "${input.derivationTitle}"`
        : `${count} claims that held now fail in "${input.derivationTitle}"`,
    blocks: [
      {
        paragraph:
          `${count === 1 ? 'A claim' : `${count} claims`} of "${input.derivationTitle}" (${input.groupName}) ` +
          `held, and ${plural(count, 'fails', 'fail')} since the server checked the working copy again${after}:`,
      },
      { list: input.claims.map((claim) => `${claim.name} (${claim.kind}): fails${claim.message ? ` — ${claim.message}` : ''}`) },
    ],
    link: { href: input.link, label: 'Open the derivation' },
    reason: 'You get this mail because you are an author of this derivation. Claims that turn within a few minutes come in one mail.',
  });
}

export function versionLockedMail(input: {
  lockedBy: string;
  derivationTitle: string;
  groupName: string;
  versionNumber: number;
  versionName: string;
  claims: number;
  sha256: string;
  link: string;
}): MailContent {
  return composeMail({
    subject: `${input.lockedBy} locked version ${input.versionNumber} of "${input.derivationTitle}"`,
    blocks: [
      {
        paragraph:
          `${input.lockedBy} locked version ${input.versionNumber} ("${input.versionName}") of "${input.derivationTitle}" (${input.groupName}). ` +
          `The server checked every claim again: all ${input.claims} ${plural(input.claims, 'claim holds', 'claims hold')}.`,
      },
      { paragraph: `SHA-256 of the locked version (snapshot and check report):\n${input.sha256}` },
      { paragraph: 'The locked version no longer changes; work goes on in the working copy.' },
    ],
    link: { href: input.link, label: 'Open the locked version' },
    reason: `You get this mail because you are a member of ${input.groupName}.`,
  });
}
