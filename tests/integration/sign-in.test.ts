// Registration and both ways of signing in (password; one-time link by e-mail through the local
// mail sink), with the refusals a user meets: wrong password, too many attempts, reused or
// expired links, duplicate e-mail, missing or over-long fields.
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import {
  api,
  followSignInLink,
  linkIn,
  readMailbox,
  registerAndSignIn,
  requestSignInLink,
  signIn,
  SignInRefused,
  startServer,
  waitForMail,
  type ApiError,
  type StartedServer,
} from '../helpers';

interface Me {
  user: { id: string; email: string; name: string } | null;
}

let server: StartedServer;

beforeAll(async () => {
  server = await startServer();
});

afterAll(async () => {
  await server?.stop();
});

async function register(body: Record<string, unknown>) {
  return api(server.url).post<ApiError & { id?: string }>('/api/register', body);
}

async function refusal(promise: Promise<unknown>): Promise<string> {
  try {
    await promise;
  } catch (error) {
    if (error instanceof SignInRefused) return error.reason;
    throw error;
  }
  throw new Error('Signing in was expected to be refused.');
}

describe('registering with e-mail and password', () => {
  test('a new user registers, signs in with the password and is known to the app', async () => {
    const cookie = await registerAndSignIn(server.url, { name: 'Ada Register', email: 'Ada@Example.org', password: 'correct horse battery' });
    const me = await api(server.url, cookie).get<Me>('/api/me');
    expect(me.body.user).toMatchObject({ name: 'Ada Register', email: 'ada@example.org' });
  });

  test('a second account with the same e-mail (in any letter case) is refused on the e-mail field; the first is untouched', async () => {
    const answer = await register({ name: 'Someone Else', email: 'ADA@example.org', password: 'another password' });
    expect(answer.status).toBe(409);
    expect(answer.body.field).toBe('email');
    expect(answer.body.error).toMatch(/already exists/);
    const cookie = await signIn(server.url, 'ada@example.org', 'correct horse battery');
    expect((await api(server.url, cookie).get<Me>('/api/me')).body.user?.name).toBe('Ada Register');
    expect(await refusal(signIn(server.url, 'ada@example.org', 'another password'))).toBe('Wrong e-mail or password.');
  });

  test('missing, malformed and over-long fields are refused on their field, and no account is created', async () => {
    const cases: [Record<string, unknown>, string][] = [
      [{ email: 'n1@example.org', password: 'long enough pw' }, 'name'],
      [{ name: '  ', email: 'n2@example.org', password: 'long enough pw' }, 'name'],
      [{ name: 'N'.repeat(121), email: 'n3@example.org', password: 'long enough pw' }, 'name'],
      [{ name: 'No Email', password: 'long enough pw' }, 'email'],
      [{ name: 'Bad Email', email: 'not-an-address', password: 'long enough pw' }, 'email'],
      [{ name: 'Short Password', email: 'n4@example.org', password: 'short' }, 'password'],
      // bcrypt reads 72 bytes at most: longer passwords are refused rather than silently cut.
      [{ name: 'Long Password', email: 'n5@example.org', password: 'é'.repeat(37) }, 'password'],
    ];
    for (const [body, field] of cases) {
      const answer = await register(body);
      expect(answer.status, JSON.stringify(body)).toBe(400);
      expect(answer.body.field).toBe(field);
      expect(answer.body.error.length).toBeGreaterThan(5);
    }
    for (const email of ['n1@example.org', 'n3@example.org', 'n4@example.org', 'n5@example.org']) {
      expect(await refusal(signIn(server.url, email, 'long enough pw'))).toBe('Wrong e-mail or password.');
    }
  });
});

describe('signing in with a password', () => {
  test('a wrong password is refused with a clear message and gives no session', async () => {
    await registerAndSignIn(server.url, { name: 'Wrong Pw', email: 'wrongpw@example.org', password: 'the right password' });
    expect(await refusal(signIn(server.url, 'wrongpw@example.org', 'the wrong password'))).toBe('Wrong e-mail or password.');
    expect(await refusal(signIn(server.url, 'nobody@example.org', 'the wrong password'))).toBe('Wrong e-mail or password.');
  });

  test('after five failed attempts an address is held back, even with the right password, while others are not', async () => {
    await registerAndSignIn(server.url, { name: 'Limited', email: 'limited@example.org', password: 'limited password' });
    await registerAndSignIn(server.url, { name: 'Unlimited', email: 'unlimited@example.org', password: 'unlimited password' });
    for (let i = 0; i < 5; i++) await refusal(signIn(server.url, 'limited@example.org', `guess number ${i}`));
    expect(await refusal(signIn(server.url, 'limited@example.org', 'limited password'))).toMatch(/Too many failed sign-in attempts.*Try again in \d+ minutes?/);
    expect(await signIn(server.url, 'unlimited@example.org', 'unlimited password')).toMatch(/^next-auth\.session-token=/);
  });

  test('signing out ends the session cookie’s use', async () => {
    const cookie = await signIn(server.url, 'ada@example.org', 'correct horse battery');
    const csrf = await fetch(`${server.url}/api/auth/csrf`, { headers: { cookie } });
    const { csrfToken } = (await csrf.json()) as { csrfToken: string };
    const csrfCookie = csrf.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
    const out = await fetch(`${server.url}/api/auth/signout`, {
      method: 'POST',
      redirect: 'manual',
      headers: { cookie: `${cookie}; ${csrfCookie}`, 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ csrfToken, json: 'true' }),
    });
    const cleared = out.headers.getSetCookie().find((c) => c.startsWith('next-auth.session-token='));
    expect(cleared).toMatch(/Max-Age=0|Expires=Thu, 01 Jan 1970/i);
  });
});

describe('signing in with a one-time link by e-mail', () => {
  test('the link arrives in the mailbox, signs the user in once, and a second use is refused', async () => {
    await registerAndSignIn(server.url, { name: 'Link User', email: 'link@example.org', password: 'link user password' });
    const before = await readMailbox(server.url, { to: 'link@example.org' });
    const asked = await requestSignInLink(server.url, 'Link@Example.org');
    expect(asked.error).toBeNull();
    const mail = await waitForMail(server.url, { to: 'link@example.org', subject: /sign-in link/, notIn: before });
    const link = linkIn(mail, '/api/auth/callback/email');
    const cookie = await followSignInLink(link);
    expect((await api(server.url, cookie).get<Me>('/api/me')).body.user?.email).toBe('link@example.org');
    // Verification is next-auth's code for an unknown, used or expired token; the page words it.
    expect(await refusal(followSignInLink(link))).toBe('Verification');
  });

  test('a link whose token was altered is refused', async () => {
    const before = await readMailbox(server.url, { to: 'link@example.org' });
    await requestSignInLink(server.url, 'link@example.org');
    const mail = await waitForMail(server.url, { to: 'link@example.org', notIn: before });
    const link = new URL(linkIn(mail, '/api/auth/callback/email'));
    const token = link.searchParams.get('token')!;
    link.searchParams.set('token', `${token.slice(0, -1)}${token.endsWith('0') ? '1' : '0'}`);
    expect(await refusal(followSignInLink(link.toString()))).toBe('Verification');
  });

  test('no link is sent to an address without an account', async () => {
    const asked = await requestSignInLink(server.url, 'stranger@example.org');
    expect(asked.error).toMatch(/No account uses this address/);
    expect(await readMailbox(server.url, { to: 'stranger@example.org' })).toEqual([]);
  });

  test('asking for links too often is held back per address', async () => {
    await registerAndSignIn(server.url, { name: 'Many Links', email: 'manylinks@example.org', password: 'many links password' });
    for (let i = 0; i < 5; i++) expect((await requestSignInLink(server.url, 'manylinks@example.org')).error).toBeNull();
    const sixth = await requestSignInLink(server.url, 'manylinks@example.org');
    expect(sixth.error).toMatch(/Too many sign-in links requested/);
    expect(await readMailbox(server.url, { to: 'manylinks@example.org' })).toHaveLength(5);
  });
});

describe('an expired sign-in link', () => {
  test('is refused once its lifetime has passed', async () => {
    const shortLived = await startServer({ env: { MARGINALIA_SIGNIN_LINK_TTL: '1' } });
    try {
      await registerAndSignIn(shortLived.url, { name: 'Slow Reader', email: 'slow@example.org', password: 'slow reader password' });
      await requestSignInLink(shortLived.url, 'slow@example.org');
      const mail = await waitForMail(shortLived.url, { to: 'slow@example.org' });
      expect(mail.text).toMatch(/within 1 second\b/);
      await new Promise((resolve) => setTimeout(resolve, 1500));
      expect(await refusal(followSignInLink(linkIn(mail, '/api/auth/callback/email')))).toBe('Verification');
    } finally {
      await shortLived.stop();
    }
  });
});
