import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import {
  clearSignInFailures,
  closeAppDb,
  makeUser,
  postSignIn,
  sessionCookieFrom,
  uniqueEmail,
} from '../auth-helpers.ts';
import { sql } from 'kysely';
import { appDb } from '../auth-helpers.ts';

// 10 failed sign-ins per 15 minutes per account and per client address; the 11th gets 429.
// Every request here comes from 127.0.0.1, so each test starts from empty counters.

beforeEach(clearSignInFailures);
afterAll(async () => {
  await clearSignInFailures();
  await closeAppDb();
});

describe('failed sign-in limits', () => {
  it('per account: the 11th failure within 15 minutes gets 429 with Retry-After, even with the right password', async () => {
    const u = await makeUser();
    for (let i = 1; i <= 10; i++) {
      const res = await postSignIn(u.email, `wrong password number ${i}`);
      expect(res.status, `attempt ${i}`).toBe(302);
      expect(res.headers.get('location')).toMatch(/error=CredentialsSignin/);
    }
    // Forget the client-address counter, so only the account's counter speaks.
    await sql`DELETE FROM sign_in_failures WHERE key LIKE 'client:%'`.execute(appDb());
    const eleventh = await postSignIn(u.email, 'wrong password number 11');
    expect(eleventh.status).toBe(429);
    const retry = Number(eleventh.headers.get('retry-after'));
    expect(retry).toBeGreaterThan(14 * 60);
    expect(retry).toBeLessThanOrEqual(15 * 60);
    expect(eleventh.headers.get('content-type')).toMatch(/problem\+json/);
    const right = await postSignIn(u.email, u.password);
    expect(right.status).toBe(429);
    expect(sessionCookieFrom(right)).toBeNull();
    // Another account is unaffected once the shared address's counter is cleared.
    const other = await makeUser();
    await sql`DELETE FROM sign_in_failures WHERE key LIKE 'client:%'`.execute(appDb());
    expect(sessionCookieFrom(await postSignIn(other.email, other.password))).not.toBeNull();
  });

  it('per client address: 10 failures on different accounts block the 11th attempt from that address', async () => {
    // A made-up X-Forwarded-For (and a forged peer header) on each attempt changes nothing: the proxy is not trusted here.
    const spoof = (i: number) => ({
      'x-forwarded-for': `198.51.100.${i}`,
      'x-edgewise-peer': `192.0.2.${i}`,
    });
    for (let i = 1; i <= 10; i++)
      expect(
        (await postSignIn(uniqueEmail('nobody'), 'some wrong password', spoof(i))).status,
      ).toBe(302);
    const u = await makeUser();
    const res = await postSignIn(u.email, u.password, spoof(11));
    expect(res.status).toBe(429);
    expect(Number(res.headers.get('retry-after'))).toBeGreaterThan(0);
  });

  it('a path Auth.js reads as the same action (extra slashes) is limited the same', async () => {
    const u = await makeUser();
    for (let i = 0; i < 10; i++) await postSignIn(u.email, 'a wrong password again');
    const { api, appUrl } = await import('../helpers.ts');
    const res = await api('/api/auth//callback/credentials/', {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({
        email: u.email,
        password: u.password,
        callbackUrl: `${appUrl()}/account`,
      }).toString(),
    });
    expect(res.status).toBe(429);
    expect(sessionCookieFrom(res)).toBeNull();
  });

  it('failures older than 15 minutes no longer count', async () => {
    const u = await makeUser();
    await appDb()
      .insertInto('sign_in_failures')
      .values(
        Array.from({ length: 10 }, () => ({
          key: `account:${u.email}`,
          at: new Date(Date.now() - 16 * 60_000),
        })),
      )
      .execute();
    expect(sessionCookieFrom(await postSignIn(u.email, u.password))).not.toBeNull();
  });

  it('the sign-in page answers 429 in its own look', async () => {
    const u = await makeUser();
    for (let i = 0; i < 10; i++) await postSignIn(u.email, 'a wrong password again');
    const { api } = await import('../helpers.ts');
    const res = await api('/signin', {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({
        intent: 'password',
        email: u.email,
        password: u.password,
      }).toString(),
    });
    expect(res.status).toBe(429);
    expect(res.headers.get('retry-after')).toBeTruthy();
    expect(await res.text()).toContain('Too many failed sign-ins');
  });
});
