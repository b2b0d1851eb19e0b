import { afterAll, describe, expect, it } from 'vitest';
import {
  appDb,
  as,
  asJson,
  closeAppDb,
  ensureLab,
  makeUser,
  signIn,
  uniqueEmail,
} from '../auth-helpers.ts';

// Write bodies with fields the caller may not set: refused with 400 naming the field, nothing stored.

afterAll(closeAppDb);

async function refused(res: Response, field: string) {
  expect(res.status).toBe(400);
  expect(res.headers.get('content-type')).toMatch(/problem\+json/);
  const body = (await res.json()) as { errors: { path: string; message: string }[] };
  expect(body.errors.map((e) => e.path).join(' | ')).toContain(field);
}

describe('mass assignment is refused by name', () => {
  it('profile: role, ownerId, version, session_version, disabled_at, email', async () => {
    const u = await makeUser({ role: 'reader' });
    const cookie = await signIn(u);
    for (const field of [
      'role',
      'ownerId',
      'version',
      'session_version',
      'disabled_at',
      'email',
      'labId',
      'status',
    ]) {
      await refused(
        await asJson(cookie, '/api/v1/account', 'PATCH', {
          affiliation: 'Sneaky',
          [field]: field === 'role' ? 'admin' : 'x',
        }),
        field,
      );
    }
    const row = await appDb()
      .selectFrom('User')
      .select(['role', 'affiliation', 'email', 'session_version'])
      .where('id', '=', u.id)
      .executeTakeFirstOrThrow();
    expect(row).toEqual({ role: 'reader', affiliation: null, email: u.email, session_version: 1 });
  });

  it('__proto__ and constructor keys', async () => {
    const cookie = await signIn(await makeUser());
    const res = await as(cookie, '/api/v1/account', {
      method: 'PATCH',
      headers: { 'content-type': 'application/json' },
      body: '{"affiliation":"x","__proto__":{"role":"admin"}}',
    });
    await refused(res, '__proto__');
    const res2 = await as(cookie, '/api/v1/account', {
      method: 'PATCH',
      headers: { 'content-type': 'application/json' },
      body: '{"constructor":{"prototype":{"role":"admin"}}}',
    });
    expect(res2.status).toBe(400);
  });

  it('sign-up: role and emailVerified', async () => {
    const email = uniqueEmail('massive');
    await refused(
      await asJson(null, '/api/v1/account/signup', 'POST', {
        email,
        password: 'a long enough passphrase',
        role: 'admin',
      }),
      'role',
    );
    await refused(
      await asJson(null, '/api/v1/account/signup', 'POST', {
        email,
        password: 'a long enough passphrase',
        emailVerified: '2020-01-01',
      }),
      'emailVerified',
    );
    expect(
      await appDb().selectFrom('User').select('id').where('email', '=', email).executeTakeFirst(),
    ).toBeUndefined();
  });

  it('API tokens: userId and ownerId', async () => {
    const u = await makeUser();
    const other = await makeUser();
    const cookie = await signIn(u);
    await refused(
      await asJson(cookie, '/api/v1/account/tokens', 'POST', {
        name: 't',
        scopes: ['read'],
        userId: other.id,
      }),
      'userId',
    );
    await refused(
      await asJson(cookie, '/api/v1/account/tokens', 'POST', {
        name: 't',
        scopes: ['read'],
        ownerId: other.id,
      }),
      'ownerId',
    );
    await refused(
      await asJson(cookie, '/api/v1/account/tokens', 'POST', { name: 't', scopes: ['admin'] }),
      'scopes',
    );
    expect(
      await appDb()
        .selectFrom('api_tokens')
        .select('id')
        .where('user_id', 'in', [u.id, other.id])
        .execute(),
    ).toEqual([]);
  });

  it('lab membership: labId, userId; admin changes: email, session_version', async () => {
    const lab = await ensureLab('mass-lab');
    const elsewhere = await ensureLab('mass-lab-other');
    const manager = await signIn(await makeUser({ labs: [[lab.slug, 'manager']] }));
    const newcomer = await makeUser();
    await refused(
      await asJson(manager, `/api/v1/labs/${lab.slug}/members`, 'POST', {
        email: newcomer.email,
        labId: elsewhere.id,
      }),
      'labId',
    );
    await refused(
      await asJson(manager, `/api/v1/labs/${lab.slug}/members`, 'POST', {
        email: newcomer.email,
        role: 'owner',
      }),
      'role',
    );
    expect(
      await appDb()
        .selectFrom('lab_memberships')
        .select('lab_id')
        .where('user_id', '=', newcomer.id)
        .execute(),
    ).toEqual([]);

    const admin = await signIn(await makeUser({ role: 'admin' }));
    await refused(
      await asJson(admin, `/api/v1/admin/users/${newcomer.id}`, 'PATCH', {
        role: 'curator',
        email: 'taken@example.test',
      }),
      'email',
    );
    await refused(
      await asJson(admin, `/api/v1/admin/users/${newcomer.id}`, 'PATCH', { session_version: 99 }),
      'session_version',
    );
    const row = await appDb()
      .selectFrom('User')
      .select(['role', 'email'])
      .where('id', '=', newcomer.id)
      .executeTakeFirstOrThrow();
    expect(row).toEqual({ role: 'reader', email: newcomer.email });
  });

  it('forms too: the profile form refuses a role field', async () => {
    const u = await makeUser();
    const cookie = await signIn(u);
    const res = await as(cookie, '/account', {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: 'intent=profile&affiliation=Form&role=admin',
    });
    expect(res.status).toBe(400);
    expect(await res.text()).toContain('not an accepted field: role');
    expect(
      await appDb()
        .selectFrom('User')
        .select(['role', 'affiliation'])
        .where('id', '=', u.id)
        .executeTakeFirstOrThrow(),
    ).toEqual({ role: 'reader', affiliation: null });
  });
});

describe('profile', () => {
  it('stores a valid ORCID iD normalised and refuses a bad checksum', async () => {
    const u = await makeUser();
    const cookie = await signIn(u);
    const ok = await asJson(cookie, '/api/v1/account', 'PATCH', {
      name: 'Mira H.',
      affiliation: 'Riverbend',
      orcid: 'https://orcid.org/0000-0002-1825-0097',
    });
    expect(ok.status).toBe(200);
    expect(await ok.json()).toMatchObject({
      name: 'Mira H.',
      affiliation: 'Riverbend',
      orcid: '0000-0002-1825-0097',
    });
    await refused(
      await asJson(cookie, '/api/v1/account', 'PATCH', { orcid: '0000-0002-1825-0098' }),
      'orcid',
    );
    const cleared = await asJson(cookie, '/api/v1/account', 'PATCH', { orcid: null });
    expect((await cleared.json()).orcid).toBeNull();
  });
});
