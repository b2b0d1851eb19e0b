import type { z } from 'zod';
import { config } from '../config.ts';

// Errors leave the API as RFC 9457 problem details (application/problem+json); answers leave it
// as JSON built to the zod schema the OpenAPI document publishes for them.

export interface Problem {
  type?: string;
  title: string;
  status: number;
  detail?: string;
  /** Where in the input the problem is: a field path (`salts[0].concentration`) or a line. */
  errors?: { path: string; message: string }[];
  [extra: string]: unknown;
}

/** A problem+json response. */
export function problem(p: Problem, init: { headers?: Record<string, string> } = {}): Response {
  return new Response(JSON.stringify({ type: 'about:blank', ...p }), {
    status: p.status,
    headers: {
      'content-type': 'application/problem+json; charset=utf-8',
      'cache-control': 'no-store',
      ...init.headers,
    },
  });
}

/** A JSON response. */
export function json(body: unknown, status = 200, headers: Record<string, string> = {}): Response {
  return jsonText(JSON.stringify(body), status, headers);
}

/**
 * An API answer: `body` must have the type of `schema` (the one the OpenAPI document publishes
 * for this operation). Under APP_ENV=test the server also checks it at run time, so every answer
 * a test provokes is held to the document; a mismatch is a 500 naming the fields.
 */
export function answer<S extends z.ZodType>(
  schema: S,
  body: z.output<S>,
  status = 200,
  headers: Record<string, string> = {},
): Response {
  if (config().APP_ENV === 'test') {
    const checked = schema.safeParse(body);
    if (!checked.success)
      throw new Error(
        `answer does not match its schema: ${checked.error.issues
          .map((i) => `${i.path.join('.') || '(answer)'}: ${i.message}`)
          .join('; ')}`,
      );
  }
  return json(body, status, headers);
}

/** A JSON response from text that is already serialised. */
export function jsonText(
  text: string,
  status = 200,
  headers: Record<string, string> = {},
): Response {
  return new Response(text, {
    status,
    headers: {
      'content-type': 'application/json; charset=utf-8',
      'cache-control': 'no-store',
      ...headers,
    },
  });
}

/**
 * A serialised JSON answer that may be revalidated: 304 when the client holds the same entity
 * tag, gzip when the client takes it. Stored by the client only privately and always
 * revalidated, since what a search shows depends on who asks.
 */
export function cachedJson(
  request: Request,
  answer: { body: Uint8Array<ArrayBuffer>; gzip: () => Uint8Array<ArrayBuffer>; etag: string },
): Response {
  const gzip = /\bgzip\b/i.test(request.headers.get('accept-encoding') ?? '');
  const etag = gzip ? `${answer.etag.slice(0, -1)}-gz"` : answer.etag;
  const headers: Record<string, string> = {
    etag,
    'cache-control': 'private, no-cache',
    vary: 'Accept-Encoding, Cookie, Authorization',
  };
  const held = (request.headers.get('if-none-match') ?? '')
    .split(',')
    .map((t) => t.trim().replace(/^W\//, ''));
  if (held.includes(etag) || held.includes('*'))
    return new Response(null, { status: 304, headers });
  const bytes = gzip ? answer.gzip() : answer.body;
  // A stream over the held bytes: a byte-array body would be copied for every response.
  const body = new ReadableStream<Uint8Array>({
    start(controller) {
      controller.enqueue(bytes);
      controller.close();
    },
  });
  return new Response(body, {
    status: 200,
    headers: {
      ...headers,
      'content-type': 'application/json; charset=utf-8',
      'content-length': String(bytes.byteLength),
      ...(gzip ? { 'content-encoding': 'gzip' } : {}),
    },
  });
}
