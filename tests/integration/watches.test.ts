import { inject, afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'kysely';
import { readCapturedMail } from '#lib/server/mail-capture.ts';
import { api, appUrl, waitForMail } from '../helpers.ts';
import { appDb, as, asJson, closeAppDb, makeUser, signIn } from '../auth-helpers.ts';
import { ok } from '../support/api.ts';
import { content, tag } from '../support/records.ts';
import { publishThroughApi } from '../e2e/publish.ts';

// Watches: a saved comparison mails its owner once when a matching record is published, never
// after the mail was stopped, at most once a day, and lists what is new on the account page.

const word = tag('watched');
let alice: { email: string; cookie: string };
let bob: { email: string; cookie: string };
let aliceWatch: string;
let bobWatch: string;
let contributor: string;
let curatorCookie: string;

/** Publishes a record through the API (as the lifecycle runs in the server); its handle and version. */
async function publish(title: string): Promise<{ handle: string; version: number }> {
  const handle = await publishThroughApi(contributor, curatorCookie, content({ title }));
  const r = await ok(await as(contributor, `/api/v1/records/${handle}`), 'read');
  return { handle, version: r.version };
}

const mailsTo = async (to: string) =>
  (await readCapturedMail(inject('mailDir'))).filter(
    (m) => m.to.includes(to) && /change/.test(m.subject),
  );
const settle = () => new Promise((r) => setTimeout(r, 12_000));

beforeAll(async () => {
  for (const who of ['alice', 'bob'] as const) {
    const u = await makeUser({ role: 'reader' });
    const v = { email: u.email, cookie: await signIn(u) };
    if (who === 'alice') alice = v;
    else bob = v;
  }
  contributor = await signIn(await makeUser({ role: 'contributor' }));
  curatorCookie = await signIn(await makeUser({ role: 'curator' }));
}, 60_000);

afterAll(async () => {
  await closeAppDb();
});

describe('watching a comparison', () => {
  it('saves a comparison as a watch for a signed-in person only', async () => {
    const a = await ok(
      await asJson(alice.cookie, '/api/v1/watches', 'POST', {
        name: 'Carbonates on GC',
        query: `q=${word}&criterion=s:0.1&scale=SCE&limit=10`,
      }),
      'create watch',
      201,
    );
    aliceWatch = a.id;
    // Paging is the page's, not the comparison's.
    expect(a.query).toBe(`q=${word}&criterion=s%3A0.1&scale=SCE`);
    expect(a.newSinceSeen).toEqual([]);
    bobWatch = (
      await ok(
        await asJson(bob.cookie, '/api/v1/watches', 'POST', { name: 'Same', query: `q=${word}` }),
        'create watch',
        201,
      )
    ).id;
    const anon = await api('/api/v1/watches', {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ name: 'x', query: '' }),
    });
    expect(anon.status).toBe(401);
    const bad = await asJson(alice.cookie, '/api/v1/watches', 'POST', {
      name: 'x',
      query: 'scale=nowhere',
    });
    expect(bad.status).toBe(400);
    // Someone else's watch looks missing.
    expect(
      (await as(bob.cookie, `/api/v1/watches/${aliceWatch}`, { method: 'DELETE' })).status,
    ).toBe(404);
  });

  it('mails once after a matching record is published, with a signed link that stops the mail', async () => {
    const record = await publish(`${word} one`);
    // A record the comparison does not find is not reported.
    const other = { record: await publish(tag('unwatched')) };
    const mail = await waitForMail(alice.email, /1 change in "Carbonates on GC"/, 40_000);
    expect(mail.text).toContain(`${record.handle} v${record.version}: published`);
    expect(mail.text).not.toContain(other.record.handle);
    const bobs = await waitForMail(bob.email, /1 change in "Same"/, 40_000);
    const link = /(\S+\/watches\/unsubscribe\?\S+)/.exec(bobs.text)![1]!;
    const u = new URL(link);
    expect(u.searchParams.get('watch')).toBe(bobWatch);

    // The link's page changes nothing by itself; its one button does.
    const page = await api(`${u.pathname}${u.search}`);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain('Stop these e-mails');
    const forged = await api('/api/v1/watches/unsubscribe', {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ watch: bobWatch, token: 'A'.repeat(43) }),
    });
    expect(forged.status).toBe(400);
    const stop = await api(u.pathname, {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({
        watch: u.searchParams.get('watch')!,
        token: u.searchParams.get('token')!,
      }).toString(),
    });
    expect(stop.status).toBe(200);
    expect(await stop.text()).toContain('this watch will send no more e-mail');
  }, 90_000);

  it('sends none after unsubscribing, and at most one a day', async () => {
    // A day passes for both watches; then another matching record is published.
    await appDb()
      .updateTable('watches')
      .set({ last_mailed_at: sql`now() - interval '25 hours'` })
      .where('id', 'in', [aliceWatch, bobWatch])
      .execute();
    const record = await publish(`${word} two`);
    // The second mail is the one that names the second record.
    let mail;
    for (const deadline = Date.now() + 40_000; Date.now() < deadline && !mail; ) {
      mail = (await mailsTo(alice.email)).find((m) => m.text.includes(record.handle));
      if (!mail) await new Promise((r) => setTimeout(r, 250));
    }
    expect(mail, 'a second digest naming the second record').toBeDefined();
    expect(await mailsTo(alice.email)).toHaveLength(2);
    expect(mail!.subject).toBe('Edgewise: 1 change in "Carbonates on GC"');
    expect(mail!.text).toContain(`${record.handle} v${record.version}: published`);
    // The same day: a third record is published and flagged, and nobody is mailed again.
    const third = { record: await publish(`${word} three`) };
    await ok(
      await asJson(alice.cookie, `/api/v1/records/${third.record.handle}/transitions`, 'POST', {
        action: 'flag',
        version: third.record.version,
        reason: 'the anodic limit looks high',
      }),
      'flag',
    );
    await settle();
    await settle();
    expect(await mailsTo(alice.email)).toHaveLength(2);
    expect(await mailsTo(bob.email)).toHaveLength(1);

    // The account page lists what is new since last seen, until it is marked as seen.
    const list = await ok(await as(alice.cookie, '/api/v1/watches'), 'list');
    const w = list.watches.find((x: { id: string }) => x.id === aliceWatch);
    expect(
      w.newSinceSeen.map((c: { handle: string; kind: string }) => `${c.handle} ${c.kind}`),
    ).toEqual(
      expect.arrayContaining([
        `${record.handle} published`,
        `${third.record.handle} published`,
        `${third.record.handle} flagged`,
      ]),
    );
    const account = await as(alice.cookie, '/account');
    const html = await account.text();
    expect(html).toContain('Carbonates on GC');
    expect(html).toContain(third.record.handle);
    const seen = await ok(
      await as(alice.cookie, `/api/v1/watches/${aliceWatch}/seen`, { method: 'POST' }),
      'seen',
    );
    expect(seen.newSinceSeen).toEqual([]);
    expect(
      (await ok(await as(bob.cookie, '/api/v1/watches'), 'list')).watches[0].unsubscribed,
    ).toBe(true);
  }, 120_000);

  it('lets a mail program stop the mail in one click through the List-Unsubscribe header', async () => {
    // RFC 8058 (Levine & Herkert, "Signaling One-Click Functionality for List Email Headers",
    // 2017): List-Unsubscribe carries an https address, List-Unsubscribe-Post the form body the
    // mail program posts to it, from its own servers, with no Origin and no cookie.
    const [mail] = await mailsTo(alice.email);
    expect(mail!.headers['list-unsubscribe-post']).toBe('List-Unsubscribe=One-Click');
    const link = /^<(\S+)>$/.exec(mail!.headers['list-unsubscribe'] ?? '')?.[1];
    expect(link, mail!.headers['list-unsubscribe']).toBeDefined();
    const u = new URL(link!);
    expect(u.pathname).toBe('/api/v1/watches/unsubscribe');
    expect(u.searchParams.get('watch')).toBe(aliceWatch);
    const post = (search: string, body: string | FormData, headers: Record<string, string> = {}) =>
      api(`${u.pathname}${search}`, { method: 'POST', headers, body });
    const form = { 'content-type': 'application/x-www-form-urlencoded' };

    // Without the one-click body, with a forged token, or a token for another watch: refused,
    // and the watch still mails.
    expect((await post(u.search, 'a=1', form)).status).toBe(400);
    const forged = new URLSearchParams(u.search);
    forged.set('token', 'A'.repeat(43));
    expect((await post(`?${forged}`, 'List-Unsubscribe=One-Click', form)).status).toBe(400);
    const swapped = new URLSearchParams(u.search);
    swapped.set('watch', bobWatch);
    expect((await post(`?${swapped}`, 'List-Unsubscribe=One-Click', form)).status).toBe(400);
    const still = await ok(await as(alice.cookie, '/api/v1/watches'), 'list');
    expect(still.watches.find((x: { id: string }) => x.id === aliceWatch).unsubscribed).toBe(false);

    // The mail program's post, with no Origin and here as multipart (the RFC allows both
    // encodings).
    const body = new FormData();
    body.set('List-Unsubscribe', 'One-Click');
    const stop = await fetch(new URL(`${u.pathname}${u.search}`, appUrl()), {
      method: 'POST',
      body,
    });
    expect(stop.status).toBe(204);
    const after = await ok(await as(alice.cookie, '/api/v1/watches'), 'list');
    expect(after.watches.find((x: { id: string }) => x.id === aliceWatch).unsubscribed).toBe(true);

    // The same address with a cookie and no token is still a cross-site form post, refused.
    const bare = await as(alice.cookie, u.pathname, {
      method: 'POST',
      headers: form,
      body: 'List-Unsubscribe=One-Click',
    });
    expect(bare.status).toBe(403);
  }, 60_000);
});
