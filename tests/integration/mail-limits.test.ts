import { sql } from 'kysely';
import { afterAll, beforeEach, describe, expect, it, inject } from 'vitest';
import {
  forgetOldMailRequests,
  MESSAGES_PER_ADDRESS,
  requestsPerClient,
} from '#lib/server/auth/mail-limits.ts';
import { readCapturedMail } from '#lib/server/mail-capture.ts';
import { api, waitForMail } from '../helpers.ts';
import { appDb, asJson, closeAppDb, makeUser, uniqueEmail } from '../auth-helpers.ts';

// Requests that send e-mail: at most 3 messages of a kind per address per hour, and a limited
// number of such requests per client address per hour (1000 on the test server, whose every
// request comes from 127.0.0.1; this file fills the counter to reach it). Each test starts with
// an empty per-client counter; addresses are new each time, so their counters start empty too.

const clearClientCounters = () =>
  sql`DELETE FROM mail_requests WHERE key LIKE 'client:%'`.execute(appDb());
const used: string[] = [];
const fresh = (tag: string) => {
  const email = uniqueEmail(tag);
  used.push(email);
  return email;
};
async function makeTrackedUser() {
  const u = await makeUser({ tag: 'mail-limits' });
  used.push(u.email);
  return u;
}

beforeEach(clearClientCounters);
afterAll(async () => {
  await clearClientCounters();
  for (const email of used)
    await appDb().deleteFrom('mail_requests').where('key', 'like', `address:%:${email}`).execute();
  await closeAppDb();
});

const strong = 'a long enough mail limit passphrase';
const forgot = (email: string, headers: Record<string, string> = {}) =>
  api('/api/v1/account/password/forgot', {
    method: 'POST',
    headers: { 'content-type': 'application/json', ...headers },
    body: JSON.stringify({ email }),
  });
const signUp = (email: string) =>
  asJson(null, '/api/v1/account/signup', 'POST', { email, password: strong });
const askForLink = (email: string) =>
  api('/api/auth/signin/email', {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams({ email }).toString(),
  });
const postPage = (path: string, fields: Record<string, string>) =>
  api(path, {
    method: 'POST',
    headers: { 'content-type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams(fields).toString(),
  });

/** Messages queued for an address (each of them is sent once the outbox delivers it). */
async function queued(to: string, kind: string): Promise<number> {
  const row = await appDb()
    .selectFrom('mail_outbox')
    .select((eb) => eb.fn.countAll<string>().as('n'))
    .where('to_address', '=', to)
    .where('kind', '=', kind)
    .executeTakeFirstOrThrow();
  return Number(row.n);
}

/** Captured messages to an address, once everything queued for it has been delivered. */
async function delivered(to: string, subject: RegExp): Promise<number> {
  const deadline = Date.now() + 10_000;
  for (;;) {
    const waiting = await appDb()
      .selectFrom('mail_outbox')
      .select('id')
      .where('to_address', '=', to)
      .where('status', '!=', 'sent')
      .execute();
    if (waiting.length === 0) break;
    if (Date.now() > deadline) throw new Error(`mail to ${to} still waiting`);
    await new Promise((r) => setTimeout(r, 100));
  }
  return (await readCapturedMail(inject('mailDir'))).filter(
    (m) => m.to.includes(to) && subject.test(m.subject),
  ).length;
}

/** The key the server counts this machine's requests under (the test's own peer address). */
async function ourClientKey(): Promise<string> {
  await clearClientCounters();
  expect((await forgot(fresh('probe'))).status).toBe(202);
  const rows = await appDb()
    .selectFrom('mail_requests')
    .select('key')
    .where('key', 'like', 'client:%')
    .execute();
  expect(rows).toHaveLength(1);
  return rows[0]!.key;
}

/** Leaves the client's counter `left` requests short of its limit. */
async function fillClientCounter(key: string, left: number): Promise<void> {
  await sql`DELETE FROM mail_requests WHERE key = ${key}`.execute(appDb());
  const n = requestsPerClient() - left;
  await sql`INSERT INTO mail_requests (key) SELECT ${key} FROM generate_series(1, ${n})`.execute(
    appDb(),
  );
}

describe('per recipient address', () => {
  it(`sends at most ${MESSAGES_PER_ADDRESS} reset links an hour; the next request answers the same and sends nothing`, async () => {
    expect(MESSAGES_PER_ADDRESS).toBe(3);
    const u = await makeTrackedUser();
    const answers = [];
    for (let i = 1; i <= MESSAGES_PER_ADDRESS + 1; i++) {
      const res = await forgot(u.email);
      answers.push({ status: res.status, body: await res.text() });
      expect(await queued(u.email, 'account.password-reset'), `after request ${i}`).toBe(
        Math.min(i, MESSAGES_PER_ADDRESS),
      );
    }
    expect(new Set(answers.map((a) => JSON.stringify(a))).size).toBe(1);
    expect(answers[0]!.status).toBe(202);
    expect(await delivered(u.email, /Reset your Edgewise password/)).toBe(MESSAGES_PER_ADDRESS);

    // The refused request did not expire the last link that was sent (each earlier one was
    // expired by the next; delivery order is not guaranteed, so try them all).
    const mails = (await readCapturedMail(inject('mailDir'))).filter(
      (m) => m.to.includes(u.email) && /Reset your/.test(m.subject),
    );
    const statuses = [];
    for (const m of mails) {
      const token = new URL(
        /https?:\/\/\S+\/password\/reset\?\S+/.exec(m.text)![0],
      ).searchParams.get('token');
      statuses.push(
        (
          await asJson(null, '/api/v1/account/password/reset', 'POST', {
            token,
            password: 'a brand new mail limit passphrase',
          })
        ).status,
      );
    }
    expect(statuses.sort()).toEqual([200, 404, 404]);

    // Another address is unaffected.
    const other = await makeTrackedUser();
    expect((await forgot(other.email)).status).toBe(202);
    await waitForMail(other.email, /Reset your Edgewise password/);
  });

  it('counts sign-up notices for a taken address the same way, and answers as for a new address', async () => {
    const u = await makeTrackedUser();
    for (let i = 1; i <= MESSAGES_PER_ADDRESS + 2; i++) {
      const res = await signUp(u.email);
      expect(res.status).toBe(202);
      expect(await res.json()).toEqual({ status: 'check your e-mail' });
    }
    expect(await queued(u.email, 'account.already-registered')).toBe(MESSAGES_PER_ADDRESS);
    expect(await delivered(u.email, /already have an Edgewise account/)).toBe(MESSAGES_PER_ADDRESS);

    const newcomer = fresh('newcomer');
    const res = await signUp(newcomer);
    expect(res.status).toBe(202);
    expect(await res.json()).toEqual({ status: 'check your e-mail' });
    await waitForMail(newcomer, /Confirm your Edgewise address/);
  });

  it('sends at most 3 sign-in links an hour, with the same redirect every time', async () => {
    const u = await makeTrackedUser();
    const locations = new Set<string | null>();
    for (let i = 1; i <= MESSAGES_PER_ADDRESS + 1; i++) {
      const res = await askForLink(u.email);
      expect(res.status).toBe(302);
      locations.add(res.headers.get('location'));
    }
    expect([...locations]).toHaveLength(1);
    expect([...locations][0]).toMatch(/verify-request/);
    expect(await queued(u.email, 'account.sign-in-link')).toBe(MESSAGES_PER_ADDRESS);
    expect(await delivered(u.email, /sign-in link/)).toBe(MESSAGES_PER_ADDRESS);
    // The page's link form is counted under the same limit.
    expect(
      (await postPage('/signin', { intent: 'link', email: u.email, next: '/account' })).headers.get(
        'location',
      ),
    ).toBe('/signin/check-email');
    expect(await queued(u.email, 'account.sign-in-link')).toBe(MESSAGES_PER_ADDRESS);
  });

  it('answers a capped address exactly as an unknown one', async () => {
    const u = await makeTrackedUser();
    for (let i = 0; i < MESSAGES_PER_ADDRESS; i++) await forgot(u.email);
    const capped = await forgot(u.email);
    const unknown = await forgot(fresh('ghost'));
    const shape = async (r: Response) => ({
      status: r.status,
      type: r.headers.get('content-type'),
      retry: r.headers.get('retry-after'),
      body: await r.text(),
    });
    expect(await shape(capped)).toEqual(await shape(unknown));
  });

  it('forgets messages older than an hour, and the clean-up job deletes them', async () => {
    const u = await makeTrackedUser();
    const key = `address:password-reset:${u.email}`;
    const hourAgo = new Date(Date.now() - 61 * 60_000);
    await appDb()
      .insertInto('mail_requests')
      .values(Array.from({ length: MESSAGES_PER_ADDRESS }, () => ({ key, at: hourAgo })))
      .execute();
    expect((await forgot(u.email)).status).toBe(202);
    expect(await queued(u.email, 'account.password-reset')).toBe(1);
    await forgetOldMailRequests(appDb());
    const left = await appDb()
      .selectFrom('mail_requests')
      .select('at')
      .where('key', '=', key)
      .execute();
    expect(left).toHaveLength(1);
  });
});

describe('per client address', () => {
  it('answers 429 problem+json with Retry-After once the hour is full, for known and unknown addresses alike', async () => {
    const key = await ourClientKey();
    await fillClientCounter(key, 1);
    const u = await makeTrackedUser();
    expect((await forgot(u.email)).status).toBe(202);
    await waitForMail(u.email, /Reset your Edgewise password/);

    const answers = [];
    for (const email of [u.email, fresh('ghost')]) {
      const res = await forgot(email);
      expect(res.status).toBe(429);
      expect(res.headers.get('content-type')).toMatch(/application\/problem\+json/);
      const retry = Number(res.headers.get('retry-after'));
      expect(retry).toBeGreaterThan(59 * 60);
      expect(retry).toBeLessThanOrEqual(60 * 60);
      const body = (await res.json()) as { status: number; title: string; detail: string };
      expect(body).toMatchObject({ status: 429, title: 'Too many requests' });
      answers.push(body.detail);
    }
    expect(answers[0]).toBe(answers[1]);
    expect(await queued(u.email, 'account.password-reset')).toBe(1);

    // Every mail-sending route shares the count: sign-up, the sign-in link, and their pages.
    const newcomer = fresh('refused');
    expect((await signUp(newcomer)).status).toBe(429);
    expect(
      await appDb()
        .selectFrom('User')
        .select('id')
        .where('email', '=', newcomer)
        .executeTakeFirst(),
    ).toBeUndefined();
    const link = await askForLink(u.email);
    expect(link.status).toBe(429);
    expect(link.headers.get('retry-after')).toBeTruthy();
    expect(link.headers.get('content-type')).toMatch(/application\/problem\+json/);
    expect(await queued(u.email, 'account.sign-in-link')).toBe(0);
    // Auth.js reads `/api/auth//signin/email/` as the same action; it is counted the same.
    const variant = await api('/api/auth//signin/email/', {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ email: u.email }).toString(),
    });
    expect(variant.status).toBe(429);
    expect(await queued(u.email, 'account.sign-in-link')).toBe(0);
    for (const [path, fields, text] of [
      ['/signin', { intent: 'link', email: u.email }, 'Too many e-mail requests'],
      ['/password/forgot', { email: u.email }, 'Too many e-mail requests'],
      ['/signup', { email: fresh('page'), password: strong }, 'Too many e-mail requests'],
    ] as const) {
      const page = await postPage(path, fields);
      expect(page.status, path).toBe(429);
      expect(page.headers.get('retry-after'), path).toBeTruthy();
      expect(await page.text(), path).toContain(text);
    }

    // A forged peer header or X-Forwarded-For does not escape the count (the proxy is not trusted here).
    expect(
      (
        await forgot(fresh('spoof'), {
          'x-edgewise-peer': '192.0.2.9',
          'x-forwarded-for': '198.51.100.9',
        })
      ).status,
    ).toBe(429);
  });

  it('another client address is unaffected', async () => {
    const key = await ourClientKey();
    await fillClientCounter('client:192.0.2.44', 0);
    expect((await forgot(fresh('elsewhere'))).status).toBe(202);
    const ours = await appDb()
      .selectFrom('mail_requests')
      .select((eb) => eb.fn.countAll<string>().as('n'))
      .where('key', '=', key)
      .executeTakeFirstOrThrow();
    expect(Number(ours.n)).toBe(2);
  });

  it('does not count requests refused as invalid', async () => {
    const key = await ourClientKey();
    expect(
      (await asJson(null, '/api/v1/account/password/forgot', 'POST', { email: 'not an address' }))
        .status,
    ).toBe(400);
    expect(
      (
        await asJson(null, '/api/v1/account/signup', 'POST', {
          email: fresh('weak'),
          password: 'short',
        })
      ).status,
    ).toBe(400);
    const ours = await appDb()
      .selectFrom('mail_requests')
      .select((eb) => eb.fn.countAll<string>().as('n'))
      .where('key', '=', key)
      .executeTakeFirstOrThrow();
    expect(Number(ours.n)).toBe(1);
  });
});
