import { createHash } from 'node:crypto';
import { expect } from 'vitest';
import { asJson } from '../auth-helpers.ts';
import { appUrl } from '../helpers.ts';

// Published records made through the API for the browser tests: create, upload a raw file
// (presigned PUT, then complete), submit, and publish as a curator.

async function ok(res: Response, what: string) {
  const body = await res.json();
  if (!res.ok) throw new Error(`${what}: ${res.status} ${JSON.stringify(body)}`);
  return body;
}

/** Publishes `content` (with one raw file when given) as `contributor`, approved by `curator`; its handle. */
export async function publishThroughApi(contributor: string, curator: string, content: unknown, raw?: string, direction: 'anodic' | 'cathodic' = 'anodic'): Promise<string> {
  const rec = await ok(await asJson(contributor, '/api/v1/records', 'POST', { content }), 'create');
  let version = rec.version;
  if (raw) {
    const bytes = Buffer.from(raw);
    const up = await ok(
      await asJson(contributor, '/api/v1/uploads', 'POST', {
        record: rec.handle,
        name: 'window-opening.csv',
        size: bytes.length,
        sha256: createHash('sha256').update(bytes).digest('hex'),
        mediaType: 'text/csv',
        mapping: { sign: 'iupac', direction },
      }),
      'declare upload',
    );
    const put = await fetch(up.url, { method: 'PUT', body: bytes, headers: up.headers });
    expect(put.ok).toBe(true);
    const done = await ok(await asJson(contributor, `/api/v1/uploads/${up.id}/complete`, 'POST', {}), 'complete upload');
    version = done.version ?? (await ok(await asJson(contributor, `/api/v1/records/${rec.handle}`, 'GET', undefined), 'reload')).version;
  }
  const sub = await ok(await asJson(contributor, `/api/v1/records/${rec.handle}/transitions`, 'POST', { action: 'submit', version }), 'submit');
  await ok(await asJson(curator, `/api/v1/records/${rec.handle}/transitions`, 'POST', { action: 'publish', version: sub.version }), 'publish');
  return rec.handle;
}

/** How many published records the API finds for a query: other test files publish records too. */
export async function publishedTotal(query: string): Promise<number> {
  const res = await fetch(new URL(`/api/v1/records?${query}&limit=1&facets=false`, appUrl()));
  expect(res.status).toBe(200);
  return (await res.json()).total;
}
