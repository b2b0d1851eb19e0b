import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import {
  clearSignInFailures,
  closeAppDb,
  makeUser,
  postSignIn,
  postSignInFrom,
  sessionCookieFrom,
  uniqueEmail,
} from '../auth-helpers.ts';
import { appDb } from '../auth-helpers.ts';
import {
  CLIENT_MAX_FAILURES,
  PAIR_MAX_FAILURES,
  signInDelayMs,
} from '#lib/server/auth/throttle.ts';

// Failed sign-ins slow the one who fails, not the account's owner: per account and client,
// attempts wait longer after each failure from the 3rd and the 11th failure within 15 minutes is
// a 429; per client, 50 failures on any accounts are a 429; nothing is counted per account alone.
// The test client sends from 127.0.0.1 (the attacker here) and from 127.0.0.2 (the owner signing
// in from elsewhere); each test starts from empty counters.

beforeEach(clearSignInFailures);
afterAll(async () => {
  await clearSignInFailures();
  await closeAppDb();
});

/** Failure rows as the server writes them, for counters that would take long to fill by hand. */
async function pileUp(key: string, n: number, agoMs = 60_000) {
  await appDb()
    .insertInto('sign_in_failures')
    .values(Array.from({ length: n }, () => ({ key, at: new Date(Date.now() - agoMs) })))
    .execute();
}

describe('failed sign-ins: the attacker', () => {
  it('gets 429 with Retry-After at the 11th failure on one account from one client, even with the right password', async () => {
    const u = await makeUser();
    // The first failures by hand (the early ones do not wait), the rest as rows.
    for (let i = 1; i <= 3; i++) {
      const res = await postSignIn(u.email, `wrong password number ${i}`);
      expect(res.status, `attempt ${i}`).toBe(302);
      expect(res.headers.get('location')).toMatch(/error=CredentialsSignin/);
    }
    await pileUp(`account+client:${u.email}|127.0.0.1`, PAIR_MAX_FAILURES - 3);
    const eleventh = await postSignIn(u.email, 'wrong password number 11');
    expect(eleventh.status).toBe(429);
    const retry = Number(eleventh.headers.get('retry-after'));
    expect(retry).toBeGreaterThan(13 * 60);
    expect(retry).toBeLessThanOrEqual(15 * 60);
    expect(eleventh.headers.get('content-type')).toMatch(/problem\+json/);
    const right = await postSignIn(u.email, u.password);
    expect(right.status).toBe(429);
    expect(sessionCookieFrom(right)).toBeNull();
  });

  it('waits longer after each failure: from the 3rd on, the answer comes no sooner than the delay', async () => {
    const u = await makeUser();
    const key = `account+client:${u.email}|127.0.0.1`;
    const waited: string[] = [];
    for (const failures of [2, 5, 7]) {
      await clearSignInFailures();
      await pileUp(key, failures);
      const t0 = Date.now();
      const res = await postSignIn(u.email, 'still the wrong password');
      const ms = Date.now() - t0;
      expect(res.status).toBe(302);
      // A lower bound only: the wait is part of the behaviour; how fast the rest is, is not.
      expect(ms).toBeGreaterThanOrEqual(signInDelayMs(failures));
      waited.push(`${failures} failures → waited ≥ ${signInDelayMs(failures)} ms (took ${ms} ms)`);
    }
    expect(signInDelayMs(2)).toBe(0);
    expect(signInDelayMs(5)).toBeGreaterThan(signInDelayMs(4));
    console.log(`sign-in delays: ${waited.join('; ')}`);
  });

  it('one client trying many accounts is refused after 50 failures, on every account', async () => {
    const spoof = { 'x-forwarded-for': '198.51.100.7', 'x-edgewise-peer': '192.0.2.7' };
    await pileUp('client:127.0.0.1', CLIENT_MAX_FAILURES - 1);
    // A made-up X-Forwarded-For (and a forged peer header) changes nothing: the proxy is not trusted here.
    expect((await postSignIn(uniqueEmail('nobody'), 'some wrong password', spoof)).status).toBe(
      302,
    );
    const u = await makeUser();
    const res = await postSignIn(u.email, u.password, spoof);
    expect(res.status).toBe(429);
    expect(Number(res.headers.get('retry-after'))).toBeGreaterThan(0);
    // Another client is not affected.
    expect((await postSignInFrom('127.0.0.2', u.email, u.password)).cookie).not.toBeNull();
  });

  it('a path Auth.js reads as the same action (extra slashes) is limited the same', async () => {
    const u = await makeUser();
    await pileUp(`account+client:${u.email}|127.0.0.1`, PAIR_MAX_FAILURES);
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
    await pileUp(`account+client:${u.email}|127.0.0.1`, PAIR_MAX_FAILURES, 16 * 60_000);
    expect(sessionCookieFrom(await postSignIn(u.email, u.password))).not.toBeNull();
  });

  it('the sign-in page answers 429 in its own look', async () => {
    const u = await makeUser();
    await pileUp(`account+client:${u.email}|127.0.0.1`, PAIR_MAX_FAILURES);
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

describe('failed sign-ins: the victim', () => {
  it('signs in from another client with the right password, at once, while the attacker is locked out', async () => {
    const u = await makeUser();
    for (let i = 1; i <= 3; i++) await postSignIn(u.email, `attacker guess ${i}`);
    await pileUp(`account+client:${u.email}|127.0.0.1`, PAIR_MAX_FAILURES - 3);
    expect((await postSignIn(u.email, 'attacker guess 11')).status).toBe(429);
    const t0 = Date.now();
    const owner = await postSignInFrom('127.0.0.2', u.email, u.password);
    const ms = Date.now() - t0;
    expect(owner.status).toBe(302);
    expect(owner.location).not.toMatch(/error=/);
    expect(owner.cookie).not.toBeNull();
    // The owner's own typo from their client counts for them alone and does not lock them out.
    expect((await postSignInFrom('127.0.0.2', u.email, 'a typo')).location).toMatch(
      /error=CredentialsSignin/,
    );
    expect((await postSignInFrom('127.0.0.2', u.email, u.password)).cookie).not.toBeNull();
    console.log(
      `sign-in lock-out: attacker at ${PAIR_MAX_FAILURES} failures → 429; the owner from another client signed in (${ms} ms, no wait added)`,
    );
  });
});
