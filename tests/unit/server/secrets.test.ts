import { describe, expect, it } from 'vitest';
import {
  hashSecret,
  looksLikeApiToken,
  newApiToken,
  randomSecret,
} from '#lib/server/auth/secrets.ts';
import { clientAddressOf, requestClientAddress } from '#lib/server/auth/throttle.ts';

describe('token hashing', () => {
  it('is SHA-256 in lower-case hex (known value for "abc")', () => {
    expect(hashSecret('abc')).toBe(
      'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad',
    );
  });

  it('makes tokens of 256 random bits that look like tokens and never repeat', () => {
    const a = newApiToken();
    const b = newApiToken();
    expect(a).toMatch(/^ew_[A-Za-z0-9_-]{43}$/);
    expect(looksLikeApiToken(a)).toBe(true);
    expect(a).not.toBe(b);
    expect(hashSecret(a)).not.toBe(hashSecret(b));
    expect(Buffer.from(randomSecret(), 'base64url')).toHaveLength(32);
  });

  it('tells tokens from other strings before any lookup', () => {
    expect(looksLikeApiToken('ew_short')).toBe(false);
    expect(looksLikeApiToken(`xx_${'a'.repeat(43)}`)).toBe(false);
    expect(looksLikeApiToken(`ew_${'a'.repeat(42)}!`)).toBe(false);
  });
});

describe('client address for the sign-in limits', () => {
  it('uses the socket address and ignores X-Forwarded-For unless the proxy is trusted', () => {
    expect(clientAddressOf('10.0.0.5', '203.0.113.9', false)).toBe('10.0.0.5');
    expect(clientAddressOf('10.0.0.5', null, true)).toBe('10.0.0.5');
  });

  it('behind a trusted proxy, takes the address the proxy appended (the last one)', () => {
    expect(clientAddressOf('10.0.0.5', '198.51.100.1, 203.0.113.9', true)).toBe('203.0.113.9');
    expect(clientAddressOf('10.0.0.5', 'not-an-address', true)).toBe('10.0.0.5');
  });

  it('reads the peer address the server put on the request, not what the client claims', () => {
    const req = new Request('http://x/', {
      headers: { 'x-edgewise-peer': '192.0.2.7', 'x-forwarded-for': '198.51.100.1' },
    });
    expect(requestClientAddress(req, false)).toBe('192.0.2.7');
    expect(requestClientAddress(req, true)).toBe('198.51.100.1');
    expect(requestClientAddress(new Request('http://x/'), false)).toBe('unknown');
  });
});
