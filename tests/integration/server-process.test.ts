// The one server process on a data folder: the demo start, the folder lock (a second process is
// refused with a message naming the folder and the holder), survival of kill -9, clean shutdown,
// the session secret, passwords never in clear on disk or in the log, and SMTP_URL replacing the
// local mail sink.
import { mkdtemp, readdir, readFile, rm, stat } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';
import { createServer, type AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import {
  api,
  demoAccounts,
  registerAndSignIn,
  runServerToExit,
  signIn,
  startServer,
  type StartedServer,
} from '../helpers';

interface Me {
  user: { email: string } | null;
  groups: { name: string }[];
}

const secretPassword = 'plain text must never be stored 7Qx';

let folder: string;
const running: StartedServer[] = [];

async function start(options: Parameters<typeof startServer>[0]): Promise<StartedServer> {
  const server = await startServer(options);
  running.push(server);
  return server;
}

async function filesUnder(dir: string): Promise<string[]> {
  const entries = await readdir(dir, { recursive: true, withFileTypes: true });
  return entries.filter((e) => e.isFile()).map((e) => path.join(e.parentPath, e.name));
}

beforeAll(async () => {
  folder = await mkdtemp(path.join(tmpdir(), 'marginalia-data-'));
});

afterAll(async () => {
  for (const server of running) await server.kill('SIGKILL');
  await rm(folder, { recursive: true, force: true });
});

describe('a server on a data folder', () => {
  let first: StartedServer;
  let leadCookie: string;

  test('the demo start prints its URL and the four demo accounts with roles and passwords', async () => {
    first = await start({ dataDir: folder, demo: true, env: { NEXTAUTH_SECRET: undefined } });
    const output = first.output();
    expect(output).toMatch(new RegExp(`Marginalia listening on ${first.url}`));
    expect(output).toMatch(/Demo data loaded/);
    for (const account of demoAccounts) {
      expect(output).toMatch(new RegExp(`${account.role}\\s+${account.name}\\s+${account.email}\\s+password: ${account.password}`));
    }
    leadCookie = await signIn(first.url, demoAccounts[0]!.email, demoAccounts[0]!.password);
    await registerAndSignIn(first.url, { name: 'Kept Person', email: 'kept@example.org', password: secretPassword });
  });

  test('a second server on the same folder refuses to start and names the folder and the process holding it', async () => {
    const second = await runServerToExit({ dataDir: folder });
    expect(second.code).toBe(1);
    expect(second.output).toContain(`The data folder ${folder} is in use by process ${first.process.pid}`);
    expect(second.output).toMatch(/server\/index\.ts/);
    expect(second.output).not.toMatch(/listening/);
    // The first server is unharmed.
    expect((await api(first.url, leadCookie).get<Me>('/api/me')).body.user?.email).toBe(demoAccounts[0]!.email);
  });

  test('after kill -9 a new server starts on the folder at once, with every committed row and the same sessions', async () => {
    await first.kill('SIGKILL');
    const again = await start({ dataDir: folder, demo: true, env: { NEXTAUTH_SECRET: undefined } });
    expect(again.output()).toMatch(/Demo data already present/);
    const me = await api(again.url, leadCookie).get<Me>('/api/me');
    expect(me.body.user?.email).toBe(demoAccounts[0]!.email);
    expect(me.body.groups.map((g) => g.name)).toEqual(['Chain Growth Group']);
    await signIn(again.url, 'kept@example.org', secretPassword);

    // The demo's generated secret is kept in the data folder, readable by its owner only.
    const secretFile = await stat(path.join(folder, 'session-secret'));
    expect(secretFile.mode & 0o077).toBe(0);

    expect(await again.stop()).toBe(0);
    expect(again.output()).toMatch(/stopping \(SIGTERM\)/);
  });

  test('passwords are found neither in the data folder nor in the server output', async () => {
    const needle = Buffer.from(secretPassword);
    let emailSeen = false;
    for (const file of await filesUnder(folder)) {
      const bytes = await readFile(file);
      expect(bytes.includes(needle), file).toBe(false);
      emailSeen ||= bytes.includes(Buffer.from('kept@example.org'));
    }
    // The scan does read the rows: the same user's e-mail address is there in plain bytes.
    expect(emailSeen).toBe(true);
    for (const server of running) expect(server.output()).not.toContain(secretPassword);
  });

  test('the session secret comes from the environment: a cookie signed with another secret is not accepted', async () => {
    const other = await start({ dataDir: folder, env: { NEXTAUTH_SECRET: 'a-completely-different-secret-for-this-test' } });
    expect((await api(other.url, leadCookie).get<Me>('/api/me')).body.user).toBeNull();
    expect((await api(other.url, leadCookie).get('/api/groups')).status).toBe(401);
    expect(await other.stop()).toBe(0);
  });
});

describe('refusing to start with bad configuration', () => {
  test('without NEXTAUTH_SECRET outside the demo the server refuses, saying what to set', async () => {
    const run = await runServerToExit({ env: { NEXTAUTH_SECRET: undefined } });
    expect(run.code).toBe(1);
    expect(run.output).toMatch(/NEXTAUTH_SECRET is not set/);
  });

  test('a PORT that is not a port number is refused with its value', async () => {
    const run = await runServerToExit({ env: { PORT: 'eighty' } });
    expect(run.code).toBe(1);
    expect(run.output).toMatch(/PORT must be a port number.*"eighty"/);
  });

  test('a port already in use is refused with a hint', async () => {
    const blocker = createServer();
    await new Promise<void>((resolve) => blocker.listen(0, '127.0.0.1', resolve));
    try {
      const port = (blocker.address() as AddressInfo).port;
      const run = await runServerToExit({ env: { PORT: String(port) } });
      expect(run.code).toBe(1);
      expect(run.output).toContain(`Port ${port} on 127.0.0.1 is already in use. Set PORT to another port`);
    } finally {
      await new Promise<void>((resolve) => blocker.close(() => resolve()));
    }
  });

  test('serving beyond this machine without a public origin is refused', async () => {
    const run = await runServerToExit({ env: { HOST: '0.0.0.0' } });
    expect(run.code).toBe(1);
    expect(run.output).toMatch(/set NEXTAUTH_URL/);
  });
});

describe('with SMTP_URL set', () => {
  test('mail goes to that SMTP server instead of the local sink, and there is no mailbox', async () => {
    const received: { to: string; subject: string; text: string }[] = [];
    const smtp = new SMTPServer({
      authOptional: true,
      disabledCommands: ['STARTTLS'],
      onData(stream, session, callback) {
        simpleParser(stream)
          .then((mail) => {
            received.push({ to: session.envelope.rcptTo.map((r) => r.address).join(','), subject: mail.subject ?? '', text: mail.text ?? '' });
            callback();
          })
          .catch(callback);
      },
    });
    await new Promise<void>((resolve) => smtp.listen(0, '127.0.0.1', resolve));
    const port = (smtp.server.address() as AddressInfo).port;
    try {
      const server = await start({ env: { SMTP_URL: `smtp://127.0.0.1:${port}` } });
      expect(server.output()).not.toMatch(/local sink/);
      const cookie = await registerAndSignIn(server.url, { name: 'Smtp Lead', email: 'smtp-lead@example.org', password: 'smtp lead password' });
      const lead = api(server.url, cookie);
      const group = await lead.post<{ id: string }>('/api/groups', { name: 'Mail Group' });
      expect((await lead.post(`/api/groups/${group.body.id}/invitations`, { email: 'invitee@example.org', role: 'author' })).status).toBe(201);
      expect(received).toHaveLength(1);
      expect(received[0]!.to).toBe('invitee@example.org');
      expect(received[0]!.text).toContain(`${server.url}/invitations/`);
      expect((await api(server.url).get('/api/mailbox')).status).toBe(404);
      expect((await fetch(`${server.url}/mailbox`)).status).toBe(404);
      await server.stop();
    } finally {
      await new Promise<void>((resolve) => smtp.close(() => resolve()));
    }
  });

  test('when the SMTP server cannot be reached, the invitation is not kept', async () => {
    const server = await start({ env: { SMTP_URL: 'smtp://127.0.0.1:9' } });
    const cookie = await registerAndSignIn(server.url, { name: 'Unlucky Lead', email: 'unlucky@example.org', password: 'unlucky lead password' });
    const lead = api(server.url, cookie);
    const group = await lead.post<{ id: string }>('/api/groups', { name: 'Unreachable Mail Group' });
    const answer = await lead.post<{ error: string }>(`/api/groups/${group.body.id}/invitations`, { email: 'never@example.org', role: 'author' });
    expect(answer.status).toBe(503);
    expect(answer.body.error).toMatch(/could not be mailed, so it was not kept/);
    const pending = await lead.get<{ invitations: unknown[] }>(`/api/groups/${group.body.id}/invitations`);
    expect(pending.body.invitations).toEqual([]);
    await server.stop();
  });
});
