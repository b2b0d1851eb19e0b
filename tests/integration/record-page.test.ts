import { createHash, randomBytes } from 'node:crypto';
import http from 'node:http';
import { brotliDecompressSync, gunzipSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { asJson, clearSignInFailures, closeAppDb, makeUser, signIn } from '../auth-helpers.ts';
import { appUrl } from '../helpers.ts';
import { ok } from '../support/api.ts';
import { content } from '../support/records.ts';

// The record page's bytes are held for anonymous readers per generation of the collection
// (src/lib/server/http/held-pages.ts). Here: the held page follows the record through
// publication, a new version and withdrawal; signed-in readers never get an anonymous reader's
// bytes nor the reverse; a held answer carries the same headers as a fresh one, a policy whose
// hashes cover its inline scripts and styles, an entity tag, and compressed copies of itself.

const run = randomBytes(3).toString('hex');
let owner: string;
let reader: string;
let curator: string;

beforeAll(async () => {
  owner = await signIn(await makeUser({ role: 'contributor', tag: 'page-owner' }));
  reader = await signIn(await makeUser({ role: 'reader', tag: 'page-reader' }));
  curator = await signIn(await makeUser({ role: 'curator', tag: 'page-curator' }));
});
afterAll(async () => {
  await clearSignInFailures();
  await closeAppDb();
});

/** A GET as the server sees it: status, headers and the bytes as sent (not decoded). */
function get(path: string, headers: Record<string, string> = {}) {
  return new Promise<{ status: number; headers: http.IncomingHttpHeaders; body: Buffer }>(
    (resolve, reject) => {
      http
        .get(new URL(path, appUrl()), { headers }, (res) => {
          const chunks: Buffer[] = [];
          res.on('data', (c: Buffer) => chunks.push(c));
          res.on('end', () =>
            resolve({ status: res.statusCode!, headers: res.headers, body: Buffer.concat(chunks) }),
          );
        })
        .on('error', reject);
    },
  );
}
const page = async (path: string, headers: Record<string, string> = {}) => {
  const r = await get(path, headers);
  return { ...r, html: r.body.toString('utf8') };
};
/** Headers that differ for every request by design. */
const lasting = (h: http.IncomingHttpHeaders) =>
  Object.fromEntries(Object.entries(h).filter(([n]) => !['x-request-id', 'date'].includes(n)));

const move = async (
  who: string,
  handle: string,
  action: string,
  version: number,
  reason?: string,
) =>
  ok(
    await asJson(who, `/api/v1/records/${handle}/transitions`, 'POST', {
      action,
      version,
      ...(reason ? { reason } : {}),
    }),
    action,
  );
const publish = async (handle: string, version: number) =>
  ok(
    await asJson(curator, `/api/v1/review/records/${handle}/decision`, 'POST', {
      decision: 'publish',
      version,
    }),
    'publish',
  );
async function draft(title: string): Promise<string> {
  const r = await ok(
    await asJson(owner, '/api/v1/records', 'POST', { content: content({ title }) }),
    'create',
    201,
  );
  return r.handle;
}
async function published(title: string): Promise<string> {
  const handle = await draft(title);
  await move(owner, handle, 'submit', 1);
  await publish(handle, 1);
  return handle;
}

describe('the record page held for anonymous readers', () => {
  it('follows the record when it is published, gets a new version and is withdrawn', async () => {
    const first = `Held page first ${run}`;
    const second = `Held page second ${run}`;
    const handle = await draft(first);
    const path = `/windows/${handle}`;
    const hidden = await page(path);
    expect(hidden.status).toBe(404);
    expect(hidden.html).toContain(`No record ${handle}`);
    expect((await page(path)).html).toBe(hidden.html); // held, and still a 404

    await move(owner, handle, 'submit', 1);
    await publish(handle, 1);
    const v1 = await page(path);
    expect(v1.status).toBe(200);
    expect(v1.html).toContain(first);
    expect((await page(path)).headers.etag).toBe(v1.headers.etag);

    // A revision under review: anonymous readers keep version 1, the owner sees version 2
    // rendered for them alone, and their view does not become the anonymous one.
    await move(reader, handle, 'flag', 1, 'The anodic limit looks high.');
    await move(curator, handle, 'request-changes', 1, 'Please check the limit.');
    await ok(
      await asJson(owner, `/api/v1/records/${handle}`, 'PUT', {
        version: 1,
        changeNote: `Limit checked ${run}`,
        content: content({ title: second }),
      }),
      'edit',
    );
    await move(owner, handle, 'submit', 2);
    const own = await page(path, { cookie: owner });
    expect(own.html).toContain(second);
    expect(own.headers['cache-control']).toBe('private, no-store');
    expect(own.headers.etag).toBeUndefined();
    for (const html of [(await page(path)).html, (await page(path)).html]) {
      expect(html).toContain(first);
      expect(html).not.toContain(second);
      expect(html).not.toContain(`Limit checked ${run}`);
    }

    await publish(handle, 2);
    const v2 = await page(path);
    expect(v2.html).toContain(second);
    expect(v2.headers.etag).not.toBe(v1.headers.etag);
    expect((await page(`${path}?version=1`)).html).toContain(first);

    await move(curator, handle, 'withdraw', 2, 'The source was retracted.');
    const gone = await page(path);
    expect(gone.status).toBe(200);
    expect(gone.html).toContain('This record was withdrawn');
    expect(gone.html).not.toBe(v2.html);
  });

  it('never gives a signed-in reader the anonymous bytes, nor the reverse', async () => {
    const handle = await published(`Held page readers ${run}`);
    const path = `/windows/${handle}`;
    // Anonymous first, then signed in (with the anonymous entity tag, too): each their own page.
    const anon = await page(path);
    expect(anon.html).toContain('data-testid="signin-link"');
    expect(anon.headers['cache-control']).toBe('private, no-cache');
    for (const cookie of [reader, owner]) {
      const mine = await page(path, { cookie, 'if-none-match': anon.headers.etag! });
      expect(mine.status).toBe(200);
      expect(mine.html).toContain('data-testid="account-link"');
      expect(mine.html).not.toContain('data-testid="signin-link"');
      expect(mine.headers['cache-control']).toBe('private, no-store');
      expect(mine.headers.etag).toBeUndefined();
    }
    // The reverse, on a generation nobody has read yet: signed in first, then anonymous.
    const other = await published(`Held page readers again ${run}`);
    const signedIn = await page(`/windows/${other}`, { cookie: reader });
    expect(signedIn.html).toContain('data-testid="account-link"');
    const after = await page(`/windows/${other}`);
    expect(after.html).toContain('data-testid="signin-link"');
    expect(after.html).not.toContain('data-testid="account-link"');
    // An API token is a signed-in reader too.
    const token = await ok(
      await asJson(reader, '/api/v1/account/tokens', 'POST', {
        name: `page ${run}`,
        scopes: ['read'],
        expiresInDays: 1,
      }),
      'token',
      201,
    );
    const byToken = await page(`/windows/${other}`, {
      authorization: `Bearer ${token.token}`,
    });
    expect(byToken.headers['cache-control']).toBe('private, no-store');
    expect(byToken.html).toContain('data-testid="account-link"');
  });

  it('answers a held page with the headers of a fresh one, revalidated and compressed', async () => {
    // A new record moves the generation: the first answer is rendered, the second held.
    const handle = await published(`Held page headers ${run}`);
    const path = `/windows/${handle}`;
    const fresh = await page(path);
    const held = await page(path);
    expect(held.status).toBe(200);
    expect(lasting(held.headers)).toEqual(lasting(fresh.headers));
    expect(held.html).toBe(fresh.html);

    // The security headers equal those of a page rendered for a signed-in reader.
    const rendered = await page(path, { cookie: reader });
    for (const name of [
      'content-security-policy',
      'x-content-type-options',
      'referrer-policy',
      'x-frame-options',
      'cross-origin-opener-policy',
      'cross-origin-resource-policy',
      'permissions-policy',
      'content-type',
    ])
      expect([name, held.headers[name]]).toEqual([name, rendered.headers[name]]);

    // The policy's hashes cover every inline script and style of the held bytes (a JSON-LD
    // block is data, not run, and not under script-src).
    const policy = held.headers['content-security-policy'] as string;
    expect(held.html).toContain('<script type="application/ld+json">');
    const inline = [
      ...held.html.matchAll(/<script(?![^>]*\b(?:src|type)=)[^>]*>([\s\S]*?)<\/script>/g),
      ...held.html.matchAll(/<style[^>]*>([\s\S]*?)<\/style>/g),
    ]
      .map((m) => m[1]!)
      .filter((s) => s.length > 0);
    expect(inline.length).toBeGreaterThan(0);
    for (const text of inline) {
      const hash = createHash('sha256').update(text).digest('base64');
      expect(policy).toContain(`'sha256-${hash}'`);
    }

    // Revalidation: the same tag is a 304 without a body.
    const again = await get(path, { 'if-none-match': held.headers.etag! });
    expect(again.status).toBe(304);
    expect(again.body.byteLength).toBe(0);
    expect(again.headers.etag).toBe(held.headers.etag);

    // Compressed copies decode to the same bytes, under tags of their own.
    const br = await get(path, { 'accept-encoding': 'gzip, br' });
    expect(br.headers['content-encoding']).toBe('br');
    expect(brotliDecompressSync(br.body).toString('utf8')).toBe(held.html);
    const gz = await get(path, { 'accept-encoding': 'gzip, br;q=0' });
    expect(gz.headers['content-encoding']).toBe('gzip');
    expect(gunzipSync(gz.body).toString('utf8')).toBe(held.html);
    expect(new Set([held.headers.etag, br.headers.etag, gz.headers.etag]).size).toBe(3);
    expect(
      (await get(path, { 'accept-encoding': 'br', 'if-none-match': br.headers.etag! })).status,
    ).toBe(304);

    // The theme cookie the layout reads is part of what is held.
    for (const theme of ['dark', 'light'])
      expect((await page(path, { cookie: `edgewise-theme=${theme}` })).html).toContain(
        `<html lang="en" data-theme="${theme}">`,
      );
    expect((await page(path)).html).toContain('<html lang="en">');

    // A handle nobody has: a 404, held as one.
    const missing = await page('/windows/EW-999999999');
    expect(missing.status).toBe(404);
    expect((await page('/windows/EW-999999999')).status).toBe(404);
  });
});
