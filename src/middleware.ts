import { defineMiddleware } from 'astro:middleware';
import { config } from './lib/server/config.ts';
import { applySecurityHeaders } from './lib/server/http/headers.ts';
import { checkStateChangingRequest } from './lib/server/http/origin.ts';
import { problem } from './lib/server/http/problem.ts';

// Routes that legitimately take form or multipart bodies (same-origin only).
const FORM_ROUTES = [/^\/api\/auth\//];
const MULTIPART_ROUTES = [/^\/api\/v1\/analyses$/];

export const onRequest = defineMiddleware(async (context, next) => {
  const url = context.url;
  const own = new URL(config().PUBLIC_ORIGIN).origin;
  // Same-origin is judged against the origin the request actually came to as well as the
  // configured public one (tests and `npm start` run on different ports of one build).
  const requestOrigin = url.origin;
  let response: Response;
  const isApi = url.pathname.startsWith('/api/');
  {
    // Pages take same-origin form posts; JSON routes take JSON only, except the listed ones.
    const opts = {
      allowForm: !isApi || FORM_ROUTES.some((r) => r.test(url.pathname)),
      allowMultipart: MULTIPART_ROUTES.some((r) => r.test(url.pathname)),
    };
    const verdict = [own, requestOrigin].map((o) => checkStateChangingRequest(context.request, o, opts));
    const accepted = verdict.find((v) => v.ok);
    response = accepted
      ? await next()
      : problem({ title: 'Cross-site request refused', status: 403, detail: verdict[0]?.reason });
  }
  // Some responses (redirects, static) come with immutable headers: copy when needed.
  try {
    applySecurityHeaders(response.headers, { https: url.protocol === 'https:' });
  } catch {
    response = new Response(response.body, response);
    applySecurityHeaders(response.headers, { https: url.protocol === 'https:' });
  }
  return response;
});
