// The address a share link gives out. A live link goes on to the reading page; an unknown token
// (guessed or altered) answers 404 and an expired or revoked one 410, each with a page saying so.
import { ApiError } from '@/server/api/errors';
import { openShareLink } from '@/server/versions';
import { escapeHtml } from '@/server/mail';

function page(status: number, heading: string, message: string): Response {
  const html = `<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="robots" content="noindex"><title>${escapeHtml(heading)} · Marginalia</title>
<style>
body { margin: 0; background: #fbfaf6; color: #1d1b18; font-family: "EB Garamond", Georgia, serif; font-size: 19px; }
header { border-bottom: 1px solid #e4e0d6; padding: 0.75rem 1.5rem; font-variant: small-caps; letter-spacing: 0.08em; font-size: 1.25rem; }
main { max-width: 40rem; margin: 3rem auto; padding: 0 1.5rem; }
h1 { font-weight: 400; font-size: 1.9rem; margin: 0 0 1rem; }
p { line-height: 1.5; }
a { color: #1f5f5b; }
.word { display: inline-flex; gap: 0.4rem; align-items: center; color: #9c2f23; }
</style></head>
<body><header><a href="/" style="color: inherit; text-decoration: none">Marginalia</a></header>
<main><h1>${escapeHtml(heading)}</h1>
<p class="word"><svg viewBox="0 0 16 16" width="1em" height="1em" fill="none" stroke="currentColor" stroke-width="1.6" aria-hidden="true"><circle cx="8" cy="8" r="6.2"/><path d="M5.5 5.5l5 5M10.5 5.5l-5 5"/></svg><span>${status === 404 ? 'not found' : 'no longer open'}</span></p>
<p>${escapeHtml(message)}</p>
<p><a href="/">Marginalia</a></p></main></body></html>`;
  return new Response(html, { status, headers: { 'content-type': 'text/html; charset=utf-8', 'cache-control': 'no-store' } });
}

export async function GET(_req: Request, context: { params: Promise<{ token: string }> }): Promise<Response> {
  const { token } = await context.params;
  try {
    await openShareLink(token);
  } catch (error) {
    if (error instanceof ApiError && (error.status === 404 || error.status === 410)) {
      return page(error.status, error.status === 404 ? 'No such share link' : 'This share link is closed', error.message);
    }
    console.error('GET /shared failed:', error);
    return page(500, 'Something went wrong', 'The server could not open this share link. Try again in a moment.');
  }
  return new Response(null, { status: 307, headers: { location: `/shared/${encodeURIComponent(token)}/read`, 'cache-control': 'no-store' } });
}
