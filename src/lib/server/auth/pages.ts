import type { AstroGlobal } from 'astro';
import { can, type Action, type ActionObjects } from '../policy.ts';
import type { UserPrincipal } from '#lib/shared/principal.ts';
import { handleAuthRequest, AUTH_BASE } from './authjs.ts';
import { requestClientAddress } from './throttle.ts';

// The sign-in pages post to themselves and hand the work to Auth.js with a request of their own,
// so they can show Edgewise's pages (errors, 429) instead of the library's.

export function callAuth(
  astro: AstroGlobal,
  action: string,
  fields: Record<string, string>,
): Promise<Response> {
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

/** Actions that take no object, which a whole page can be allowed or refused by. */
type PageAction = { [A in Action]: null extends ActionObjects[A] ? A : never }[Action];

/**
 * The start of every page for signed-in people: a visitor gets the redirect to sign in (return
 * it), the page is never cached, and with an `action` it says whether the principal may take it
 * — the page then answers 403 when not (and shows why).
 */
export function signedInPage(
  astro: AstroGlobal,
  action?: PageAction,
): Response | { principal: UserPrincipal; allowed: boolean } {
  const principal = astro.locals.principal;
  if (principal.kind !== 'user') return toSignIn(astro);
  astro.response.headers.set('cache-control', 'private, no-store');
  const allowed = action === undefined || can(principal, action, null);
  if (!allowed) astro.response.status = 403;
  return { principal, allowed };
}
