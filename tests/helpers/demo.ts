// The demo accounts (invented people) and a way to sign each of them in on a demo server.
import { randomBytes } from 'node:crypto';
import { demoAccounts, demoDerivationTitle, demoGroup } from '../../db/demo';
import type { MemberRole } from '../../db/schema';
import { api, type Api } from './api';
import { signIn } from './auth';

export { demoAccounts, demoDerivationTitle, demoGroup };

export function demoAccount(role: MemberRole) {
  return demoAccounts.find((a) => a.role === role)!;
}

export interface DemoSessions {
  cookies: Record<MemberRole, string>;
  as: Record<MemberRole, Api>;
  groupId: string;
  derivationId: string;
}

/** Signs in all four demo members and finds the demo group and derivation. */
export async function demoSessions(url: string): Promise<DemoSessions> {
  const cookies = {} as Record<MemberRole, string>;
  const as = {} as Record<MemberRole, Api>;
  for (const account of demoAccounts) {
    cookies[account.role] = await signIn(url, account.email, account.password);
    as[account.role] = api(url, cookies[account.role]);
  }
  const groups = await as.lead.get<{ groups: { id: string; name: string }[] }>('/api/groups');
  const group = groups.body.groups.find((g) => g.name === demoGroup.name);
  if (!group) throw new Error('The demo group is missing: was the server started with demo: true?');
  const list = await as.lead.get<{ derivations: { id: string; title: string }[] }>(`/api/groups/${group.id}/derivations`);
  const derivation = list.body.derivations.find((d) => d.title === demoDerivationTitle);
  if (!derivation) throw new Error('The demo derivation is missing.');
  return { cookies, as, groupId: group.id, derivationId: derivation.id };
}

/** A derivation title of its own: titles are unique in a group, and a browser test run again after
 * a failure (their one retry) makes its derivation again. */
export function ownTitle(title: string): string {
  return `${title} ${randomBytes(3).toString('hex')}`;
}
