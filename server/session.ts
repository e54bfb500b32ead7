// Who is asking: the signed-in user behind a request's session cookie (a next-auth JWT), checked
// against the database so that a removed account stops working at once. Route handlers, server
// pages and the collaboration socket all resolve sessions here.
import { eq } from 'drizzle-orm';
import { getToken } from 'next-auth/jwt';
import { getDb, schema } from '../db/client';

export interface SessionUser {
  id: string;
  email: string;
  name: string;
}

/** Parses a Cookie header ("a=1; b=2") into name/value pairs. */
export function parseCookieHeader(header: string | undefined | null): Record<string, string> {
  const cookies: Record<string, string> = {};
  for (const part of (header ?? '').split(';')) {
    const eq = part.indexOf('=');
    if (eq < 1) continue;
    const name = part.slice(0, eq).trim();
    const raw = part.slice(eq + 1).trim();
    try {
      cookies[name] = decodeURIComponent(raw);
    } catch {
      cookies[name] = raw;
    }
  }
  return cookies;
}

async function userFromToken(cookies: Record<string, string>, secure: boolean): Promise<SessionUser | null> {
  const token = await getToken({
    req: { cookies, headers: {} } as unknown as Parameters<typeof getToken>[0]['req'],
    secureCookie: secure,
  });
  const userId = token?.sub;
  if (!userId) return null;
  const [user] = await getDb()
    .select({ id: schema.users.id, email: schema.users.email, name: schema.users.name })
    .from(schema.users)
    .where(eq(schema.users.id, userId));
  return user ?? null;
}

/** The signed-in user for these cookies, or null. Both cookie names are tried (http and https). */
export async function sessionUserFromCookies(cookies: Record<string, string>): Promise<SessionUser | null> {
  if ('__Secure-next-auth.session-token' in cookies || '__Secure-next-auth.session-token.0' in cookies) {
    return userFromToken(cookies, true);
  }
  return userFromToken(cookies, false);
}

/** For raw Node requests, e.g. the websocket upgrade of the collaboration socket. */
export function sessionUserFromCookieHeader(header: string | undefined | null): Promise<SessionUser | null> {
  return sessionUserFromCookies(parseCookieHeader(header));
}
