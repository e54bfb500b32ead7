// In Debian's Chromium: the lead invites a new reviewer from the members page; the invitee opens
// the link from the mailbox, registers on the way and lands in the group with that role; the lead
// then changes the new member's role.
import type { Browser, BrowserContext } from 'playwright-core';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { demoAccount, demoGroup, launchBrowser, linkIn, startServer, waitForMail, type StartedServer } from '../helpers';

let server: StartedServer;
let browser: Browser;
let leadContext: BrowserContext;
let inviteeContext: BrowserContext;

beforeAll(async () => {
  server = await startServer({ demo: true });
  browser = await launchBrowser();
  leadContext = await browser.newContext();
  inviteeContext = await browser.newContext();
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

test('an invitation sent from the members page is accepted by a new person who registers on the way', async () => {
  const lead = await leadContext.newPage();
  await lead.goto(`${server.url}/signin`);
  await lead.getByLabel('E-mail', { exact: true }).first().fill(demoAccount('lead').email);
  await lead.getByLabel('Password', { exact: true }).fill(demoAccount('lead').password);
  await lead.getByRole('button', { name: 'Sign in', exact: true }).click();
  await lead.waitForURL(`${server.url}/groups`);
  await lead.getByRole('link', { name: demoGroup.name }).click();
  await lead.getByRole('link', { name: 'Members' }).click();

  const form = lead.getByRole('form', { name: 'Invite a member' });
  await form.getByLabel('E-mail', { exact: true }).fill('student@chains.example');
  await form.getByLabel('Role', { exact: true }).selectOption('reviewer');
  await form.getByRole('button', { name: 'Send invitation' }).click();
  await lead.getByText('Invitation sent to student@chains.example.').waitFor();
  await lead.getByRole('list', { name: 'Pending invitations' }).getByText('student@chains.example').waitFor();

  const mail = await waitForMail(server.url, { to: 'student@chains.example' });
  const invitee = await inviteeContext.newPage();
  await invitee.goto(linkIn(mail, '/invitations/'));
  await invitee.getByRole('heading', { name: `Join ${demoGroup.name}` }).waitFor();
  await invitee.getByRole('link', { name: 'Register to accept' }).click();
  await invitee.getByLabel('Name', { exact: true }).fill('Stud Ent');
  expect(await invitee.getByLabel('E-mail', { exact: true }).inputValue()).toBe('student@chains.example');
  await invitee.getByLabel('Password', { exact: true }).fill('student password');
  await invitee.getByLabel('Password again', { exact: true }).fill('student pasword');
  await invitee.getByRole('button', { name: 'Register' }).click();
  await invitee.locator('#register-confirm-error').waitFor();
  expect(await invitee.locator('#register-confirm-error').textContent()).toBe('The two passwords differ.');
  await invitee.getByLabel('Password again', { exact: true }).fill('student password');
  await invitee.getByRole('button', { name: 'Register' }).click();
  await invitee.waitForURL(/\/groups\/[0-9a-f-]{36}$/);
  await invitee.getByText('you are reviewer').waitFor();
  // A reviewer does not get the form to create derivations.
  expect(await invitee.getByRole('form', { name: 'New derivation' }).count()).toBe(0);

  // The lead sees the new member and makes them an author.
  await lead.reload();
  const members = lead.getByRole('table', { name: 'Members of this group' });
  const row = members.getByRole('row').filter({ hasText: 'student@chains.example' });
  await row.waitFor();
  await row.getByLabel('Role of Stud Ent').selectOption('author');
  await expect.poll(async () => (await invitee.request.get(`${server.url}/api/groups/${invitee.url().split('/').pop()}`)).json()).toMatchObject({ role: 'author' });
  await invitee.reload();
  await invitee.getByRole('form', { name: 'New derivation' }).waitFor();
});
