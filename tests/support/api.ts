import { createHash } from 'node:crypto';
import { expect } from 'vitest';
import { asJson } from '../auth-helpers.ts';

// Steps through the API that many tests take on the way to what they test.

/** The JSON body of a response that must have exactly `status`; otherwise an error naming `what`. */
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- callers name the type they read
export async function ok<T = any>(res: Response, what: string, status = 200): Promise<T> {
  const body = res.status === 204 ? null : await res.json();
  if (res.status !== status) throw new Error(`${what}: ${res.status} ${JSON.stringify(body)}`);
  return body as T;
}

/**
 * One raw file attached to a record as the contribute form does it: declared (201), PUT to the
 * presigned address, completed (verified, analysed, attached). The completion's answer, with the
 * record at its new version.
 */
export async function attachRawThroughApi(
  cookie: string,
  handle: string,
  text: string,
  direction: 'anodic' | 'cathodic' = 'anodic',
): Promise<{ record: { version: number } }> {
  const bytes = Buffer.from(text);
  const up = await ok(
    await asJson(cookie, '/api/v1/uploads', 'POST', {
      record: handle,
      name: 'window-opening.csv',
      size: bytes.length,
      sha256: createHash('sha256').update(bytes).digest('hex'),
      mediaType: 'text/csv',
      mapping: { sign: 'iupac', direction },
    }),
    'declare upload',
    201,
  );
  expect((await fetch(up.url, { method: 'PUT', body: bytes, headers: up.headers })).ok).toBe(true);
  return ok(
    await asJson(cookie, `/api/v1/uploads/${up.id}/complete`, 'POST', {}),
    'complete upload',
  );
}
