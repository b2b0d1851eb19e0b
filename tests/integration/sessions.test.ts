import { afterAll, describe, expect, it } from 'vitest';
import { api, waitForMail } from '../helpers.ts';
import {
  appDb,
  as,
  asJson,
  closeAppDb,
  ensureLab,
  makeUser,
  postSignIn,
  sessionCookieFrom,
  signIn,
} from '../auth-helpers.ts';

// Changes to an account apply to the very next request made with an old cookie.

afterAll(closeAppDb);

const me = async (cookie: string | null) =>
  (await (await as(cookie, '/api/v1/me')).json()) as {
    kind: string;
    role?: string;
    labs?: { slug: string }[];
  };

describe('session cookie', () => {
  it('is HttpOnly, SameSite=Lax, path /, and not Secure over plain http', async () => {
    const u = await makeUser();
    const res = await postSignIn(u.email, u.password);
    expect(res.status).toBe(302);
    const set = res.headers.getSetCookie().find((c) => c.startsWith('authjs.session-token='))!;
    expect(set).toMatch(/;\s*HttpOnly/i);
    expect(set).toMatch(/;\s*SameSite=Lax/i);
    expect(set).toMatch(/;\s*Path=\//i);
    expect(set).not.toMatch(/;\s*Secure/i);
    expect((await me(sessionCookieFrom(res))).kind).toBe('user');
  });

  it('a forged or garbled cookie is anonymous', async () => {
    expect((await me('authjs.session-token=not-a-jwt')).kind).toBe('anonymous');
  });
});

describe('changes take effect on the next request with the old cookie', () => {
  it('sign-out', async () => {
    const u = await makeUser();
    const cookie = await signIn(u);
    expect((await me(cookie)).kind).toBe('user');
    const out = await as(cookie, '/signout', {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: '',
    });
    expect(out.status).toBe(302);
    // The response clears the cookie; a client that kept it anyway is still signed out.
    expect(out.headers.getSetCookie().some((c) => /^authjs\.session-token=;/.test(c))).toBe(true);
    expect((await me(cookie)).kind).toBe('anonymous');
    expect((await as(cookie, '/api/v1/account')).status).toBe(401);
  });

  it('demotion by an admin', async () => {
    const admin = await signIn(await makeUser({ role: 'admin' }));
    const u = await makeUser({ role: 'curator' });
    const cookie = await signIn(u);
    expect((await me(cookie)).role).toBe('curator');
    expect(
      (await asJson(admin, `/api/v1/admin/users/${u.id}`, 'PATCH', { role: 'reader' })).status,
    ).toBe(200);
    expect((await me(cookie)).role).toBe('reader');
  });

  it('disabling an account, which also refuses a new sign-in', async () => {
    const adminUser = await makeUser({ role: 'admin' });
    const admin = await signIn(adminUser);
    const u = await makeUser({ role: 'contributor' });
    const cookie = await signIn(u);
    expect(
      (await asJson(admin, `/api/v1/admin/users/${u.id}`, 'PATCH', { disabled: true })).status,
    ).toBe(200);
    expect((await me(cookie)).kind).toBe('anonymous');
    const again = await postSignIn(u.email, u.password);
    expect(sessionCookieFrom(again)).toBeNull();
    expect(again.headers.get('location')).toMatch(/code=disabled/);
    // Enabling again does not revive the old cookie.
    expect(
      (await asJson(admin, `/api/v1/admin/users/${u.id}`, 'PATCH', { disabled: false })).status,
    ).toBe(200);
    expect((await me(cookie)).kind).toBe('anonymous');
    const audit = await appDb()
      .selectFrom('audit_events')
      .select(['action', 'actor_id'])
      .where('subject_id', '=', u.id)
      .where('action', 'like', 'user.%')
      .orderBy('id')
      .execute();
    expect(audit).toEqual([
      { action: 'user.disabled', actor_id: adminUser.id },
      { action: 'user.enabled', actor_id: adminUser.id },
    ]);
    await waitForMail(u.email, /disabled/);
    await waitForMail(u.email, /enabled again/);
  });

  it('removal from a lab', async () => {
    const lab = await ensureLab('session-lab');
    const manager = await signIn(await makeUser({ labs: [[lab.slug, 'manager']] }));
    const u = await makeUser({ labs: [[lab.slug, 'member']] });
    const cookie = await signIn(u);
    expect((await as(cookie, `/api/v1/labs/${lab.slug}/members`)).status).toBe(200);
    expect(
      (await as(manager, `/api/v1/labs/${lab.slug}/members/${u.id}`, { method: 'DELETE' })).status,
    ).toBe(204);
    expect((await me(cookie)).labs).toEqual([]);
    expect((await as(cookie, `/api/v1/labs/${lab.slug}/members`)).status).toBe(403);
  });

  it('a password change ends the other sessions too', async () => {
    const u = await makeUser();
    const first = await signIn(u);
    const second = await signIn(u);
    const res = await asJson(second, '/api/v1/account/password', 'POST', {
      currentPassword: u.password,
      newPassword: 'a different long passphrase',
    });
    expect(res.status).toBe(204);
    expect((await me(first)).kind).toBe('anonymous');
    expect((await me(second)).kind).toBe('anonymous');
    await signIn({ email: u.email, password: 'a different long passphrase' });
  });
});

describe('API tokens', () => {
  it('are shown once, accepted as Bearer, scoped, listed without the secret and revocable', async () => {
    const u = await makeUser({ role: 'contributor' });
    const cookie = await signIn(u);
    const created = await asJson(cookie, '/api/v1/account/tokens', 'POST', {
      name: 'script',
      scopes: ['read'],
      expiresInDays: 30,
    });
    expect(created.status).toBe(201);
    const { token, id } = (await created.json()) as { token: string; id: string };
    expect(token).toMatch(/^ew_/);

    const who = await (await as(token, '/api/v1/me')).json();
    expect(who).toMatchObject({ kind: 'user', id: u.id, via: 'token', scopes: ['read'] });
    // Read scope only: writes are refused.
    const write = await asJson(token, '/api/v1/account', 'PATCH', { affiliation: 'Scripted' });
    expect(write.status).toBe(403);
    // A token cannot make more tokens.
    expect(
      (await asJson(token, '/api/v1/account/tokens', 'POST', { name: 'x', scopes: ['read'] }))
        .status,
    ).toBe(403);

    const listed = await (await as(cookie, '/api/v1/account/tokens')).text();
    expect(listed).toContain(id);
    expect(listed).not.toContain(token);
    const stored = await appDb()
      .selectFrom('api_tokens')
      .selectAll()
      .where('id', '=', id)
      .executeTakeFirstOrThrow();
    expect(stored.token_hash).toMatch(/^[0-9a-f]{64}$/);
    expect(JSON.stringify(stored)).not.toContain(token.slice(3));

    expect((await as(cookie, `/api/v1/account/tokens/${id}`, { method: 'DELETE' })).status).toBe(
      204,
    );
    const after = await as(token, '/api/v1/me');
    expect(after.status).toBe(401);
    expect(after.headers.get('content-type')).toMatch(/problem\+json/);
  });

  it('a write token writes; an expired token and a malformed header are refused', async () => {
    const u = await makeUser({ role: 'contributor' });
    const cookie = await signIn(u);
    const { token, id } = (await (
      await asJson(cookie, '/api/v1/account/tokens', 'POST', {
        name: 'w',
        scopes: ['read', 'write'],
      })
    ).json()) as { token: string; id: string };
    expect(
      (await asJson(token, '/api/v1/account', 'PATCH', { affiliation: 'Scripted Lab' })).status,
    ).toBe(200);
    await appDb()
      .updateTable('api_tokens')
      .set({ expires_at: new Date(Date.now() - 1000) })
      .where('id', '=', id)
      .execute();
    expect((await as(token, '/api/v1/me')).status).toBe(401);
    expect((await api('/api/v1/me', { headers: { authorization: 'Basic abc' } })).status).toBe(401);
    expect(
      (await api('/api/v1/me', { headers: { authorization: 'Bearer ew_nottherightshape' } }))
        .status,
    ).toBe(401);
  });

  it('a token stops working when its owner is disabled', async () => {
    const admin = await signIn(await makeUser({ role: 'admin' }));
    const u = await makeUser({ role: 'contributor' });
    const { token } = (await (
      await asJson(await signIn(u), '/api/v1/account/tokens', 'POST', {
        name: 'r',
        scopes: ['read'],
      })
    ).json()) as { token: string };
    expect((await as(token, '/api/v1/me')).status).toBe(200);
    await asJson(admin, `/api/v1/admin/users/${u.id}`, 'PATCH', { disabled: true });
    expect((await as(token, '/api/v1/me')).status).toBe(401);
  });
});
