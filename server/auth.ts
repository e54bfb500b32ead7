// Sign-in: e-mail and password (bcrypt), or a one-time link by e-mail. Sessions are signed JWTs
// in an http-only cookie. Failed password attempts and link requests are limited per address.
import { eq } from 'drizzle-orm';
import type { NextAuthOptions } from 'next-auth';
import CredentialsProvider from 'next-auth/providers/credentials';
import EmailProvider from 'next-auth/providers/email';
import { getDb, schema } from '../db/client';
import { marginaliaAdapter } from './authAdapter';
import { sendMail } from './mail';
import { signInLinkMail } from './mailTemplates';
import { verifyPassword } from './passwords';
import { clearAttempts, linkRequests, minutesUntilAllowed, passwordFailures, recordAttempt } from './rateLimit';

/** Lifetime of a sign-in link, in seconds (MARGINALIA_SIGNIN_LINK_TTL overrides; default 30 min). */
export function signInLinkSeconds(): number {
  const configured = Number(process.env.MARGINALIA_SIGNIN_LINK_TTL);
  return Number.isFinite(configured) && configured > 0 ? configured : 30 * 60;
}

// Compared against when the address is unknown, so a wrong address costs as long as a wrong password.
const UNKNOWN_USER_HASH = '$2b$11$H5AucDWR7u3vEbhTZTWEieDQF7NIn.V1Fx/NONK53.wfwVvmNzwbW';

function tooMany(minutes: number, what: string): Error {
  return new Error(`Too many ${what} for this address. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}.`);
}

function describeLifetime(seconds: number): string {
  if (seconds >= 120) return `${Math.round(seconds / 60)} minutes`;
  return seconds === 1 ? '1 second' : `${seconds} seconds`;
}

export const authOptions: NextAuthOptions = {
  adapter: marginaliaAdapter(),
  session: { strategy: 'jwt', maxAge: 14 * 24 * 60 * 60 },
  pages: { signIn: '/signin', error: '/signin', verifyRequest: '/signin/check-mail' },
  logger: {
    // next-auth's own messages can carry request details; keep them short and never print bodies.
    error: (code) => console.error(`sign-in: ${code}`),
    warn: () => undefined,
    debug: () => undefined,
  },
  providers: [
    CredentialsProvider({
      id: 'credentials',
      name: 'E-mail and password',
      credentials: { email: { label: 'E-mail', type: 'email' }, password: { label: 'Password', type: 'password' } },
      async authorize(credentials) {
        const email = (credentials?.email ?? '').trim().toLowerCase();
        const password = credentials?.password ?? '';
        if (!email || !password) throw new Error('Enter your e-mail and your password.');
        const wait = minutesUntilAllowed(passwordFailures, email);
        if (wait > 0) throw tooMany(wait, 'failed sign-in attempts');

        const [user] = await getDb().select().from(schema.users).where(eq(schema.users.email, email));
        const matches = await verifyPassword(password, user?.passwordHash ?? UNKNOWN_USER_HASH);
        if (!user || !user.passwordHash || !matches) {
          recordAttempt(passwordFailures, email);
          throw new Error('Wrong e-mail or password.');
        }
        clearAttempts(passwordFailures, email);
        return { id: user.id, email: user.email, name: user.name };
      },
    }),
    EmailProvider({
      maxAge: signInLinkSeconds(),
      from: process.env.MAIL_FROM ?? 'Marginalia <no-reply@marginalia.localhost>',
      async sendVerificationRequest({ identifier, url }) {
        const lifetime = describeLifetime(signInLinkSeconds());
        await sendMail({ to: identifier, ...signInLinkMail({ link: url, lifetime }) });
      },
    }),
  ],
  callbacks: {
    async signIn({ user, account, email }) {
      if (account?.provider !== 'email' || !email?.verificationRequest) return true;
      // Asking for a link: only for an existing account, and not too often.
      const address = (user.email ?? '').toLowerCase();
      const [existing] = await getDb().select({ id: schema.users.id }).from(schema.users).where(eq(schema.users.email, address));
      if (!existing) throw new Error('No account uses this address. Register first.');
      const wait = minutesUntilAllowed(linkRequests, address);
      if (wait > 0) throw tooMany(wait, 'sign-in links requested');
      recordAttempt(linkRequests, address);
      return true;
    },
    async jwt({ token, user }) {
      if (user) {
        token.sub = user.id;
        token.email = user.email;
        token.name = user.name;
      }
      return token;
    },
    async session({ session, token }) {
      if (session.user && token.sub) Object.assign(session.user, { id: token.sub });
      return session;
    },
  },
};
