import { defineMiddleware } from 'astro:middleware';
import { config } from './lib/server/config.ts';
import { applySecurityHeaders } from './lib/server/http/headers.ts';
import { renderOrHeld } from './lib/server/http/held-pages.ts';
import { checkStateChangingRequest, type OriginVerdict } from './lib/server/http/origin.ts';
import { problem } from './lib/server/http/problem.ts';
import { apiMethodTable, boundaryRefusal } from './lib/server/http/boundary.ts';
import { toProblem } from './lib/server/http/route.ts';
import { noteRoute, REQUEST_ID_HEADER } from './lib/server/log.ts';
import { resolvePrincipal } from './lib/server/auth/principal.ts';
import { ANONYMOUS } from './lib/shared/principal.ts';
import { OWN_WRITES_COOKIE, OWN_WRITES_SECONDS } from './lib/server/db/index.ts';
import { startJobs } from './lib/server/jobs.ts';

// The server process delivers queued e-mail (retrying while the mail server is down) and clears
// uploads that were never completed.
startJobs();

// Routes that legitimately take form or multipart bodies (same-origin only).
const FORM_ROUTES = [/^\/api\/auth\//];
const MULTIPART_ROUTES = [/^\/api\/v1\/analyses$/];
// Links signed for a one-click stop (RFC 8058): mail programs post them from their own servers,
// with no Origin and a form body. The signature in the link is the whole authority (the route
// never reads a session), so the cross-site check has nothing to protect there.
const SIGNED_LINK_ROUTES = [/^\/api\/v1\/watches\/unsubscribe$/];

// The methods each API route answers, from its page file's exports (loaded when first asked).
const apiMethods = apiMethodTable(import.meta.glob('./pages/api/**/*.ts'), './pages');

export const onRequest = defineMiddleware(async (context, next) => {
  const url = context.url;
  const own = new URL(config().PUBLIC_ORIGIN).origin;
  // Same-origin is judged against the origin the request actually came to as well as the
  // configured public one (tests and `npm start` run on different ports of one build).
  const requestOrigin = url.origin;
  let response: Response;
  const isApi = url.pathname.startsWith('/api/');
  const reqId = context.request.headers.get(REQUEST_ID_HEADER);
  noteRoute(reqId, context.routePattern);
  // Methods a route does not answer (405 with Allow) and text no request may carry (400).
  const refusedAtBoundary = await boundaryRefusal(context.request, url, apiMethods);
  if (refusedAtBoundary) {
    response = refusedAtBoundary;
  } else {
    // Pages take same-origin form posts; JSON routes take JSON only, except the listed ones.
    const opts = {
      allowForm: !isApi || FORM_ROUTES.some((r) => r.test(url.pathname)),
      allowMultipart: MULTIPART_ROUTES.some((r) => r.test(url.pathname)),
    };
    const signedLink =
      context.request.method === 'POST' &&
      url.searchParams.has('token') &&
      SIGNED_LINK_ROUTES.some((r) => r.test(url.pathname));
    const verdict: OriginVerdict[] = signedLink
      ? [{ ok: true }]
      : [own, requestOrigin].map((o) => checkStateChangingRequest(context.request, o, opts));
    const accepted = verdict.find((v) => v.ok);
    if (!accepted) {
      response = problem({
        title: 'Cross-site request refused',
        status: 403,
        detail: verdict[0]?.reason,
      });
    } else {
      // Who is asking: from the database on every request (see src/lib/server/auth/principal.ts).
      context.locals.principal = ANONYMOUS;
      let refused: Response | undefined;
      try {
        context.locals.principal = await resolvePrincipal(context.request);
      } catch (err) {
        refused = toProblem(err, url.pathname, reqId);
      }
      // Held routes answer anonymous readers from bytes held per generation (held-pages.ts).
      response = refused ?? (await renderOrHeld(context, next));
    }
  }
  // An API path with no route (or a method it does not answer) gets problem+json, not a page.
  if (
    isApi &&
    (response.status === 404 || response.status === 405) &&
    !(response.headers.get('content-type') ?? '').includes('json')
  ) {
    response = problem({
      title: response.status === 404 ? 'Not found' : 'Method not allowed',
      status: response.status,
      detail: `${context.request.method} ${url.pathname} is not part of the API.`,
    });
  }
  // With read replicas, someone who has just changed something reads from the primary for a
  // few seconds, so their next page shows their change (see readDb).
  const wrote =
    config().DATABASE_REPLICA_URLS.length > 0 &&
    !['GET', 'HEAD', 'OPTIONS'].includes(context.request.method) &&
    response.status < 400;
  const finish = (headers: Headers) => {
    applySecurityHeaders(headers, { https: url.protocol === 'https:' });
    if (wrote)
      headers.append(
        'set-cookie',
        `${OWN_WRITES_COOKIE}=1; Max-Age=${OWN_WRITES_SECONDS}; Path=/; HttpOnly; SameSite=Lax${url.protocol === 'https:' ? '; Secure' : ''}`,
      );
  };
  // Some responses (redirects, static) come with immutable headers: copy when needed.
  try {
    finish(response.headers);
  } catch {
    response = new Response(response.body, response);
    finish(response.headers);
  }
  return response;
});
