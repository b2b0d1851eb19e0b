import { createHash } from 'node:crypto';
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

/** Encodings a held answer may keep beside its plain bytes, in the order this server prefers them. */
const ENCODINGS = ['br', 'gzip'] as const;
export type Encoding = (typeof ENCODINGS)[number];

/**
 * The encoding to send among those `offered`, from the request's Accept-Encoding (a quality of 0
 * refuses; `*` stands for every encoding not named); undefined for the plain bytes.
 */
export function acceptedEncoding(
  request: Request,
  offered: readonly Encoding[],
): Encoding | undefined {
  const q = new Map<string, number>();
  for (const part of (request.headers.get('accept-encoding') ?? '').split(',')) {
    const [token = '', ...params] = part.toLowerCase().split(';');
    const name = token.trim();
    if (!name) continue;
    const quality = params.map((p) => /^\s*q\s*=\s*([\d.]+)\s*$/.exec(p)).find(Boolean);
    q.set(name, quality ? Number(quality[1]) : 1);
  }
  return ENCODINGS.find((e) => offered.includes(e) && (q.get(e) ?? q.get('*') ?? 0) > 0);
}

/**
 * Bytes held for answers that repeat: the plain body, its encoded forms (each made once, when
 * first asked for) and an entity tag naming the plain body.
 */
export interface HeldBytes {
  body: Uint8Array<ArrayBuffer>;
  encoded: Partial<Record<Encoding, () => Uint8Array<ArrayBuffer>>>;
  etag: string;
}

/** An entity tag for `body` (a strong one: the same bytes, the same tag). */
export function entityTag(body: Uint8Array): string {
  return `"${createHash('sha256').update(body).digest('base64url').slice(0, 32)}"`;
}

/**
 * A held answer that may be revalidated: 304 when the client holds the same entity tag (for a
 * 200), the encoded bytes when the client takes them. Stored by the client only privately and
 * always revalidated, since what an answer shows depends on who asks.
 */
export function heldAnswer(
  request: Request,
  held: HeldBytes,
  init: { status?: number; headers: [string, string][] | Record<string, string> },
): Response {
  const status = init.status ?? 200;
  const encoding = acceptedEncoding(
    request,
    ENCODINGS.filter((e) => held.encoded[e]),
  );
  const etag = encoding
    ? `${held.etag.slice(0, -1)}-${encoding === 'gzip' ? 'gz' : encoding}"`
    : held.etag;
  const headers = new Headers(init.headers);
  headers.set('etag', etag);
  headers.set('cache-control', 'private, no-cache');
  headers.set('vary', 'Accept-Encoding, Cookie, Authorization');
  const asked = (request.headers.get('if-none-match') ?? '')
    .split(',')
    .map((t) => t.trim().replace(/^W\//, ''));
  if (status === 200 && (asked.includes(etag) || asked.includes('*'))) {
    for (const name of ['content-type', 'content-length', 'content-encoding']) headers.delete(name);
    return new Response(null, { status: 304, headers });
  }
  const bytes = encoding ? held.encoded[encoding]!() : held.body;
  headers.set('content-length', String(bytes.byteLength));
  if (encoding) headers.set('content-encoding', encoding);
  else headers.delete('content-encoding');
  // A stream over the held bytes: a byte-array body would be copied for every response.
  const body = new ReadableStream<Uint8Array>({
    start(controller) {
      controller.enqueue(bytes);
      controller.close();
    },
  });
  return new Response(body, { status, headers });
}

/** A serialised JSON answer held between changes (see heldAnswer), gzipped when the client takes it. */
export function cachedJson(
  request: Request,
  answer: { body: Uint8Array<ArrayBuffer>; gzip: () => Uint8Array<ArrayBuffer>; etag: string },
): Response {
  return heldAnswer(
    request,
    { body: answer.body, encoded: { gzip: answer.gzip }, etag: answer.etag },
    { headers: { 'content-type': 'application/json; charset=utf-8' } },
  );
}
