import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { enumerateRoutes } from '../routes.ts';
import {
  as,
  closeAppDb,
  clearSignInFailures,
  ensureLab,
  makeUser,
  signIn,
  uniqueEmail,
  appDb,
  type TestUser,
} from '../auth-helpers.ts';
import {
  PRINCIPALS,
  ROWS,
  type Helpers,
  type PrincipalName,
  type Row,
  type Vars,
} from './authz-routes.ts';
import { createToken } from '#lib/server/api-tokens.ts';
import { randomUUID, randomBytes } from 'node:crypto';

// Route × method × principal → status, against the built server. The table lives in
// authz-routes.ts; this file checks it covers every route in src/pages and then runs it.

const run = randomBytes(3).toString('hex');
const labA = `matrix-a-${run}`;
const labB = `matrix-b-${run}`;
const users = {} as Record<Exclude<PrincipalName, 'anon'>, TestUser>;
const cookies = {} as Record<PrincipalName, string | null>;

beforeAll(async () => {
  await ensureLab(labA);
  await ensureLab(labB);
  users.reader = await makeUser({ role: 'reader' });
  users.contributor = await makeUser({ role: 'contributor', labs: [[labA, 'member']] });
  users.manager = await makeUser({
    role: 'contributor',
    labs: [[labA, 'manager']],
    tag: 'manager',
  });
  users.curator = await makeUser({ role: 'curator' });
  users.admin = await makeUser({ role: 'admin' });
  users.otherLab = await makeUser({
    role: 'contributor',
    labs: [[labB, 'manager']],
    tag: 'otherlab',
  });
  cookies.anon = null;
  for (const name of PRINCIPALS) if (name !== 'anon') cookies[name] = await signIn(users[name]);
});

afterAll(async () => {
  await clearSignInFailures();
  await closeAppDb();
});

const helpers: Helpers = {
  newUser: async (role = 'reader') => makeUser({ role }),
  newMemberOfLabA: async () => (await makeUser({ labs: [[labA, 'member']], tag: 'member' })).id,
  newContributorToken: async () => {
    const c = users.contributor;
    const principal = {
      kind: 'user' as const,
      id: c.id,
      email: c.email,
      name: null,
      role: 'contributor' as const,
      labs: [],
      via: 'session' as const,
      scopes: ['read', 'write'] as ('read' | 'write')[],
    };
    return (
      await createToken(appDb(), principal, { name: 'matrix', scopes: ['read'], expiresInDays: 1 })
    ).info.id;
  },
  unique: (tag) => uniqueEmail(tag),
};

async function cell(r: Row, who: PrincipalName, emptyBody = false): Promise<number> {
  const target = await makeUser({ tag: 'target' });
  const base: Vars = { labA, labB, target: target.id, missing: randomUUID() };
  const vars = { ...base, ...(r.prepare ? await r.prepare(helpers, base) : {}) };
  const fill = (s: string) => s.replace(/\{(\w+)\}/g, (_, k: string) => vars[k] ?? `{${k}}`);
  const path = fill(r.path ?? r.route);
  const init: RequestInit = { method: r.method, headers: {} };
  const headers = init.headers as Record<string, string>;
  if (r.json !== undefined) {
    headers['content-type'] = 'application/json';
    init.body = emptyBody
      ? '{}'
      : JSON.stringify(
          typeof r.json === 'function' ? (r.json as (v: Vars) => unknown)(vars) : r.json,
        );
  } else if (r.form) {
    headers['content-type'] = 'application/x-www-form-urlencoded';
    init.body = new URLSearchParams(
      typeof r.form === 'function' ? r.form(vars) : r.form,
    ).toString();
  } else if (r.multipart) {
    init.body = new FormData();
  }
  const res = await as(cookies[who], path, init);
  await res.arrayBuffer();
  if (r.endsSession && who !== 'anon') cookies[who] = await signIn(users[who]);
  return res.status;
}

describe('authorisation matrix', () => {
  it('has exactly one row for every route and method in src/pages', () => {
    const routes = enumerateRoutes().map((r) => `${r.method} ${r.route}`);
    const rows = ROWS.map((r) => `${r.method} ${r.route}`);
    const missing = routes.filter((r) => !rows.includes(r));
    const stale = rows.filter((r) => !routes.includes(r));
    const doubled = rows.filter((r, i) => rows.indexOf(r) !== i);
    expect({ missing, stale, doubled }).toEqual({ missing: [], stale: [], doubled: [] });
    expect(routes.length).toBeGreaterThan(20);
  });

  it('gives every principal the expected status on every row (0 unexpected allows, 0 unexpected denies)', async () => {
    const surprises: string[] = [];
    let cells = 0;
    for (const r of ROWS) {
      for (const who of PRINCIPALS) {
        const got = await cell(r, who);
        cells++;
        const want = r.expect[who];
        if (got !== want) {
          const kind =
            got < 400 && want >= 400
              ? 'UNEXPECTED ALLOW'
              : got >= 400 && want < 400
                ? 'unexpected deny'
                : 'different status';
          surprises.push(
            `${kind}: ${r.method} ${r.path ?? r.route} as ${who}: got ${got}, want ${want}`,
          );
        }
      }
    }
    console.log(
      `authorisation matrix: ${ROWS.length} rows × ${PRINCIPALS.length} principals = ${cells} cells, ${surprises.length} surprises`,
    );
    expect(surprises).toEqual([]);
    // A thousand requests one after another: on a busy machine this takes minutes, not seconds.
  }, 600_000);

  it('refuses before reading the body: a refused principal gets the same status with `{}`', async () => {
    // Authorisation comes first: someone who may not act on an object learns nothing from a 400
    // about the body, and the body of a refused request is never parsed or described.
    const wrong: string[] = [];
    let cells = 0;
    for (const r of ROWS) {
      if (r.json === undefined || r.bodyIsCredential) continue;
      for (const who of PRINCIPALS) {
        const want = r.expect[who];
        if (![401, 403, 404].includes(want)) continue;
        if (r.bodyNamesObject && who !== 'anon' && who !== 'reader') continue;
        const got = await cell(r, who, true);
        cells++;
        if (got !== want)
          wrong.push(`${r.method} ${r.path ?? r.route} as ${who}: got ${got}, want ${want}`);
      }
    }
    console.log(`authorise before the body: ${cells} refused cells sent {}, ${wrong.length} wrong`);
    expect(wrong).toEqual([]);
  }, 600_000);
});
