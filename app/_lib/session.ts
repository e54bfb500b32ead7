// The signed-in user for server-rendered pages.
import { cookies } from 'next/headers';
import { redirect } from 'next/navigation';
import { sessionUserFromCookies, type SessionUser } from '@/server/session';

export async function currentUser(): Promise<SessionUser | null> {
  const store = await cookies();
  return sessionUserFromCookies(Object.fromEntries(store.getAll().map((c) => [c.name, c.value])));
}

/** The signed-in user, or a redirect to the sign-in page that comes back here afterwards. */
export async function requireUser(returnTo: string): Promise<SessionUser> {
  const user = await currentUser();
  if (!user) redirect(`/signin?callbackUrl=${encodeURIComponent(returnTo)}`);
  return user;
}
