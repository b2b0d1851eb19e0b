import { randomBytes } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appDb, as, closeAppDb, makeUser, signIn } from '../auth-helpers.ts';
import { content } from '../support/records.ts';

// `Idempotency-Key` on creating requests: a repeat with the same key and request gets the first
// answer (marked Idempotent-Replayed) and changes nothing; the same key with another request is a
// 422; simultaneous repeats make one change; keys belong to one account.

let owner: string;
let other: string;
beforeAll(async () => {
  owner = await signIn(await makeUser({ role: 'contributor' }));
  other = await signIn(await makeUser({ role: 'contributor' }));
});
afterAll(() => closeAppDb());

const post = (who: string, path: string, body: unknown, key?: string) =>
  as(who, path, {
    method: 'POST',
    headers: { 'content-type': 'application/json', ...(key ? { 'idempotency-key': key } : {}) },
    body: JSON.stringify(body),
  });

const countTitled = async (title: string) =>
  (
    await appDb()
      .selectFrom('record_versions')
      .select('record_id')
      .where('title', '=', title)
      .where('version', '=', 1)
      .execute()
  ).length;

describe('Idempotency-Key', () => {
  it('answers a repeat with the first answer and stores one record', async () => {
    const title = `Idempotent ${randomBytes(4).toString('hex')}`;
    const key = `create-${randomBytes(6).toString('hex')}`;
    const body = { content: content({ title }) };
    const first = await post(owner, '/api/v1/records', body, key);
    expect(first.status).toBe(201);
    const a = await first.json();
    const again = await post(owner, '/api/v1/records', body, key);
    expect(again.status).toBe(201);
    expect(again.headers.get('idempotent-replayed')).toBe('true');
    expect(again.headers.get('location')).toBe(first.headers.get('location'));
    expect((await again.json()).handle).toBe(a.handle);
    expect(await countTitled(title)).toBe(1);
    // Without a key, the same body is a new record.
    expect((await post(owner, '/api/v1/records', body)).status).toBe(201);
    expect(await countTitled(title)).toBe(2);
  });

  it('refuses the key with another body (422) and keeps keys per account', async () => {
    const key = `reuse-${randomBytes(6).toString('hex')}`;
    const title = `Idempotent other ${randomBytes(4).toString('hex')}`;
    expect(
      (await post(owner, '/api/v1/records', { content: content({ title }) }, key)).status,
    ).toBe(201);
    const reused = await post(
      owner,
      '/api/v1/records',
      { content: content({ title: `${title} changed` }) },
      key,
    );
    expect(reused.status).toBe(422);
    expect((await reused.json()).errors[0].path).toBe('Idempotency-Key');
    // Another account's same key is its own.
    const theirs = await post(other, '/api/v1/records', { content: content({ title }) }, key);
    expect(theirs.status).toBe(201);
    expect(theirs.headers.get('idempotent-replayed')).toBeNull();
    expect(await countTitled(title)).toBe(2);
  });

  it('makes one change from simultaneous repeats of a status move', async () => {
    const rec = await (await post(owner, '/api/v1/records', { content: content() })).json();
    const key = `submit-${randomBytes(6).toString('hex')}`;
    const body = { action: 'submit', version: rec.version };
    const answers = await Promise.all(
      Array.from({ length: 6 }, () =>
        post(owner, `/api/v1/records/${rec.handle}/transitions`, body, key),
      ),
    );
    const statuses = answers.map((r) => r.status).sort();
    // Each is the first answer or a "still running, retry" 409; never a second move.
    expect(statuses.every((s) => s === 200 || s === 409)).toBe(true);
    expect(statuses).toContain(200);
    for (const r of answers.filter((x) => x.status === 409))
      expect(r.headers.get('retry-after')).toBeTruthy();
    const later = await post(owner, `/api/v1/records/${rec.handle}/transitions`, body, key);
    expect(later.status).toBe(200);
    expect(later.headers.get('idempotent-replayed')).toBe('true');
    const submits = await appDb()
      .selectFrom('audit_events')
      .select('id')
      .where('subject_id', '=', rec.handle)
      .where('action', '=', 'record.submit')
      .execute();
    expect(submits).toHaveLength(1);
    console.log(`simultaneous repeats of one submit: answers ${statuses.join(' ')}; 1 move made`);
  });

  it('refuses a malformed key with 400 naming the header', async () => {
    const r = await post(owner, '/api/v1/records', { content: content() }, 'x'.repeat(300));
    expect(r.status).toBe(400);
    expect((await r.json()).errors[0].path).toBe('Idempotency-Key');
  });
});
