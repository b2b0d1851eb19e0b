import type { APIContext, APIRoute } from 'astro';
import { z } from 'zod';
import { AppError, PayloadTooLargeError, ValidationError, type FieldError } from '../errors.ts';
import { log, REQUEST_ID_HEADER } from '../log.ts';
import { IDEMPOTENCY_HEADER, withIdempotencyKey } from '../idempotency.ts';
import { authorizeAttempt, type Action } from '../policy.ts';
import { StorageUnavailableError } from '../storage.ts';
import { jsonProblems, unacceptableText } from './boundary.ts';
import { problem } from './problem.ts';

// The one way an API route turns input into a service call and failures into problem+json.

/**
 * Wraps an endpoint: typed errors become problem+json, anything else a logged 500. With
 * `attempt`, the caller is authenticated and authorised for that action (policy.ts,
 * `authorizeAttempt`) before the handler reads any query or body. With `idempotent`, a request
 * carrying `Idempotency-Key` is answered as idempotency.ts describes.
 */
export function endpoint(
  fn: (ctx: APIContext) => Promise<Response> | Response,
  opts: {
    attempt?: Action;
    idempotent?: boolean;
    /**
     * Asks about the object the path names before the body is read: 404 when it is not visible,
     * 401/403 when the principal may not act on it at all. The service asks again, exactly.
     */
    guard?: (ctx: APIContext) => Promise<unknown>;
  } = {},
): APIRoute {
  return async (ctx) => {
    try {
      if (opts.attempt) authorizeAttempt(ctx.locals.principal, opts.attempt);
      if (opts.guard) await opts.guard(ctx);
      const key = opts.idempotent ? ctx.request.headers.get(IDEMPOTENCY_HEADER) : null;
      if (key !== null) {
        return await withIdempotencyKey(ctx.request, ctx.locals.principal, key, async () => {
          try {
            return await fn(ctx);
          } catch (err) {
            return toProblem(err, ctx.url.pathname, ctx.request.headers.get(REQUEST_ID_HEADER));
          }
        });
      }
      return await fn(ctx);
    } catch (err) {
      return toProblem(err, ctx.url.pathname, ctx.request.headers.get(REQUEST_ID_HEADER));
    }
  };
}

/** A thrown error as problem+json; an unexpected one is logged with its stack and request id. */
export function toProblem(err: unknown, instance?: string, reqId?: string | null): Response {
  if (err instanceof AppError) {
    const { retryAfterSeconds, ...extra } = err.extra;
    const headers: Record<string, string> = retryAfterSeconds
      ? { 'retry-after': String(retryAfterSeconds) }
      : {};
    return problem(
      { title: err.title, status: err.status, detail: err.message, instance, ...extra },
      { headers },
    );
  }
  if (err instanceof z.ZodError) {
    return problem({
      title: 'Invalid request',
      status: 400,
      detail: 'The request has invalid fields.',
      instance,
      errors: zodErrors(err),
    });
  }
  if (err instanceof StorageUnavailableError) {
    return problem(
      {
        title: 'Service unavailable',
        status: 503,
        detail: 'Object storage is unavailable; try again shortly.',
        instance,
      },
      { headers: { 'retry-after': '5' } },
    );
  }
  if (isDatabaseDown(err)) {
    return problem(
      {
        title: 'Service unavailable',
        status: 503,
        detail: 'The database is unavailable; try again shortly.',
        instance,
      },
      { headers: { 'retry-after': '5' } },
    );
  }
  log().error({ err, reqId, path: instance }, 'unhandled error');
  return problem({
    title: 'Internal error',
    status: 500,
    detail: 'Something went wrong on our side.',
    instance,
  });
}

/** zod issues as field paths (`salts.0.concentration`) with messages. */
export function zodErrors(err: z.ZodError): FieldError[] {
  return err.issues.map((i) => {
    const base = i.path.map(String).join('.');
    // Unknown keys (mass assignment attempts) are named individually.
    if (i.code === 'unrecognized_keys') {
      return {
        path: i.keys.map((k) => (base ? `${base}.${k}` : k)).join(', '),
        message: `not an accepted field: ${i.keys.join(', ')}`,
      };
    }
    return { path: base || '(body)', message: i.message };
  });
}

const JSON_LIMIT = 1024 * 1024;

/** Reads a JSON body (≤ 1 MiB) and parses it with a schema; 400/413 with field paths otherwise. */
export async function readJson<S extends z.ZodType>(
  request: Request,
  schema: S,
  limitBytes = JSON_LIMIT,
): Promise<z.infer<S>> {
  const declared = Number(request.headers.get('content-length') ?? 0);
  if (declared > limitBytes) throw new PayloadTooLargeError(limitBytes);
  const type = (request.headers.get('content-type') ?? '').toLowerCase();
  if (!type.startsWith('application/json')) {
    throw new ValidationError(
      [{ path: '(body)', message: 'send application/json' }],
      'The body must be JSON.',
    );
  }
  const text = await readLimitedText(request, limitBytes);
  let data: unknown;
  try {
    // A reviver that drops nothing but refuses prototype keys outright.
    data = JSON.parse(text, (key, value) => {
      if (key === '__proto__' || key === 'constructor' || key === 'prototype') {
        throw new ValidationError([{ path: key, message: 'not an accepted field' }]);
      }
      return value;
    });
  } catch (err) {
    if (err instanceof ValidationError) throw err;
    throw new ValidationError(
      [{ path: '(body)', message: `malformed JSON: ${(err as Error).message}` }],
      'The body is not valid JSON.',
    );
  }
  const refused = jsonProblems(data);
  if (refused.length) throw new ValidationError(refused, 'The body has text that is not accepted.');
  const parsed = schema.safeParse(data);
  if (!parsed.success) throw new ValidationError(zodErrors(parsed.error));
  return parsed.data;
}

/** Reads at most limitBytes of a body as text (413 beyond); a NUL character is a 400. */
export async function readLimitedText(request: Request, limitBytes: number): Promise<string> {
  const text = new TextDecoder().decode(await readLimitedBytes(request, limitBytes));
  const why = unacceptableText(text);
  if (why) throw new ValidationError([{ path: '(body)', message: why }]);
  return text;
}

/** Reads at most limitBytes of a body; 413 beyond, without reading further. */
export async function readLimitedBytes(request: Request, limitBytes: number): Promise<Uint8Array> {
  if (!request.body) return new Uint8Array();
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limitBytes) {
      await reader.cancel();
      throw new PayloadTooLargeError(limitBytes);
    }
    chunks.push(value);
  }
  return Buffer.concat(chunks);
}

/** Query string parameters parsed with a schema (repeated keys become arrays where the schema wants them). */
export function readQuery<S extends z.ZodType>(url: URL, schema: S): z.infer<S> {
  const raw: Record<string, string | string[]> = {};
  for (const key of new Set(url.searchParams.keys())) {
    const all = url.searchParams.getAll(key);
    raw[key] = all.length > 1 ? all : all[0]!;
  }
  const parsed = schema.safeParse(raw);
  if (!parsed.success)
    throw new ValidationError(zodErrors(parsed.error), 'The query has invalid parameters.');
  return parsed.data;
}

function isDatabaseDown(err: unknown): boolean {
  const e = err as { code?: string; message?: string };
  return (
    ['ECONNREFUSED', 'ECONNRESET', '57P01', '57P02', '57P03', '08006', '08001', '08003'].includes(
      e?.code ?? '',
    ) || /Connection terminated|timeout exceeded when trying to connect/.test(e?.message ?? '')
  );
}
