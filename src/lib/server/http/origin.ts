// Cross-site request refusal for state-changing API calls.

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);
const FORM_TYPES = ['application/x-www-form-urlencoded', 'multipart/form-data', 'text/plain'];

export interface OriginVerdict {
  ok: boolean;
  reason?: string;
}

/**
 * A state-changing request is accepted when it carries a bearer token (scripts; no cookie is
 * trusted then) or when its Origin is our own. Plain form posts are refused on JSON routes
 * unless the route takes uploads (`allowMultipart`).
 */
export function checkStateChangingRequest(
  request: Request,
  ownOrigin: string,
  opts: { allowMultipart?: boolean; allowForm?: boolean } = {},
): OriginVerdict {
  if (SAFE_METHODS.has(request.method)) return { ok: true };
  const auth = request.headers.get('authorization') ?? '';
  if (/^Bearer\s+\S+/i.test(auth)) return { ok: true };
  const origin = request.headers.get('origin');
  if (!origin) return { ok: false, reason: 'missing Origin header on a state-changing request' };
  if (origin !== ownOrigin)
    return { ok: false, reason: `cross-origin request from ${origin} refused` };
  const type = (request.headers.get('content-type') ?? '').toLowerCase();
  if (!opts.allowForm && FORM_TYPES.some((t) => type.startsWith(t))) {
    if (!(opts.allowMultipart && type.startsWith('multipart/form-data'))) {
      return {
        ok: false,
        reason: `content type ${type.split(';')[0]} is not accepted here; send JSON`,
      };
    }
  }
  return { ok: true };
}
