import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appDb, as, closeAppDb, makeUser, signIn } from '../auth-helpers.ts';
import { enumerateRoutes } from '../routes.ts';
import { labRawFile } from '../support/records.ts';
import { ensureLab } from '../auth-helpers.ts';

// Every route of src/pages, swept: each response (pages, JSON, downloads, errors) carries the
// security headers; every state-changing route refuses a foreign Origin and a cross-site form
// post; and no GET changes anything (no audit event appears while every GET route is fetched).

const routes = enumerateRoutes();
const UUID = '00000000-0000-4000-8000-000000000000';
const fill = (route: string) =>
  route
    .replace(/\[\.\.\.[^\]]+\]/g, 'session')
    .replace(/\[handle\]/g, 'EW-000001')
    .replace(/\[slug\]/g, 'no-such-lab')
    .replace(/\[n\]/g, '1')
    .replace(/\[[^\]]+\]/g, UUID);

const REQUIRED = [
  'content-security-policy',
  'x-content-type-options',
  'referrer-policy',
  'x-frame-options',
];
let admin: string;

beforeAll(async () => {
  admin = await signIn(await makeUser({ role: 'admin' }));
});
afterAll(() => closeAppDb());

function headersOk(res: Response, where: string) {
  for (const h of REQUIRED) expect(res.headers.get(h), `${where}: ${h}`).toBeTruthy();
  expect(res.headers.get('content-security-policy'), where).toContain("frame-ancestors 'none'");
  expect(res.headers.get('x-content-type-options'), where).toBe('nosniff');
}

describe('security headers on every route', () => {
  it(
    'anonymous and admin requests to every route and method answer with them',
    { timeout: 180_000 },
    async () => {
      let checked = 0;
      for (const r of routes) {
        for (const who of [null, admin]) {
          const init: RequestInit = { method: r.method === 'ALL' ? 'GET' : r.method };
          if (init.method !== 'GET')
            Object.assign(init, { headers: { 'content-type': 'application/json' }, body: '{}' });
          const res = await as(who, fill(r.route), init);
          await res.arrayBuffer();
          expect(res.status, `${r.method} ${r.route}`).toBeLessThan(500);
          headersOk(res, `${r.method} ${r.route} (${who ? 'admin' : 'anonymous'}) → ${res.status}`);
          checked++;
        }
      }
      console.log(
        `header sweep: ${checked} responses from ${routes.length} route-methods, all with CSP, nosniff, Referrer-Policy, frame-ancestors`,
      );
    },
  );

  it('a raw-file download is an attachment with the headers', async () => {
    const lab = `sweep-${Date.now().toString(36)}`;
    await ensureLab(lab);
    const id = await labRawFile(lab);
    const u = await makeUser({ role: 'contributor', labs: [[lab, 'member']] });
    const res = await as(await signIn(u), `/api/v1/raw-files/${id}`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-disposition')).toMatch(/^attachment;/);
    headersOk(res, 'download');
    await res.arrayBuffer();
  });
});

describe('cross-site requests', () => {
  const writes = routes.filter((r) => !['GET', 'ALL'].includes(r.method));

  it(
    'every state-changing route refuses a foreign Origin, even with a valid session',
    { timeout: 120_000 },
    async () => {
      for (const r of writes) {
        const res = await as(admin, fill(r.route), {
          method: r.method,
          headers: { origin: 'http://evil.test', 'content-type': 'application/json' },
          body: '{}',
        });
        expect(res.status, `${r.method} ${r.route}`).toBe(403);
        headersOk(res, `${r.method} ${r.route}`);
        await res.arrayBuffer();
      }
      console.log(
        `CSRF sweep: ${writes.length} state-changing route-methods refused a foreign Origin (100 %)`,
      );
    },
  );

  it(
    'every state-changing route refuses a request with no Origin and a cookie',
    { timeout: 120_000 },
    async () => {
      for (const r of writes) {
        const res = await fetch(new URL(fill(r.route), (await import('../helpers.ts')).appUrl()), {
          method: r.method,
          headers: { cookie: admin, 'content-type': 'application/x-www-form-urlencoded' },
          body: 'a=1',
          redirect: 'manual',
        });
        expect(res.status, `${r.method} ${r.route}`).toBe(403);
        await res.arrayBuffer();
      }
    },
  );

  it('JSON routes refuse same-origin form posts (what a cross-site form would send)', async () => {
    const json = writes.filter(
      (r) =>
        r.route.startsWith('/api/v1/') &&
        !r.route.endsWith('/analyses') &&
        !r.route.endsWith('/imports'),
    );
    for (const r of json) {
      const res = await as(admin, fill(r.route), {
        method: r.method,
        headers: { 'content-type': 'application/x-www-form-urlencoded' },
        body: 'role=admin',
      });
      expect([400, 403], `${r.method} ${r.route} → ${res.status}`).toContain(res.status);
      await res.arrayBuffer();
    }
  });
});

describe('no state change on GET', () => {
  it(
    'fetching every GET route as an admin writes no audit event',
    { timeout: 120_000 },
    async () => {
      const count = async () =>
        Number(
          (await sql<{ n: string }>`SELECT count(*) AS n FROM audit_events`.execute(appDb()))
            .rows[0]!.n,
        );
      const before = await count();
      const gets = routes.filter((r) => r.method === 'GET');
      for (const r of gets) await (await as(admin, fill(r.route))).arrayBuffer();
      expect(await count()).toBe(before);
      console.log(
        `GET sweep: ${gets.length} GET routes fetched as an admin, 0 audit events written`,
      );
    },
  );
});
