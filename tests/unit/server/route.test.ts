import { describe, expect, it, vi } from 'vitest';
import { z } from 'zod';
import { ConflictError, TooManyRequestsError } from '#lib/server/errors.ts';
import { readJson, readQuery, toProblem } from '#lib/server/http/route.ts';

const body = (text: string, type = 'application/json') =>
  new Request('http://x/api', { method: 'POST', body: text, headers: { 'content-type': type } });

const schema = z.strictObject({ name: z.string().min(1), count: z.number().int().optional() });

async function problemOf(p: Promise<unknown>) {
  try {
    await p;
  } catch (err) {
    const res = toProblem(err);
    return { status: res.status, body: await res.json() };
  }
  throw new Error('expected a failure');
}

describe('readJson', () => {
  it('returns the parsed body', async () => {
    await expect(readJson(body('{"name":"PC","count":2}'), schema)).resolves.toEqual({
      name: 'PC',
      count: 2,
    });
  });

  it('names an extra field (mass assignment) and stores nothing', async () => {
    const p = await problemOf(
      readJson(body('{"name":"PC","status":"published","role":"admin"}'), schema),
    );
    expect(p.status).toBe(400);
    expect(p.body.errors).toEqual([
      { path: 'status, role', message: 'not an accepted field: status, role' },
    ]);
  });

  it('refuses __proto__ keys before they reach any object', async () => {
    const p = await problemOf(readJson(body('{"name":"PC","__proto__":{"admin":true}}'), schema));
    expect(p.status).toBe(400);
    expect(p.body.errors[0].path).toBe('__proto__');
  });

  it('names the field that is wrong', async () => {
    const p = await problemOf(readJson(body('{"name":"","count":1.5}'), schema));
    expect(p.body.errors.map((e: { path: string }) => e.path)).toEqual(['name', 'count']);
  });

  it('refuses malformed JSON, other content types and oversize bodies', async () => {
    expect((await problemOf(readJson(body('{"name":'), schema))).body.detail).toBe(
      'The body is not valid JSON.',
    );
    expect(
      (await problemOf(readJson(body('name=x', 'application/x-www-form-urlencoded'), schema)))
        .status,
    ).toBe(400);
    expect(
      (await problemOf(readJson(body(JSON.stringify({ name: 'x'.repeat(2000) })), schema, 1000)))
        .status,
    ).toBe(413);
  });
});

describe('readQuery', () => {
  it('keeps repeated keys as arrays', () => {
    const q = readQuery(
      new URL('http://x/?e=gc&e=pt&limit=5'),
      z.object({ e: z.array(z.string()), limit: z.coerce.number() }),
    );
    expect(q).toEqual({ e: ['gc', 'pt'], limit: 5 });
  });
});

describe('toProblem', () => {
  it('carries Retry-After for 429 and extra members for 409', async () => {
    const r = toProblem(new TooManyRequestsError(60));
    expect(r.status).toBe(429);
    expect(r.headers.get('retry-after')).toBe('60');
    const c = toProblem(new ConflictError('already decided by Ana', { decidedBy: 'Ana' }));
    expect(await c.json()).toMatchObject({
      status: 409,
      detail: 'already decided by Ana',
      decidedBy: 'Ana',
    });
  });

  it('hides internal errors behind a plain 500', async () => {
    const orig = console.error;
    console.error = () => {};
    // The error is logged, and the logger reads the configuration: give it one that parses
    // (unit tests run without the server's environment).
    vi.stubEnv('DATABASE_URL', process.env.DATABASE_URL ?? 'postgres://unit@127.0.0.1/none');
    vi.stubEnv('AUTH_SECRET', process.env.AUTH_SECRET ?? 'unit-test-secret-of-at-least-32-chars');
    vi.stubEnv('LOG_LEVEL', 'silent');
    try {
      const r = toProblem(new Error('secret stack detail'));
      expect(r.status).toBe(500);
      expect(JSON.stringify(await r.json())).not.toContain('secret');
    } finally {
      console.error = orig;
      vi.unstubAllEnvs();
    }
  });
});
