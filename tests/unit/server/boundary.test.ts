import { describe, expect, it } from 'vitest';
import {
  apiMethodTable,
  jsonProblems,
  MAX_JSON_DEPTH,
  unacceptableText,
  urlProblems,
} from '#lib/server/http/boundary.ts';

describe('text the boundary refuses', () => {
  it('refuses NUL and lone surrogates, accepts paired surrogates and other text', () => {
    expect(unacceptableText('a\u0000b')).toMatch(/NUL/);
    expect(unacceptableText('x\ud800y')).toMatch(/surrogate/);
    expect(unacceptableText('x\udc00')).toMatch(/surrogate/);
    expect(unacceptableText('\udc00\ud800')).toMatch(/surrogate/); // reversed pair
    expect(unacceptableText('LiTFSI in H₂O 😀 ‮')).toBeNull();
    expect(unacceptableText('')).toBeNull();
  });

  it('names the query parameter or path segment', () => {
    const url = new URL('http://x/api/v1/records/EW-0%00?q=%00&electrode=Pt&ok=1');
    expect(urlProblems(url).map((e) => e.path)).toEqual(['path segment 4', 'q']);
    expect(urlProblems(new URL('http://x/api/v1/records?q=lithium'))).toEqual([]);
    expect(urlProblems(new URL('http://x/a/%E0%A4%A'))[0]?.message).toMatch(/percent/);
  });

  it('names the JSON field, and refuses nesting past the limit', () => {
    expect(jsonProblems({ name: 'a\u0000b', list: ['ok', 'x\ud800y'] })).toEqual([
      { path: 'name', message: expect.stringMatching(/NUL/) },
      { path: 'list.1', message: expect.stringMatching(/surrogate/) },
    ]);
    expect(jsonProblems({ ['bad\u0000key']: 1 })[0]?.path).toBe('bad\\u0000key');
    let deep: unknown = 1;
    for (let i = 0; i < 100_000; i++) deep = [deep];
    expect(jsonProblems(deep)[0]?.message).toMatch(/deeper/);
    let ok: unknown = 1;
    for (let i = 0; i < MAX_JSON_DEPTH; i++) ok = { a: ok };
    expect(jsonProblems(ok)).toEqual([]);
  });
});

describe('the methods of API routes', () => {
  const mod =
    (...methods: string[]) =>
    async () =>
      Object.fromEntries(methods.map((m) => [m, () => new Response()]));
  const allowed = apiMethodTable(
    {
      './pages/api/v1/records/index.ts': mod('GET', 'POST'),
      './pages/api/v1/records/[handle]/index.ts': mod('GET', 'PUT'),
      './pages/api/v1/records/[handle]/transitions.ts': mod('POST'),
      './pages/api/v1/openapi.json.ts': mod('GET'),
      './pages/api/auth/[...auth].ts': mod('GET', 'POST'),
    },
    './pages',
  );

  it('reads them from the page files, HEAD with GET, and knows paths no route has', async () => {
    expect(await allowed('/api/v1/records')).toEqual(['GET', 'HEAD', 'POST']);
    expect(await allowed('/api/v1/records/EW-000001')).toEqual(['GET', 'HEAD', 'PUT']);
    expect(await allowed('/api/v1/records/EW-000001/transitions')).toEqual(['POST']);
    expect(await allowed('/api/v1/openapi.json')).toEqual(['GET', 'HEAD']);
    expect(await allowed('/api/v1/openapiXjson')).toBeNull();
    expect(await allowed('/api/auth/callback/credentials')).toEqual(['GET', 'HEAD', 'POST']);
    expect(await allowed('/api/v1/nothing/here/at/all')).toBeNull();
  });
});
