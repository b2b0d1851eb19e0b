import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { enumerateRoutes } from '../routes.ts';
import {
  appDb,
  as,
  asJson,
  closeAppDb,
  ensureLab,
  makeUser,
  signIn,
  type TestUser,
} from '../auth-helpers.ts';

// A member (here even a manager) of lab B replays the id-taking routes with lab A's private ids
// and with random ids: nothing of lab A leaks or changes, and foreign ids look like missing ones.

let labA: { id: string; slug: string };
let labB: { id: string; slug: string };
let memberA: TestUser;
let intruder: string;
let ownerA: string;
let tokenOfA: string;

beforeAll(async () => {
  labA = await ensureLab('idor-lab-a');
  labB = await ensureLab('idor-lab-b');
  memberA = await makeUser({ role: 'contributor', labs: [[labA.slug, 'member']] });
  ownerA = await signIn(memberA);
  intruder = await signIn(await makeUser({ role: 'contributor', labs: [[labB.slug, 'manager']] }));
  tokenOfA = (
    (await (
      await asJson(ownerA, '/api/v1/account/tokens', 'POST', { name: 'a', scopes: ['read'] })
    ).json()) as { id: string }
  ).id;
});
afterAll(closeAppDb);

/** Status and problem title, without the instance path that names the id. */
async function outcome(res: Response) {
  const text = await res.text();
  let title: string | undefined;
  try {
    title = (JSON.parse(text) as { title?: string }).title;
  } catch {}
  return { status: res.status, title };
}

describe('cross-lab access', () => {
  it('a foreign API token and a random id give the same 404', async () => {
    const foreign = await outcome(
      await as(intruder, `/api/v1/account/tokens/${tokenOfA}`, { method: 'DELETE' }),
    );
    const missing = await outcome(
      await as(intruder, `/api/v1/account/tokens/${randomUUID()}`, { method: 'DELETE' }),
    );
    expect(foreign).toEqual({ status: 404, title: 'Not found' });
    expect(missing).toEqual(foreign);
    expect(
      (
        await appDb()
          .selectFrom('api_tokens')
          .select('revoked_at')
          .where('id', '=', tokenOfA)
          .executeTakeFirstOrThrow()
      ).revoked_at,
    ).toBeNull();
  });

  it('another account by id and a random id give the same refusal on the admin route', async () => {
    const foreign = await outcome(
      await asJson(intruder, `/api/v1/admin/users/${memberA.id}`, 'PATCH', { role: 'reader' }),
    );
    const missing = await outcome(
      await asJson(intruder, `/api/v1/admin/users/${randomUUID()}`, 'PATCH', { role: 'reader' }),
    );
    // Refused for the role before the id is looked up: nothing tells the two apart.
    expect(foreign).toEqual({ status: 403, title: 'Forbidden' });
    expect(missing).toEqual(foreign);
  });

  it("lab A's member list is not readable or changeable by lab B's manager, by any route", async () => {
    expect((await as(intruder, `/api/v1/labs/${labA.slug}/members`)).status).toBe(403);
    const view = (await (await as(intruder, `/api/v1/labs/${labA.slug}`)).json()) as {
      members?: unknown;
    };
    expect(view.members).toBeUndefined();
    const page = await (await as(intruder, `/labs/${labA.slug}`)).text();
    expect(page).not.toContain(memberA.email);
    for (const [method, body] of [
      ['PATCH', { role: 'manager' }],
      ['DELETE', undefined],
    ] as const) {
      const foreign = await outcome(
        await asJson(intruder, `/api/v1/labs/${labA.slug}/members/${memberA.id}`, method, body),
      );
      const missing = await outcome(
        await asJson(intruder, `/api/v1/labs/${labA.slug}/members/${randomUUID()}`, method, body),
      );
      expect(foreign.status).toBe(403);
      expect(missing).toEqual(foreign);
    }
    const added = await asJson(intruder, `/api/v1/labs/${labA.slug}/members`, 'POST', {
      email: 'x@example.test',
    });
    expect(added.status).toBe(403);
    const pagePost = await as(intruder, `/labs/${labA.slug}`, {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: `intent=remove&id=${memberA.id}`,
    });
    expect(pagePost.status).toBe(403);
    const rows = await appDb()
      .selectFrom('lab_memberships')
      .select(['user_id', 'role'])
      .where('lab_id', '=', labA.id)
      .execute();
    expect(rows).toContainEqual({ user_id: memberA.id, role: 'member' });
  });

  it('every id-taking route answers random ids without a leak or a crash', async () => {
    const routes = enumerateRoutes().filter(
      (r) => /\[/.test(r.route) && !r.route.startsWith('/api/auth/'),
    );
    expect(routes.length).toBeGreaterThan(5);
    const problems: string[] = [];
    for (const r of routes) {
      const path = r.route.replace(/\[(?:\.\.\.)?(\w+)\]/g, (_, name: string) =>
        name === 'handle'
          ? 'EW-999999'
          : name === 'n'
            ? '999'
            : name === 'slug'
              ? `no-such-lab-${Date.now()}`
              : randomUUID(),
      );
      const res = await asJson(intruder, path, r.method, r.method === 'GET' ? undefined : {});
      if (res.status < 400 || res.status >= 500)
        problems.push(`${r.method} ${path} → ${res.status}`);
    }
    expect(problems).toEqual([]);
  });
});
