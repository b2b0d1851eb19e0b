import { afterAll, describe, expect, it, inject } from 'vitest';
import { DEMO_ACCOUNTS, DEMO_PASSWORD, seedAccounts } from '../../seed/accounts.ts';
import { as, appDb, closeAppDb, postSignIn, sessionCookieFrom } from '../auth-helpers.ts';

afterAll(closeAppDb);

describe('demo accounts', () => {
  it('are seeded idempotently, one per role plus a lab manager, and sign in with the shared password', async () => {
    await seedAccounts(inject('appEnv').DATABASE_URL!);
    await seedAccounts(inject('appEnv').DATABASE_URL!);
    const rows = await appDb()
      .selectFrom('User')
      .select(['email', 'role'])
      .where(
        'email',
        'in',
        DEMO_ACCOUNTS.map((a) => a.email),
      )
      .execute();
    expect(rows).toHaveLength(DEMO_ACCOUNTS.length);
    expect(new Set(rows.map((r) => r.role))).toEqual(
      new Set(['reader', 'contributor', 'curator', 'admin']),
    );
    const manager = DEMO_ACCOUNTS.find((a) => a.labs.some(([, r]) => r === 'manager'))!;
    const cookie = sessionCookieFrom(await postSignIn(manager.email, DEMO_PASSWORD));
    expect(cookie).not.toBeNull();
    const me = await (await as(cookie, '/api/v1/me')).json();
    expect(me.labs.map((l: { role: string }) => l.role)).toContain('manager');
  });
});
