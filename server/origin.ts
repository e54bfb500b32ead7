// The origin used in links we send (invitations). The configured public origin when there is one;
// otherwise the request's own Host, which the server only accepts on loopback (see config.ts).
export function appOrigin(headers: Headers): string {
  if (process.env.NEXTAUTH_URL) return new URL(process.env.NEXTAUTH_URL).origin;
  const host = headers.get('host');
  if (!host) throw new Error('The request has no Host header.');
  return `http://${host}`;
}
