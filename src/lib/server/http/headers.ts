// Security headers every response carries: pages, JSON, downloads and errors alike.

/** For non-HTML responses: nothing may load, nothing may frame. */
const apiPolicy = "default-src 'none'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'";

/**
 * For pages: Astro's own policy header carries the hashes of every script and style it emitted;
 * these directives are added to it, and stand alone where Astro sent none.
 */
const pageDirectives: [string, string][] = [
  ['default-src', "'self'"],
  ['img-src', "'self' data:"],
  ['font-src', "'self'"],
  ['connect-src', "'self'"],
  ['object-src', "'none'"],
  ['base-uri', "'self'"],
  ['form-action', "'self'"],
  ['frame-ancestors', "'none'"],
  ['script-src', "'self'"],
  ['style-src', "'self'"],
];

/** Astro's policy (if any) plus the page directives it does not set. */
export function pagePolicy(existing: string | null): string {
  const parts = (existing ?? '')
    .split(';')
    .map((d) => d.trim())
    .filter(Boolean);
  const named = new Set(parts.map((d) => d.split(/\s+/)[0]!.toLowerCase()));
  for (const [name, value] of pageDirectives) if (!named.has(name)) parts.push(`${name} ${value}`);
  return parts.join('; ');
}

/** Adds the security headers in place (responses from Astro's router are mutable). */
export function applySecurityHeaders(headers: Headers, opts: { https: boolean }): void {
  const isHtml = (headers.get('content-type') ?? '').includes('text/html');
  headers.set(
    'Content-Security-Policy',
    isHtml ? pagePolicy(headers.get('Content-Security-Policy')) : apiPolicy,
  );
  headers.set('X-Content-Type-Options', 'nosniff');
  headers.set('Referrer-Policy', 'strict-origin-when-cross-origin');
  headers.set('X-Frame-Options', 'DENY');
  headers.set('Cross-Origin-Opener-Policy', 'same-origin');
  headers.set('Cross-Origin-Resource-Policy', 'same-origin');
  headers.set('Permissions-Policy', 'camera=(), microphone=(), geolocation=()');
  if (opts.https) headers.set('Strict-Transport-Security', 'max-age=31536000; includeSubDomains');
}
