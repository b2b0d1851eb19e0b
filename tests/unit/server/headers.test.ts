import { describe, expect, it } from 'vitest';
import { applySecurityHeaders, pagePolicy } from '#lib/server/http/headers.ts';
import { checkStateChangingRequest } from '#lib/server/http/origin.ts';

describe('pagePolicy', () => {
  it("keeps Astro's hashed script and style sources and adds what they lack", () => {
    const p = pagePolicy("script-src 'self' 'sha256-abc='; style-src 'self' 'sha256-def='");
    expect(p).toContain("script-src 'self' 'sha256-abc='");
    expect(p).toContain("frame-ancestors 'none'");
    expect(p).toContain("object-src 'none'");
    expect(p).not.toContain('unsafe-inline');
    expect(p.match(/script-src/g)).toHaveLength(1);
  });

  it('stands alone without an Astro policy', () => {
    expect(pagePolicy(null)).toMatch(/^default-src 'self'/);
  });
});

describe('applySecurityHeaders', () => {
  it('locks down non-HTML responses completely', () => {
    const h = new Headers({ 'content-type': 'application/json' });
    applySecurityHeaders(h, { https: false });
    expect(h.get('content-security-policy')).toBe(
      "default-src 'none'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'",
    );
    expect(h.get('x-content-type-options')).toBe('nosniff');
    expect(h.get('strict-transport-security')).toBeNull();
  });

  it('adds HSTS over HTTPS only', () => {
    const h = new Headers();
    applySecurityHeaders(h, { https: true });
    expect(h.get('strict-transport-security')).toMatch(/max-age=31536000/);
  });
});

describe('checkStateChangingRequest', () => {
  const own = 'http://localhost:4321';
  const req = (method: string, headers: Record<string, string>) =>
    new Request('http://localhost:4321/api/x', { method, headers });

  it('lets reads through whatever their origin', () => {
    expect(checkStateChangingRequest(req('GET', { origin: 'http://evil.test' }), own).ok).toBe(
      true,
    );
  });

  it('refuses foreign and missing origins on writes', () => {
    expect(checkStateChangingRequest(req('POST', { origin: 'http://evil.test' }), own)).toEqual({
      ok: false,
      reason: 'cross-origin request from http://evil.test refused',
    });
    expect(checkStateChangingRequest(req('DELETE', {}), own).ok).toBe(false);
  });

  it('refuses same-origin form posts on JSON routes but not where forms are expected', () => {
    const form = req('POST', { origin: own, 'content-type': 'application/x-www-form-urlencoded' });
    expect(checkStateChangingRequest(form, own).ok).toBe(false);
    expect(checkStateChangingRequest(form, own, { allowForm: true }).ok).toBe(true);
    const multipart = req('POST', {
      origin: own,
      'content-type': 'multipart/form-data; boundary=x',
    });
    expect(checkStateChangingRequest(multipart, own).ok).toBe(false);
    expect(checkStateChangingRequest(multipart, own, { allowMultipart: true }).ok).toBe(true);
  });

  it('accepts bearer-token calls, which carry no cookie authority', () => {
    expect(checkStateChangingRequest(req('POST', { authorization: 'Bearer abc' }), own).ok).toBe(
      true,
    );
  });
});
