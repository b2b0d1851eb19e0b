import { describe, expect, it } from 'vitest';
import { api } from '../helpers.ts';

const SECURITY_HEADERS = [
  'content-security-policy',
  'x-content-type-options',
  'referrer-policy',
  'x-frame-options',
];

function expectSecurityHeaders(res: Response) {
  for (const h of SECURITY_HEADERS) expect(res.headers.get(h), h).toBeTruthy();
  expect(res.headers.get('content-security-policy')).toContain("frame-ancestors 'none'");
  expect(res.headers.get('x-content-type-options')).toBe('nosniff');
}

describe('GET /api/health', () => {
  it('reports database, storage and mail up with 200', async () => {
    const res = await api('/api/health');
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({
      status: 'up',
      parts: { database: 'up', storage: 'up', mail: 'up' },
    });
    expectSecurityHeaders(res);
  });
});

describe('every kind of response carries the security headers', () => {
  it('a page', async () => {
    const res = await api('/');
    expect(res.status).toBe(200);
    expectSecurityHeaders(res);
    // Astro's hashes narrow scripts; nothing inline runs unhashed.
    expect(res.headers.get('content-security-policy')).toMatch(/script-src 'self' 'sha256-/);
    expect(res.headers.get('content-security-policy')).not.toContain('unsafe-inline');
  });

  it('a missing page', async () => {
    const res = await api('/no-such-page');
    expect(res.status).toBe(404);
    expectSecurityHeaders(res);
  });

  it('a static asset', async () => {
    const res = await api('/favicon.svg');
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/image\/svg\+xml/);
    expectSecurityHeaders(res);
  });

  it('a hashed bundle, kept for a year; paths out of the client folder find nothing', async () => {
    const home = await (await api('/')).text();
    const bundle = /\/_astro\/[\w.-]+\.(?:js|css)/.exec(home)?.[0];
    expect(bundle).toBeDefined();
    const res = await api(bundle!);
    expect(res.status).toBe(200);
    expect(res.headers.get('cache-control')).toBe('public, max-age=31536000, immutable');
    expectSecurityHeaders(res);
    for (const path of [
      '/_astro/../server/entry.mjs',
      '/_astro/%2e%2e/server/entry.mjs',
      '/_astro/no-such-bundle.js',
      '/_astro/%E0%A4%A',
    ]) {
      const miss = await api(path);
      expect([400, 404], path).toContain(miss.status);
      expect(await miss.text(), path).not.toContain('pageMap');
      expectSecurityHeaders(miss);
    }
  });

  it('a refusal', async () => {
    // A write to a route that takes POST, from another site.
    const res = await api('/api/v1/records', {
      method: 'POST',
      headers: { origin: 'http://evil.test', 'content-type': 'application/json' },
      body: '{}',
    });
    expect(res.status).toBe(403);
    expect(res.headers.get('content-type')).toMatch(/application\/problem\+json/);
    expect((await res.json()).detail).toBe('cross-origin request from http://evil.test refused');
    expectSecurityHeaders(res);
  });
});

describe('API paths without a route', () => {
  it('answer problem+json, not an HTML page', async () => {
    // A path no route answers is a 404; a method the route does not answer a 405 naming those
    // it does, in its Allow header too.
    for (const [method, path, status, detail] of [
      ['GET', '/api/v1/no-such-thing', 404, 'GET /api/v1/no-such-thing is not part of the API.'],
      ['DELETE', '/api/health', 405, '/api/health answers GET, HEAD only.'],
    ] as const) {
      const res = await api(path, { method });
      expect(res.status).toBe(status);
      expect(res.headers.get('content-type')).toMatch(/application\/problem\+json/);
      expect((await res.json()).detail).toBe(detail);
      if (status === 405) expect(res.headers.get('allow')).toMatch(/GET/);
      expectSecurityHeaders(res);
    }
  });
});

describe('the development mail page', () => {
  it('is absent outside development', async () => {
    expect((await api('/dev/mail')).status).toBe(404);
  });
});
