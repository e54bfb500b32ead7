// Signing in from Node through the real next-auth credentials flow (csrf token, then the callback),
// giving the session cookie for fetch calls and websocket clients.
export class SignInRefused extends Error {
  constructor(readonly reason: string) {
    super(`Sign-in refused: ${reason}`);
    this.name = 'SignInRefused';
  }
}

function cookiePairs(response: Response): string[] {
  return response.headers.getSetCookie().map((line) => line.split(';')[0]!);
}

/** Returns the Cookie header value ("next-auth.session-token=...") or throws SignInRefused. */
export async function signIn(url: string, email: string, password: string): Promise<string> {
  const csrf = await fetch(`${url}/api/auth/csrf`);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const response = await fetch(`${url}/api/auth/callback/credentials`, {
    method: 'POST',
    redirect: 'manual',
    headers: { 'content-type': 'application/x-www-form-urlencoded', cookie: cookiePairs(csrf).join('; ') },
    body: new URLSearchParams({ csrfToken, email, password, json: 'true' }),
  });
  const session = cookiePairs(response).find((pair) => /^(__Secure-)?next-auth\.session-token=/.test(pair));
  if (session) return session;
  const location = response.headers.get('location') ?? ((await response.json().catch(() => ({}))) as { url?: string }).url ?? '';
  const reason = location ? new URL(location, url).searchParams.get('error') : null;
  throw new SignInRefused(reason ?? `status ${response.status}`);
}

/** Follows an e-mailed sign-in link as a browser would; returns the session cookie. */
export async function followSignInLink(link: string): Promise<string> {
  const response = await fetch(link, { redirect: 'manual' });
  const session = cookiePairs(response).find((pair) => /^(__Secure-)?next-auth\.session-token=/.test(pair));
  if (session) return session;
  const location = response.headers.get('location') ?? '';
  throw new SignInRefused(new URL(location || '/', link).searchParams.get('error') ?? `status ${response.status}`);
}

/** Asks for a sign-in link by e-mail, as the sign-in page does. Resolves with next-auth's answer URL. */
export async function requestSignInLink(url: string, email: string): Promise<{ status: number; error: string | null }> {
  const csrf = await fetch(`${url}/api/auth/csrf`);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const response = await fetch(`${url}/api/auth/signin/email`, {
    method: 'POST',
    redirect: 'manual',
    headers: { 'content-type': 'application/x-www-form-urlencoded', cookie: cookiePairs(csrf).join('; ') },
    body: new URLSearchParams({ csrfToken, email, callbackUrl: `${url}/groups`, json: 'true' }),
  });
  const answer = ((await response.json().catch(() => ({}))) as { url?: string }).url ?? response.headers.get('location') ?? '';
  const error = answer ? new URL(answer, url).searchParams.get('error') : null;
  // next-auth passes an error thrown while asking for a link on as "Error: <message>".
  return { status: response.status, error: error?.replace(/^Error: /, '') ?? null };
}

/** Registers an account through the real route and signs it in; returns the session cookie. */
export async function registerAndSignIn(
  url: string,
  person: { name: string; email: string; password: string; invitation?: string },
): Promise<string> {
  const response = await fetch(`${url}/api/register`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify(person),
  });
  if (response.status !== 201) throw new Error(`Registering ${person.email} answered ${response.status}: ${await response.text()}`);
  return signIn(url, person.email, person.password);
}
