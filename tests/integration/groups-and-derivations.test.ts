// Groups, members and derivations through the real routes of a running server, as each role of
// the demo group and as an outsider. Expected permissions follow the roles table of DESIGN.md.
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import {
  api,
  demoAccount,
  demoDerivationTitle,
  demoSessions,
  linkIn,
  readMailbox,
  registerAndSignIn,
  startServer,
  type Api,
  type ApiError,
  type DemoSessions,
  type StartedServer,
} from '../helpers';

interface DerivationListItem {
  id: string;
  title: string;
  authors: { id: string; name: string }[];
  claimsHolding: number;
  claimsFailing: number;
  lockedVersions: number;
  updatedAt: string;
}
interface Member {
  userId: string;
  name: string;
  email: string;
  role: string;
}

let server: StartedServer;
let demo: DemoSessions;
let anonymous: Api;
let outsider: Api;
let outsiderGroupId: string;
let outsiderDerivationId: string;

const list = async (who: Api, groupId: string) =>
  (await who.get<{ derivations: DerivationListItem[] }>(`/api/groups/${groupId}/derivations`)).body.derivations;

beforeAll(async () => {
  server = await startServer({ demo: true });
  demo = await demoSessions(server.url);
  anonymous = api(server.url);
  outsider = api(
    server.url,
    await registerAndSignIn(server.url, { name: 'Outside Person', email: 'outside@elsewhere.example', password: 'outside-password-1' }),
  );
  const group = await outsider.post<{ id: string }>('/api/groups', { name: 'Another Group', description: 'Not the demo group.' });
  outsiderGroupId = group.body.id;
  const derivation = await outsider.post<{ id: string }>(`/api/groups/${outsiderGroupId}/derivations`, { title: 'Private notes' });
  outsiderDerivationId = derivation.body.id;
});

afterAll(async () => {
  await server?.stop();
});

describe('reading a group', () => {
  test('every member, whatever the role, sees the group, its members and its derivations table', async () => {
    for (const role of ['lead', 'author', 'reviewer', 'reader'] as const) {
      const group = await demo.as[role].get<{ role: string; actions: string[] }>(`/api/groups/${demo.groupId}`);
      expect(group.status).toBe(200);
      expect(group.body.role).toBe(role);
      const members = await demo.as[role].get<{ members: Member[] }>(`/api/groups/${demo.groupId}/members`);
      expect(members.body.members.map((m) => m.role).sort()).toEqual(['author', 'lead', 'reader', 'reviewer']);
      const rows = await list(demo.as[role], demo.groupId);
      expect(rows.map((r) => r.title)).toContain(demoDerivationTitle);
    }
  });

  test('the derivations table carries title, authors, claim counts, last edit and locked versions', async () => {
    const row = (await list(demo.as.reader, demo.groupId)).find((r) => r.title === demoDerivationTitle)!;
    expect(row.authors.map((a) => a.name)).toEqual([demoAccount('lead').name, demoAccount('author').name]);
    // The demo derivation's body (db/demoBody.ts): five claims hold, one fails on purpose; the demo
    // locks version 1 of it at start-up.
    expect(row.claimsHolding).toBe(5);
    expect(row.claimsFailing).toBe(1);
    expect(row.lockedVersions).toBe(1);
    expect(Number.isNaN(Date.parse(row.updatedAt))).toBe(false);
  });

  test('the group page tells each role what it may do', async () => {
    const lead = await demo.as.lead.get<{ actions: string[] }>(`/api/groups/${demo.groupId}`);
    const reader = await demo.as.reader.get<{ actions: string[] }>(`/api/groups/${demo.groupId}`);
    expect(lead.body.actions).toContain('invite');
    expect(reader.body.actions.sort()).toEqual(['read', 'runChecks']);
  });

  test('a signed-in user sees only the groups they belong to', async () => {
    const mine = await outsider.get<{ groups: { id: string; role: string }[] }>('/api/groups');
    expect(mine.body.groups.map((g) => g.id)).toEqual([outsiderGroupId]);
    expect(mine.body.groups[0]!.role).toBe('lead');
  });
});

describe('creating, renaming and deleting derivations as the roles allow', () => {
  test('a lead and an author may create a derivation; a reviewer and a reader are refused with 403', async () => {
    for (const role of ['lead', 'author'] as const) {
      const created = await demo.as[role].post<{ id: string; title: string }>(`/api/groups/${demo.groupId}/derivations`, {
        title: `Notes by the ${role}`,
      });
      expect(created.status).toBe(201);
      const row = (await list(demo.as[role], demo.groupId)).find((r) => r.id === created.body.id)!;
      expect(row.authors.map((a) => a.name)).toEqual([demoAccount(role).name]);
    }
    const before = (await list(demo.as.lead, demo.groupId)).length;
    for (const role of ['reviewer', 'reader'] as const) {
      const refused = await demo.as[role].post<ApiError>(`/api/groups/${demo.groupId}/derivations`, { title: `Notes by the ${role}` });
      expect(refused.status).toBe(403);
      expect(refused.body.error).toMatch(/may not create derivations/);
    }
    expect((await list(demo.as.lead, demo.groupId)).length).toBe(before);
  });

  test('a title that is missing, blank or over 200 characters is refused on the title field and nothing is written', async () => {
    const before = await list(demo.as.lead, demo.groupId);
    for (const body of [{}, { title: '   ' }, { title: 'x'.repeat(201) }, { title: 42 }]) {
      const refused = await demo.as.author.post<ApiError>(`/api/groups/${demo.groupId}/derivations`, body);
      expect(refused.status).toBe(400);
      expect(refused.body.field).toBe('title');
      expect(refused.body.error.length).toBeGreaterThan(5);
    }
    expect(await list(demo.as.lead, demo.groupId)).toEqual(before);
  });

  test('a second derivation with the same title in the group is refused with 409', async () => {
    const refused = await demo.as.author.post<ApiError>(`/api/groups/${demo.groupId}/derivations`, {
      title: demoDerivationTitle.toUpperCase(),
    });
    expect(refused.status).toBe(409);
    expect(refused.body.field).toBe('title');
  });

  test('renaming: lead and author may, reviewer and reader may not, and the new title shows in the table', async () => {
    const created = await demo.as.author.post<{ id: string }>(`/api/groups/${demo.groupId}/derivations`, { title: 'Draft to rename' });
    const path = `/api/derivations/${created.body.id}`;
    expect((await demo.as.reviewer.patch(path, { title: 'By the reviewer' })).status).toBe(403);
    expect((await demo.as.reader.patch(path, { title: 'By the reader' })).status).toBe(403);
    expect((await demo.as.lead.patch(path, { title: 'Renamed by the lead' })).status).toBe(200);
    const renamed = await demo.as.author.patch<{ title: string }>(path, { title: 'Renamed by the author' });
    expect(renamed.status).toBe(200);
    expect(renamed.body.title).toBe('Renamed by the author');
    const row = (await list(demo.as.reader, demo.groupId)).find((r) => r.id === created.body.id)!;
    expect(row.title).toBe('Renamed by the author');
    const tooLong = await demo.as.author.patch<ApiError>(path, { title: 'y'.repeat(300) });
    expect(tooLong.status).toBe(400);
    expect((await demo.as.reader.get<{ title: string }>(path)).body.title).toBe('Renamed by the author');
  });

  test('deleting: reviewer and reader are refused; an author deletes and the derivation leaves the table', async () => {
    const created = await demo.as.author.post<{ id: string }>(`/api/groups/${demo.groupId}/derivations`, { title: 'Draft to delete' });
    const path = `/api/derivations/${created.body.id}`;
    expect((await demo.as.reviewer.delete(path)).status).toBe(403);
    expect((await demo.as.reader.delete(path)).status).toBe(403);
    expect((await demo.as.reader.get(path)).status).toBe(200);
    expect((await demo.as.author.delete(path)).status).toBe(204);
    expect((await demo.as.reader.get(path)).status).toBe(404);
    expect((await list(demo.as.lead, demo.groupId)).some((r) => r.id === created.body.id)).toBe(false);
    expect((await demo.as.author.delete(path)).status).toBe(404);
  });
});

describe('members and roles', () => {
  test('only the lead changes roles; the change shows in the member list', async () => {
    const joinerCookie = await registerAndSignIn(server.url, { name: 'Role Changer', email: 'rolechanger@chains.example', password: 'role-changer-pw' });
    const joiner = api(server.url, joinerCookie);
    const me = await joiner.get<{ user: { id: string } }>('/api/me');
    // Join through an invitation as reader (the whole invitation flow has its own tests).
    await demo.as.lead.post(`/api/groups/${demo.groupId}/invitations`, { email: 'rolechanger@chains.example', role: 'reader' });
    const [mail] = await readMailbox(server.url, { to: 'rolechanger@chains.example' });
    const token = new URL(linkIn(mail!, '/invitations/')).pathname.split('/').pop()!;
    expect((await joiner.post(`/api/invitations/${token}/accept`)).status).toBe(200);

    const path = `/api/groups/${demo.groupId}/members/${me.body.user.id}`;
    for (const role of ['author', 'reviewer', 'reader'] as const) {
      const refused = await demo.as[role].patch<ApiError>(path, { role: 'lead' });
      expect(refused.status).toBe(403);
    }
    expect((await joiner.patch(path, { role: 'lead' })).status).toBe(403);
    const badRole = await demo.as.lead.patch<ApiError>(path, { role: 'owner' });
    expect(badRole.status).toBe(400);
    expect(badRole.body.field).toBe('role');

    const changed = await demo.as.lead.patch<{ members: Member[] }>(path, { role: 'author' });
    expect(changed.status).toBe(200);
    expect(changed.body.members.find((m) => m.userId === me.body.user.id)!.role).toBe('author');
    expect((await joiner.get<{ role: string }>(`/api/groups/${demo.groupId}`)).body.role).toBe('author');
    // Now an author, they may create a derivation.
    expect((await joiner.post(`/api/groups/${demo.groupId}/derivations`, { title: 'First derivation as author' })).status).toBe(201);

    // Only the lead removes members; afterwards the group is closed to them.
    expect((await demo.as.author.delete(path)).status).toBe(403);
    const removed = await demo.as.lead.delete<{ members: Member[] }>(path);
    expect(removed.status).toBe(200);
    expect(removed.body.members.some((m) => m.userId === me.body.user.id)).toBe(false);
    expect((await joiner.get(`/api/groups/${demo.groupId}`)).status).toBe(403);
    expect((await joiner.get(`/api/groups/${demo.groupId}/derivations`)).status).toBe(403);
  });

  test('the last lead can be neither demoted nor removed (409), and stays lead', async () => {
    const lead = await demo.as.lead.get<{ user: { id: string } }>('/api/me');
    const path = `/api/groups/${demo.groupId}/members/${lead.body.user.id}`;
    const demoted = await demo.as.lead.patch<ApiError>(path, { role: 'author' });
    expect(demoted.status).toBe(409);
    expect(demoted.body.error).toMatch(/at least one lead/);
    expect((await demo.as.lead.delete(path)).status).toBe(409);
    expect((await demo.as.lead.get<{ role: string }>(`/api/groups/${demo.groupId}`)).body.role).toBe('lead');
  });

  test('only the lead renames the group or changes its description', async () => {
    for (const role of ['author', 'reviewer', 'reader'] as const) {
      expect((await demo.as[role].patch(`/api/groups/${demo.groupId}`, { name: `Renamed by ${role}` })).status).toBe(403);
    }
    const renamed = await demo.as.lead.patch<{ name: string; description: string }>(`/api/groups/${demo.groupId}`, {
      description: 'Chains in four dimensions, and their logarithms.',
    });
    expect(renamed.status).toBe(200);
    expect(renamed.body.name).toBe('Chain Growth Group');
    expect((await demo.as.reader.get<{ description: string }>(`/api/groups/${demo.groupId}`)).body.description).toBe(
      'Chains in four dimensions, and their logarithms.',
    );
  });

  test('a group name that is missing or too long is refused on the name field', async () => {
    const missing = await outsider.post<ApiError>('/api/groups', { description: 'no name' });
    expect(missing.status).toBe(400);
    expect(missing.body.field).toBe('name');
    const long = await outsider.post<ApiError>('/api/groups', { name: 'g'.repeat(121) });
    expect(long.status).toBe(400);
    expect(long.body.field).toBe('name');
    const mine = await outsider.get<{ groups: unknown[] }>('/api/groups');
    expect(mine.body.groups).toHaveLength(1);
  });
});

describe('one group cannot reach another group’s data', () => {
  test('a member of one group reads nothing of another group (403), whatever their role at home', async () => {
    for (const role of ['lead', 'author', 'reviewer', 'reader'] as const) {
      expect((await demo.as[role].get(`/api/groups/${outsiderGroupId}`)).status).toBe(403);
      expect((await demo.as[role].get(`/api/groups/${outsiderGroupId}/derivations`)).status).toBe(403);
      expect((await demo.as[role].get(`/api/groups/${outsiderGroupId}/members`)).status).toBe(403);
      expect((await demo.as[role].get(`/api/derivations/${outsiderDerivationId}`)).status).toBe(403);
    }
    expect((await outsider.get(`/api/groups/${demo.groupId}`)).status).toBe(403);
    expect((await outsider.get(`/api/derivations/${demo.derivationId}`)).status).toBe(403);
  });

  test('a lead of one group cannot change, rename or delete anything of another group', async () => {
    expect((await demo.as.lead.patch(`/api/derivations/${outsiderDerivationId}`, { title: 'Taken over' })).status).toBe(403);
    expect((await demo.as.lead.delete(`/api/derivations/${outsiderDerivationId}`)).status).toBe(403);
    expect((await demo.as.lead.post(`/api/groups/${outsiderGroupId}/derivations`, { title: 'Planted' })).status).toBe(403);
    expect((await demo.as.lead.post(`/api/groups/${outsiderGroupId}/invitations`, { email: 'x@y.example', role: 'lead' })).status).toBe(403);
    expect((await outsider.get<{ title: string }>(`/api/derivations/${outsiderDerivationId}`)).body.title).toBe('Private notes');
    expect((await list(outsider, outsiderGroupId)).map((r) => r.title)).toEqual(['Private notes']);
  });

  test('ids from another group in the URL are checked against this group: a non-member is not found here', async () => {
    const outsiderMe = await outsider.get<{ user: { id: string } }>('/api/me');
    const refused = await demo.as.lead.patch<ApiError>(`/api/groups/${demo.groupId}/members/${outsiderMe.body.user.id}`, { role: 'reader' });
    expect(refused.status).toBe(404);
    expect((await demo.as.lead.delete(`/api/groups/${demo.groupId}/members/${outsiderMe.body.user.id}`)).status).toBe(404);
    expect((await outsider.get<{ groups: unknown[] }>('/api/groups')).body.groups).toHaveLength(1);
  });

  test('unknown and malformed ids answer 404', async () => {
    expect((await demo.as.lead.get(`/api/groups/${randomUUID()}`)).status).toBe(404);
    expect((await demo.as.lead.get(`/api/derivations/${randomUUID()}`)).status).toBe(404);
    expect((await demo.as.lead.get('/api/derivations/not-an-id')).status).toBe(404);
    expect((await demo.as.lead.patch('/api/groups/1234/members/5678', { role: 'reader' })).status).toBe(404);
  });
});

describe('requests without a session or from another site', () => {
  test('every mutating route answers 401 without a session', async () => {
    const some = randomUUID();
    const routes: ['post' | 'patch' | 'delete', string, unknown?][] = [
      ['post', '/api/groups', { name: 'Sneaky' }],
      ['patch', `/api/groups/${demo.groupId}`, { name: 'Renamed' }],
      ['post', `/api/groups/${demo.groupId}/derivations`, { title: 'Sneaky' }],
      ['patch', `/api/derivations/${demo.derivationId}`, { title: 'Sneaky' }],
      ['delete', `/api/derivations/${demo.derivationId}`],
      ['post', `/api/groups/${demo.groupId}/invitations`, { email: 'a@b.example', role: 'lead' }],
      ['delete', `/api/groups/${demo.groupId}/invitations/${some}`],
      ['patch', `/api/groups/${demo.groupId}/members/${some}`, { role: 'lead' }],
      ['delete', `/api/groups/${demo.groupId}/members/${some}`],
      ['post', `/api/invitations/sometoken/accept`],
    ];
    for (const [method, path, body] of routes) {
      const answer = method === 'delete' ? await anonymous.delete<ApiError>(path) : await anonymous[method]<ApiError>(path, body);
      expect(answer.status, `${method} ${path}`).toBe(401);
      expect(answer.body.error).toMatch(/Sign in/);
    }
    for (const path of [`/api/groups`, `/api/groups/${demo.groupId}`, `/api/groups/${demo.groupId}/derivations`, `/api/derivations/${demo.derivationId}`]) {
      expect((await anonymous.get(path)).status, path).toBe(401);
    }
    expect((await demo.as.reader.get<{ title: string }>(`/api/derivations/${demo.derivationId}`)).body.title).toBe(demoDerivationTitle);
  });

  test('a forged session cookie counts as no session', async () => {
    const forged = api(server.url, 'next-auth.session-token=eyJhbGciOiJkaXIiLCJlbmMiOiJBMjU2R0NNIn0..forged.forged.forged');
    expect((await forged.get('/api/groups')).status).toBe(401);
  });

  test('a write sent from another site’s page is refused with 403', async () => {
    const response = await fetch(`${server.url}/api/groups/${demo.groupId}/derivations`, {
      method: 'POST',
      headers: { cookie: demo.cookies.lead, 'content-type': 'application/json', origin: 'https://elsewhere.example' },
      body: JSON.stringify({ title: 'Cross-site' }),
    });
    expect(response.status).toBe(403);
    expect((await list(demo.as.lead, demo.groupId)).some((r) => r.title === 'Cross-site')).toBe(false);
  });

  test('a body that is not JSON is refused with a clear 400', async () => {
    const response = await fetch(`${server.url}/api/groups/${demo.groupId}/derivations`, {
      method: 'POST',
      headers: { cookie: demo.cookies.lead, 'content-type': 'application/json' },
      body: '{"title": "unterminated',
    });
    expect(response.status).toBe(400);
    expect(((await response.json()) as ApiError).error).toMatch(/not valid JSON/);
  });

  test('errors never carry a stack trace', async () => {
    const answer = await demo.as.lead.get<Record<string, unknown>>(`/api/derivations/${randomUUID()}`);
    expect(Object.keys(answer.body).sort()).toEqual(['error']);
    expect(JSON.stringify(answer.body)).not.toMatch(/at .*\.(ts|js):\d+/);
  });
});
