import type { AstroGlobal } from 'astro';
import { handleAuthRequest, AUTH_BASE } from './authjs.ts';
import { requestClientAddress } from './throttle.ts';

// The sign-in pages post to themselves and hand the work to Auth.js with a request of their own,
// so they can show Edgewise's pages (errors, 429) instead of the library's.

export function callAuth(astro: AstroGlobal, action: string, fields: Record<string, string>): Promise<Response> {
  const url = new URL(`${AUTH_BASE}/${action}`, astro.url);
  const request = new Request(url, {
    method: 'POST',
    headers: {
      'content-type': 'application/x-www-form-urlencoded',
      cookie: astro.request.headers.get('cookie') ?? '',
      origin: url.origin,
    },
    body: new URLSearchParams(fields).toString(),
  });
  return handleAuthRequest(request, requestClientAddress(astro.request));
}

/** A redirect to the sign-in page that comes back here afterwards. */
export function toSignIn(astro: AstroGlobal): Response {
  const next = astro.url.pathname + astro.url.search;
  return astro.redirect(`/signin?next=${encodeURIComponent(next)}`, 302);
}
