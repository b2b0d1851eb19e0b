import type { z } from 'zod';
import { AppError, type FieldError } from '../errors.ts';
import { readLimitedText, zodErrors } from './route.ts';

// Form posts to pages: the same strict schemas as the JSON API, read from a urlencoded body.

const FORM_LIMIT = 64 * 1024;

/** The posted fields; keys in `arrays` always become arrays (checkbox groups). */
export async function readFormFields(
  request: Request,
  arrays: string[] = [],
): Promise<Record<string, string | string[]>> {
  const type = (request.headers.get('content-type') ?? '').toLowerCase();
  if (!type.startsWith('application/x-www-form-urlencoded')) return {};
  const params = new URLSearchParams(await readLimitedText(request, FORM_LIMIT));
  const out: Record<string, string | string[]> = {};
  for (const key of new Set(params.keys())) {
    const all = params.getAll(key);
    out[key] = arrays.includes(key) || all.length > 1 ? all : all[0]!;
  }
  return out;
}

export type FormResult<T> = { ok: true; data: T } | { ok: false; errors: FieldError[] };

/** Parses fields with a schema; `omit` names fields the page itself uses (e.g. `intent`). */
export function parseForm<S extends z.ZodType>(
  fields: Record<string, unknown>,
  schema: S,
  omit: string[] = ['intent'],
): FormResult<z.infer<S>> {
  const rest = Object.fromEntries(Object.entries(fields).filter(([k]) => !omit.includes(k)));
  const parsed = schema.safeParse(rest);
  return parsed.success
    ? { ok: true, data: parsed.data }
    : { ok: false, errors: zodErrors(parsed.error) };
}

/** A service failure as a form outcome: status and message for the page to show. */
export function formFailure(err: unknown): {
  status: number;
  message: string;
  errors: FieldError[];
  retryAfter?: number;
} {
  if (err instanceof AppError) {
    const retry = err.extra.retryAfterSeconds;
    return {
      status: err.status,
      message: err.message,
      errors: err.extra.errors ?? [],
      ...(retry ? { retryAfter: retry } : {}),
    };
  }
  throw err;
}

/** Where to go after signing in: a local path only. */
export function safeNext(value: string | null | undefined, fallback = '/account'): string {
  if (!value || !value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\'))
    return fallback;
  return value;
}
