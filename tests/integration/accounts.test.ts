import { afterAll, describe, expect, it } from 'vitest';
import { api, waitForMail } from '../helpers.ts';
import {
  appDb,
  as,
  asJson,
  closeAppDb,
  makeUser,
  postSignIn,
  sessionCookieFrom,
  uniqueEmail,
} from '../auth-helpers.ts';

// Sign-up with address confirmation, password reset and e-mail link sign-in, through the API
// and the mail the local SMTP fake caught.

afterAll(closeAppDb);

const linkIn = (text: string, path: string) => {
  const m = new RegExp(`https?://\\S+${path.replace(/\//g, '\\/')}\\?\\S+`).exec(text);
  if (!m) throw new Error(`no ${path} link in:\n${text}`);
  return new URL(m[0]);
};

describe('sign-up', () => {
  it('creates an unconfirmed reader who can sign in only after confirming', async () => {
    const email = uniqueEmail('newcomer');
    const password = 'measured at one millivolt per second';
    const res = await asJson(null, '/api/v1/account/signup', 'POST', {
      email,
      password,
      name: 'Nell Newcomer',
    });
    expect(res.status).toBe(202);
    const user = await appDb()
      .selectFrom('User')
      .select(['id', 'role', 'emailVerified'])
      .where('email', '=', email)
      .executeTakeFirstOrThrow();
    expect(user).toMatchObject({ role: 'reader', emailVerified: null });
    const stored = await appDb()
      .selectFrom('password_credentials')
      .select('hash')
      .where('user_id', '=', user.id)
      .executeTakeFirstOrThrow();
    expect(stored.hash).toMatch(/^\$2[aby]\$12\$/);

    const before = await postSignIn(email, password);
    expect(sessionCookieFrom(before)).toBeNull();
    expect(before.headers.get('location')).toMatch(/code=unconfirmed/);

    const mail = await waitForMail(email, /Confirm your Edgewise address/);
    const link = linkIn(mail.text, '/signup/confirm');
    // Opening the link changes nothing; the page's button does.
    expect((await api(link.pathname + link.search)).status).toBe(200);
    expect(
      (
        await appDb()
          .selectFrom('User')
          .select('emailVerified')
          .where('id', '=', user.id)
          .executeTakeFirstOrThrow()
      ).emailVerified,
    ).toBeNull();
    const confirm = await asJson(null, '/api/v1/account/confirm', 'POST', {
      token: link.searchParams.get('token'),
    });
    expect(confirm.status).toBe(200);
    expect(
      (
        await asJson(null, '/api/v1/account/confirm', 'POST', {
          token: link.searchParams.get('token'),
        })
      ).status,
    ).toBe(404);
    expect(sessionCookieFrom(await postSignIn(email, password))).not.toBeNull();
  });

  it('does not reveal a taken address; its owner gets a notice instead', async () => {
    const u = await makeUser();
    const res = await asJson(null, '/api/v1/account/signup', 'POST', {
      email: u.email.toUpperCase(),
      password: 'another long passphrase',
    });
    expect(res.status).toBe(202);
    await waitForMail(u.email, /already have an Edgewise account/);
    const count = await appDb()
      .selectFrom('User')
      .select((eb) => eb.fn.countAll<string>().as('n'))
      .where('email', 'ilike', u.email)
      .executeTakeFirstOrThrow();
    expect(Number(count.n)).toBe(1);
  });

  it('refuses weak passwords with the reason, naming the field', async () => {
    for (const [password, reason] of [
      ['short one', 'at least 12'],
      ['password1234', 'too common'],
      ['x'.repeat(80), 'at most 72 bytes'],
    ]) {
      const res = await asJson(null, '/api/v1/account/signup', 'POST', {
        email: uniqueEmail('weak'),
        password,
      });
      expect(res.status).toBe(400);
      const body = (await res.json()) as { errors: { path: string; message: string }[] };
      expect(body.errors[0]).toMatchObject({ path: 'password' });
      expect(body.errors[0]!.message).toContain(reason);
    }
  });
});

describe('password reset', () => {
  it('mails a one-time link that sets a new password and ends every session', async () => {
    const u = await makeUser();
    const old = sessionCookieFrom(await postSignIn(u.email, u.password))!;
    expect(
      (await asJson(null, '/api/v1/account/password/forgot', 'POST', { email: u.email })).status,
    ).toBe(202);
    const link = linkIn(
      (await waitForMail(u.email, /Reset your Edgewise password/)).text,
      '/password/reset',
    );
    const token = link.searchParams.get('token')!;
    expect(
      (await asJson(null, '/api/v1/account/password/reset', 'POST', { token, password: 'short' }))
        .status,
    ).toBe(400);
    expect(
      (
        await asJson(null, '/api/v1/account/password/reset', 'POST', {
          token,
          password: 'a brand new passphrase',
        })
      ).status,
    ).toBe(200);
    expect(
      (
        await asJson(null, '/api/v1/account/password/reset', 'POST', {
          token,
          password: 'yet another passphrase',
        })
      ).status,
    ).toBe(404);
    expect((await (await as(old, '/api/v1/me')).json()).kind).toBe('anonymous');
    expect(sessionCookieFrom(await postSignIn(u.email, u.password))).toBeNull();
    expect(sessionCookieFrom(await postSignIn(u.email, 'a brand new passphrase'))).not.toBeNull();
    await waitForMail(u.email, /password was changed/);
  });

  it('answers the same for an unknown address', async () => {
    expect(
      (
        await asJson(null, '/api/v1/account/password/forgot', 'POST', {
          email: uniqueEmail('ghost'),
        })
      ).status,
    ).toBe(202);
  });
});

describe('e-mail link sign-in', () => {
  it('mails a link that signs in once', async () => {
    const u = await makeUser({ role: 'contributor' });
    const res = await api('/signin', {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ intent: 'link', email: u.email, next: '/account' }).toString(),
    });
    expect(res.status).toBe(302);
    expect(res.headers.get('location')).toContain('/signin/check-email');
    const link = linkIn((await waitForMail(u.email, /sign-in link/)).text, '/signin/link');
    // Opening the link (as a mail scanner would) signs nobody in and uses nothing up.
    const opened = await api(link.pathname + link.search);
    expect(opened.status).toBe(200);
    expect(sessionCookieFrom(opened)).toBeNull();
    // The library's own GET callback is not a way round it either.
    const direct = await api(`/api/auth/callback/email${link.search}`);
    expect(direct.status).toBe(302);
    expect(sessionCookieFrom(direct)).toBeNull();
    const press = () =>
      api(link.pathname, {
        method: 'POST',
        headers: { 'content-type': 'application/x-www-form-urlencoded' },
        body: link.searchParams.toString(),
      });
    const pressed = await press();
    const cookie = sessionCookieFrom(pressed);
    expect(cookie).not.toBeNull();
    expect(await (await as(cookie, '/api/v1/me')).json()).toMatchObject({
      kind: 'user',
      id: u.id,
      role: 'contributor',
    });
    // Once only.
    const again = await press();
    expect(again.status).toBe(400);
    expect(sessionCookieFrom(again)).toBeNull();
  });

  it('sends nothing to a disabled account', async () => {
    const u = await makeUser();
    await appDb()
      .updateTable('User')
      .set({ disabled_at: new Date() })
      .where('id', '=', u.id)
      .execute();
    const res = await api('/api/auth/signin/email', {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ email: u.email }).toString(),
    });
    expect(res.headers.get('location')).toMatch(/error=AccessDenied/);
    await expect(waitForMail(u.email, /sign-in link/, 1500)).rejects.toThrow(/no mail/);
  });
});
