// The whole invitation flow through the local mail sink: the lead invites by e-mail with a role,
// the link is read out of the stored message and followed; new people register on the way, people
// with an account sign in and accept. Used, withdrawn, expired and misdirected links are refused.
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import {
  api,
  demoSessions,
  linkIn,
  readMailbox,
  registerAndSignIn,
  signIn,
  SignInRefused,
  startServer,
  waitForMail,
  type ApiError,
  type DemoSessions,
  type StartedServer,
} from '../helpers';

interface InvitationInfo {
  groupName: string;
  email: string;
  role: string;
  invitedBy: string;
  state: string;
  hasAccount: boolean;
}

let server: StartedServer;
let demo: DemoSessions;

beforeAll(async () => {
  server = await startServer({ demo: true });
  demo = await demoSessions(server.url);
});

afterAll(async () => {
  await server?.stop();
});

const tokenOf = (link: string) => new URL(link).pathname.split('/').pop()!;

async function invite(email: string, role: string) {
  const before = await readMailbox(server.url, { to: email.toLowerCase() });
  const answer = await demo.as.lead.post<{ id: string } & ApiError>(`/api/groups/${demo.groupId}/invitations`, { email, role });
  expect(answer.status, JSON.stringify(answer.body)).toBe(201);
  const mail = await waitForMail(server.url, { to: email.toLowerCase(), notIn: before });
  return { id: answer.body.id, mail, link: linkIn(mail, '/invitations/') };
}

describe('inviting a new person', () => {
  test('the invitation mail names the group, the inviter and the role; a new person registers through its link and joins with that role', async () => {
    const { mail, link } = await invite('Newcomer@Chains.example', 'reviewer');
    expect(mail.subject).toMatch(/Maren Quist invites you to Chain Growth Group/);
    expect(mail.text).toMatch(/as reviewer/);
    expect(new URL(link).origin).toBe(server.url);

    const anonymous = api(server.url);
    const info = await anonymous.get<InvitationInfo>(`/api/invitations/${tokenOf(link)}`);
    expect(info.body).toMatchObject({ groupName: 'Chain Growth Group', email: 'newcomer@chains.example', role: 'reviewer', state: 'pending', hasAccount: false });
    // The invitation page itself opens without an account.
    expect((await fetch(link)).status).toBe(200);

    const registered = await anonymous.post<{ joinedGroupId: string }>('/api/register', {
      name: 'New Comer',
      email: 'newcomer@chains.example',
      password: 'newcomer password',
      invitation: tokenOf(link),
    });
    expect(registered.status).toBe(201);
    expect(registered.body.joinedGroupId).toBe(demo.groupId);

    const newcomer = api(server.url, await signIn(server.url, 'newcomer@chains.example', 'newcomer password'));
    expect((await newcomer.get<{ role: string }>(`/api/groups/${demo.groupId}`)).body.role).toBe('reviewer');
    const members = await demo.as.reader.get<{ members: { email: string; role: string }[] }>(`/api/groups/${demo.groupId}/members`);
    expect(members.body.members).toContainEqual(expect.objectContaining({ email: 'newcomer@chains.example', role: 'reviewer' }));

    // The link worked once.
    expect((await anonymous.get<InvitationInfo>(`/api/invitations/${tokenOf(link)}`)).body.state).toBe('accepted');
    const again = await newcomer.post<ApiError>(`/api/invitations/${tokenOf(link)}/accept`);
    expect(again.status).toBe(409);
    expect(again.body.error).toMatch(/already been used/);
  });

  test('registering through an invitation with a different address is refused and creates no account', async () => {
    const { link } = await invite('intended@chains.example', 'author');
    const answer = await api(server.url).post<ApiError>('/api/register', {
      name: 'Interloper',
      email: 'interloper@chains.example',
      password: 'interloper password',
      invitation: tokenOf(link),
    });
    expect(answer.status).toBe(409);
    expect(answer.body.field).toBe('email');
    await expect(signIn(server.url, 'interloper@chains.example', 'interloper password')).rejects.toBeInstanceOf(SignInRefused);
    const info = await api(server.url).get<InvitationInfo>(`/api/invitations/${tokenOf(link)}`);
    expect(info.body.state).toBe('pending');
  });
});

describe('inviting someone who already has an account', () => {
  test('they sign in and accept; someone signed in with another address is refused and nothing changes', async () => {
    const elsewhereCookie = await registerAndSignIn(server.url, { name: 'Has Account', email: 'hasaccount@chains.example', password: 'has account password' });
    const otherCookie = await registerAndSignIn(server.url, { name: 'Other Person', email: 'other@chains.example', password: 'other person password' });
    const { link } = await invite('hasaccount@chains.example', 'author');
    const info = await api(server.url).get<InvitationInfo>(`/api/invitations/${tokenOf(link)}`);
    expect(info.body.hasAccount).toBe(true);

    const wrongPerson = await api(server.url, otherCookie).post<ApiError>(`/api/invitations/${tokenOf(link)}/accept`);
    expect(wrongPerson.status).toBe(403);
    expect(wrongPerson.body.error).toMatch(/sent to hasaccount@chains.example/);
    expect((await api(server.url, otherCookie).get(`/api/groups/${demo.groupId}`)).status).toBe(403);

    const accepted = await api(server.url, elsewhereCookie).post<{ groupId: string }>(`/api/invitations/${tokenOf(link)}/accept`);
    expect(accepted.status).toBe(200);
    expect(accepted.body.groupId).toBe(demo.groupId);
    expect((await api(server.url, elsewhereCookie).get<{ role: string }>(`/api/groups/${demo.groupId}`)).body.role).toBe('author');
  });

  test('accepting needs a session', async () => {
    const { link } = await invite('needsession@chains.example', 'reader');
    expect((await api(server.url).post(`/api/invitations/${tokenOf(link)}/accept`)).status).toBe(401);
  });
});

describe('refused invitations', () => {
  test('only the lead invites: author, reviewer and reader are refused and no mail goes out', async () => {
    for (const role of ['author', 'reviewer', 'reader'] as const) {
      const answer = await demo.as[role].post<ApiError>(`/api/groups/${demo.groupId}/invitations`, { email: `by-${role}@chains.example`, role: 'reader' });
      expect(answer.status).toBe(403);
      expect(await readMailbox(server.url, { to: `by-${role}@chains.example` })).toEqual([]);
      expect((await demo.as[role].get(`/api/groups/${demo.groupId}/invitations`)).status).toBe(403);
    }
  });

  test('inviting a member, inviting twice, a bad address or an unknown role is refused on its field', async () => {
    const member = await demo.as.lead.post<ApiError>(`/api/groups/${demo.groupId}/invitations`, { email: 'teodor@chains.example', role: 'author' });
    expect(member.status).toBe(409);
    expect(member.body).toMatchObject({ field: 'email' });
    expect(member.body.error).toMatch(/already a member/);

    await invite('twice@chains.example', 'reader');
    const twice = await demo.as.lead.post<ApiError>(`/api/groups/${demo.groupId}/invitations`, { email: 'twice@chains.example', role: 'author' });
    expect(twice.status).toBe(409);
    expect(twice.body.error).toMatch(/pending invitation/);
    expect(await readMailbox(server.url, { to: 'twice@chains.example' })).toHaveLength(1);

    const badAddress = await demo.as.lead.post<ApiError>(`/api/groups/${demo.groupId}/invitations`, { email: 'no-at-sign', role: 'author' });
    expect(badAddress.status).toBe(400);
    expect(badAddress.body.field).toBe('email');
    const badRole = await demo.as.lead.post<ApiError>(`/api/groups/${demo.groupId}/invitations`, { email: 'role@chains.example', role: 'owner' });
    expect(badRole.status).toBe(400);
    expect(badRole.body.field).toBe('role');
  });

  test('a withdrawn invitation no longer works', async () => {
    const { id, link } = await invite('withdrawn@chains.example', 'author');
    const pending = await demo.as.lead.get<{ invitations: { id: string }[] }>(`/api/groups/${demo.groupId}/invitations`);
    expect(pending.body.invitations.map((i) => i.id)).toContain(id);
    expect((await demo.as.author.delete(`/api/groups/${demo.groupId}/invitations/${id}`)).status).toBe(403);
    expect((await demo.as.lead.delete(`/api/groups/${demo.groupId}/invitations/${id}`)).status).toBe(204);

    const cookie = await registerAndSignIn(server.url, { name: 'Withdrawn', email: 'withdrawn@chains.example', password: 'withdrawn password' });
    const answer = await api(server.url, cookie).post<ApiError>(`/api/invitations/${tokenOf(link)}/accept`);
    expect(answer.status).toBe(409);
    expect(answer.body.error).toMatch(/withdrawn/);
    expect((await api(server.url, cookie).get(`/api/groups/${demo.groupId}`)).status).toBe(403);
  });

  test('a link with an altered token is not found', async () => {
    const { link } = await invite('altered@chains.example', 'reader');
    const token = tokenOf(link);
    const altered = `${token.slice(0, -2)}${token.endsWith('AA') ? 'BB' : 'AA'}`;
    expect((await api(server.url).get(`/api/invitations/${altered}`)).status).toBe(404);
  });
});

describe('an expired invitation', () => {
  test('is refused, and registering with it creates no account', async () => {
    const shortLived = await startServer({ demo: true, env: { MARGINALIA_INVITATION_TTL: '1' } });
    try {
      const lead = api(shortLived.url, await signIn(shortLived.url, 'maren@chains.example', 'quist-lead-demo'));
      const groups = await lead.get<{ groups: { id: string }[] }>('/api/groups');
      await lead.post(`/api/groups/${groups.body.groups[0]!.id}/invitations`, { email: 'late@chains.example', role: 'author' });
      const mail = await waitForMail(shortLived.url, { to: 'late@chains.example' });
      await new Promise((resolve) => setTimeout(resolve, 1500));
      const token = tokenOf(linkIn(mail, '/invitations/'));
      expect((await api(shortLived.url).get<InvitationInfo>(`/api/invitations/${token}`)).body.state).toBe('expired');
      const answer = await api(shortLived.url).post<ApiError>('/api/register', {
        name: 'Late Comer',
        email: 'late@chains.example',
        password: 'late comer password',
        invitation: token,
      });
      expect(answer.status).toBe(409);
      expect(answer.body.error).toMatch(/expired/);
      await expect(signIn(shortLived.url, 'late@chains.example', 'late comer password')).rejects.toBeInstanceOf(SignInRefused);
    } finally {
      await shortLived.stop();
    }
  });
});
