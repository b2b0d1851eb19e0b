import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { HELD_ROUTES } from '#lib/server/http/held-pages.ts';

// A held page's key must name everything of the request its bytes depend on. The page file and
// the .astro files it renders on the server (its layout) may read only: the query parameters
// listed for the route, the theme cookie, the origin and path of the URL, and the principal
// (held pages are for anonymous readers only).

const root = path.resolve(import.meta.dirname, '../../..');

/** The page file and the .astro files it imports, followed through their imports. */
function serverRendered(file: string): string[] {
  const seen = new Set<string>();
  const queue = [path.join(root, file)];
  while (queue.length) {
    const f = queue.pop()!;
    if (seen.has(f)) continue;
    seen.add(f);
    for (const m of readFileSync(f, 'utf8').matchAll(/from\s+'([^']+\.astro)'/g)) {
      const spec = m[1]!;
      queue.push(
        spec.startsWith('#layouts/')
          ? path.join(root, 'src/layouts', spec.slice('#layouts/'.length))
          : spec.startsWith('#components/')
            ? path.join(root, 'src/components', spec.slice('#components/'.length))
            : path.resolve(path.dirname(f), spec),
      );
    }
  }
  return [...seen];
}

describe('held pages', () => {
  for (const [pattern, route] of Object.entries(HELD_ROUTES)) {
    it(`${pattern}: its key names every part of the request its files read`, () => {
      const files = serverRendered(route.file);
      expect(files.some((f) => f.endsWith('Base.astro'))).toBe(true);
      for (const f of files) {
        const text = readFileSync(f, 'utf8');
        const where = path.relative(root, f);
        for (const m of text.matchAll(/searchParams\.(\w+)\(\s*(['"]?)([^'")]*)\2/g))
          expect([where, m[1], m[3]]).toEqual([
            where,
            expect.stringMatching(/^(get|getAll|has)$/),
            expect.toSatisfy((name: string) => route.params.includes(name)),
          ]);
        for (const m of text.matchAll(/Astro\.cookies\.(\w+)\(([^)]*)\)/g))
          expect([where, m[1], m[2]]).toEqual([where, 'get', 'THEME_COOKIE']);
        for (const m of text.matchAll(/Astro\.url\.(\w+)/g))
          expect([where, m[1]]).toEqual([
            where,
            expect.stringMatching(/^(origin|pathname|searchParams)$/),
          ]);
        for (const m of text.matchAll(/Astro\.(request\.headers|clientAddress|locals\.\w+)/g))
          expect([where, m[1]]).toEqual([where, 'locals.principal']);
      }
    });
  }
});
