import { expect } from 'vitest';
import { asJson } from '../auth-helpers.ts';
import { appUrl } from '../helpers.ts';
import { attachRawThroughApi, ok } from '../support/api.ts';

// Published records made through the API for the browser tests: create, upload a raw file
// (presigned PUT, then complete), submit, and publish as a curator.

/** Publishes `content` (with one raw file when given) as `contributor`, approved by `curator`; its handle. */
export async function publishThroughApi(
  contributor: string,
  curator: string,
  content: unknown,
  raw?: string,
  direction: 'anodic' | 'cathodic' = 'anodic',
): Promise<string> {
  const rec = await ok(
    await asJson(contributor, '/api/v1/records', 'POST', { content }),
    'create',
    201,
  );
  const version = raw
    ? (await attachRawThroughApi(contributor, rec.handle, raw, direction)).record.version
    : rec.version;
  const sub = await ok(
    await asJson(contributor, `/api/v1/records/${rec.handle}/transitions`, 'POST', {
      action: 'submit',
      version,
    }),
    'submit',
  );
  await ok(
    await asJson(curator, `/api/v1/records/${rec.handle}/transitions`, 'POST', {
      action: 'publish',
      version: sub.version,
    }),
    'publish',
  );
  return rec.handle;
}

/** How many published records the API finds for a query: other test files publish records too. */
export async function publishedTotal(query: string): Promise<number> {
  const res = await fetch(new URL(`/api/v1/records?${query}&limit=1&facets=false`, appUrl()));
  expect(res.status).toBe(200);
  return (await res.json()).total;
}
