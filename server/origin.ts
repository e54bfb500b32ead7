// The origin used in links we send (invitations). The configured public origin when there is one;
// otherwise the request's own Host, which the server only accepts on loopback (see config.ts).
export function appOrigin(headers: Headers): string {
  if (process.env.NEXTAUTH_URL) return new URL(process.env.NEXTAUTH_URL).origin;
  const host = headers.get('host');
  if (!host) throw new Error('The request has no Host header.');
  return `http://${host}`;
}

/**
 * Whether an Origin header names this app (the configured public origin, else the request's own
 * Host). A missing Origin is not a cross-site request: browsers always send one on websockets and
 * on mutating requests. Used by the collaboration socket's upgrade.
 */
export function isOwnOrigin(origin: string | undefined | null, host: string | undefined | null): boolean {
  if (!origin) return true;
  const expected = process.env.NEXTAUTH_URL ? new URL(process.env.NEXTAUTH_URL).host : host;
  try {
    return new URL(origin).host === expected;
  } catch {
    return false;
  }
}
