import type { FieldError } from '../errors.ts';
import { problem } from './problem.ts';

// What no request may carry past the boundary, checked in one place: src/middleware.ts checks
// the path and query of every request (and the method of every API request) before anything
// else runs; readJson and readLimitedText check bodies before any schema sees them.
//
// A NUL character cannot be stored in a PostgreSQL text value, and a lone UTF-16 surrogate is not
// Unicode at all (it cannot be encoded as UTF-8): both are refused with 400 naming the field,
// instead of failing somewhere deeper.

const NUL = '\u0000';
/** A high surrogate not followed by a low one, or a low one not preceded by a high one. */
const LONE_SURROGATE = /[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/;

/** Why a string may not pass the boundary, or null when it may. */
export function unacceptableText(s: string): string | null {
  if (s.includes(NUL)) return 'contains a NUL character (U+0000), which is not accepted';
  if (LONE_SURROGATE.test(s))
    return 'contains a lone UTF-16 surrogate, which is not valid Unicode text';
  return null;
}

/** Problems in a URL's path segments and query parameters (names and values). */
export function urlProblems(url: URL): FieldError[] {
  const out: FieldError[] = [];
  const segments = url.pathname.split('/');
  for (let i = 0; i < segments.length; i++) {
    let segment: string;
    try {
      segment = decodeURIComponent(segments[i]!);
    } catch {
      out.push({ path: `path segment ${i}`, message: 'is not valid percent-encoded UTF-8' });
      continue;
    }
    const why = unacceptableText(segment);
    if (why) out.push({ path: `path segment ${i}`, message: why });
  }
  for (const [name, value] of url.searchParams) {
    const nameWhy = unacceptableText(name);
    if (nameWhy) {
      out.push({
        path: `query parameter name ${JSON.stringify(printable(name))}`,
        message: nameWhy,
      });
      continue;
    }
    const why = unacceptableText(value);
    if (why) out.push({ path: name, message: why });
  }
  return out;
}

/** How deep a JSON body may nest (no request of this API needs more than a handful of levels). */
export const MAX_JSON_DEPTH = 32;

/**
 * Problems in every string (object keys included) of a parsed JSON value, by field path, and
 * nesting beyond MAX_JSON_DEPTH (refused before any recursive code meets it).
 */
export function jsonProblems(value: unknown, path = ''): FieldError[] {
  const out: FieldError[] = [];
  const visit = (v: unknown, p: string, depth: number) => {
    if (out.length >= 20) return;
    if (depth > MAX_JSON_DEPTH && v !== null && typeof v === 'object') {
      out.push({ path: p || '(body)', message: `nests deeper than ${MAX_JSON_DEPTH} levels` });
      return;
    }
    if (typeof v === 'string') {
      const why = unacceptableText(v);
      if (why) out.push({ path: p || '(body)', message: why });
    } else if (Array.isArray(v)) {
      v.forEach((x, i) => visit(x, p ? `${p}.${i}` : String(i), depth + 1));
    } else if (v && typeof v === 'object') {
      for (const [k, x] of Object.entries(v)) {
        const why = unacceptableText(k);
        const at = p ? `${p}.${printable(k)}` : printable(k);
        if (why) out.push({ path: at, message: `the field name ${why}` });
        else visit(x, at, depth + 1);
      }
    }
  };
  visit(value, path, 0);
  return out;
}

/** A name safe to echo in a message: the refused characters shown as escapes. */
function printable(s: string): string {
  return s.replace(
    // eslint-disable-next-line no-control-regex -- finding the character is the point
    /\u0000|[\ud800-\udfff]/g,
    (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`,
  );
}

// ---- Methods ---------------------------------------------------------------------------------

export const HTTP_METHODS = ['GET', 'HEAD', 'POST', 'PUT', 'PATCH', 'DELETE', 'OPTIONS'] as const;

type RouteModules = Record<string, () => Promise<unknown>>;

interface RouteEntry {
  pattern: RegExp;
  /** Static segments first, then fewer parameters: `/uploads/new` before `/uploads/[id]`. */
  rank: number;
  load: () => Promise<unknown>;
  methods?: string[];
}

/**
 * The methods each API route answers, read from its page file's exports (HEAD wherever GET is,
 * as Astro serves it). Built from `import.meta.glob('./pages/api/**\/*.ts')` in the middleware.
 */
export function apiMethodTable(modules: RouteModules, pagesPrefix: string) {
  const entries: RouteEntry[] = Object.entries(modules).map(([file, load]) => {
    const route = file
      .slice(pagesPrefix.length)
      .replace(/\.ts$/, '')
      .replace(/\/index$/, '');
    const parts = route.split('/').filter(Boolean);
    let params = 0;
    const pattern = parts
      .map((part) => {
        if (/^\[\.\.\.[^\]]+\]$/.test(part)) {
          params += 10;
          return '(?:/.*)?';
        }
        const pieces = part.split(/\[[^\]]+\]/);
        params += pieces.length - 1;
        return '/' + pieces.map((p) => p.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')).join('[^/]+');
      })
      .join('');
    return { pattern: new RegExp(`^${pattern}/?$`), rank: params, load };
  });
  entries.sort((a, b) => a.rank - b.rank);

  /** The route's methods, or null when no API route has this path. */
  return async function allowedMethods(pathname: string): Promise<string[] | null> {
    const entry = entries.find((e) => e.pattern.test(pathname));
    if (!entry) return null;
    if (!entry.methods) {
      const mod = (await entry.load()) as Record<string, unknown>;
      const exported = HTTP_METHODS.filter((m) => typeof mod[m] === 'function');
      if (exported.includes('GET') && !exported.includes('HEAD')) exported.push('HEAD');
      entry.methods = HTTP_METHODS.filter((m) => exported.includes(m));
    }
    return entry.methods;
  };
}

/** Methods a page answers (POST only where the page takes a form). */
const PAGE_METHODS = ['GET', 'HEAD', 'POST'];
const FORM_CHECK_LIMIT = 64 * 1024;

/**
 * The boundary's answer before anything else runs, or undefined to go on: 405 with `Allow` for a
 * method the path does not answer; 400 naming the parameter, path segment or form field that
 * carries a NUL character or a lone surrogate.
 */
export async function boundaryRefusal(
  request: Request,
  url: URL,
  apiMethods: (pathname: string) => Promise<string[] | null>,
): Promise<Response | undefined> {
  const method = request.method.toUpperCase();
  const allowed = url.pathname.startsWith('/api/') ? await apiMethods(url.pathname) : PAGE_METHODS;
  if (allowed && !allowed.includes(method)) {
    return problem(
      {
        title: 'Method not allowed',
        status: 405,
        detail: `${url.pathname} answers ${allowed.join(', ')} only.`,
      },
      { headers: { allow: allowed.join(', ') } },
    );
  }
  const errors = urlProblems(url);
  if (!errors.length) errors.push(...(await formProblems(request)));
  if (errors.length) {
    return problem({
      title: 'Invalid request',
      status: 400,
      detail: 'The request carries text that is not accepted.',
      errors,
    });
  }
  return undefined;
}

/** Problems in a urlencoded form body (read from a copy; the page or Auth.js reads the original). */
async function formProblems(request: Request): Promise<FieldError[]> {
  const type = (request.headers.get('content-type') ?? '').toLowerCase();
  if (request.method !== 'POST' || !type.startsWith('application/x-www-form-urlencoded')) return [];
  const declared = Number(request.headers.get('content-length') ?? 0);
  if (!request.body || declared > FORM_CHECK_LIMIT) return [];
  const text = await request.clone().text();
  if (text.length > FORM_CHECK_LIMIT) return [];
  const out: FieldError[] = [];
  for (const [name, value] of new URLSearchParams(text)) {
    const why = unacceptableText(name) ?? unacceptableText(value);
    if (why) out.push({ path: printable(name), message: why });
  }
  return out;
}
