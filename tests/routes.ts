// Routes as the server sees them, read from src/pages: file names turned into route patterns
// (`src/pages/labs/[slug].astro` → `/labs/[slug]`) with the methods each file answers.
import { readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';

export interface EnumeratedRoute {
  route: string;
  method: string;
  file: string;
}

const pagesDir = path.join(import.meta.dirname, '..', 'src', 'pages');
const METHODS = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE', 'ALL'];

function walk(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const full = path.join(dir, name);
    return statSync(full).isDirectory() ? walk(full) : [full];
  });
}

/** `/api/v1/labs/[slug]/index.ts` → `/api/v1/labs/[slug]`; `/index.astro` → `/`. */
export function routeOf(relative: string): string {
  const noExt = relative.replace(/\\/g, '/').replace(/\.(astro|ts|js|mjs|md|mdx|html)$/, '');
  const parts = noExt.split('/').filter(Boolean);
  if (parts.at(-1) === 'index') parts.pop();
  return `/${parts.join('/')}`;
}

/** Methods an endpoint exports, or GET (+ POST when the page reads a posted form) for pages. */
export function methodsOf(file: string, source: string): string[] {
  if (file.endsWith('.astro')) {
    return /Astro\.request\.method\s*===?\s*['"]POST['"]/.test(source) ? ['GET', 'POST'] : ['GET'];
  }
  const found = new Set<string>();
  for (const m of source.matchAll(/export\s+(?:const|let|async\s+function|function)\s+([A-Z]+)\b/g))
    if (METHODS.includes(m[1]!)) found.add(m[1]!);
  for (const m of source.matchAll(/export\s*\{([^}]*)\}/g)) {
    for (const part of m[1]!.split(',')) {
      const name = part
        .trim()
        .split(/\s+as\s+/)
        .pop()
        ?.trim();
      if (name && METHODS.includes(name)) found.add(name);
    }
  }
  return [...found];
}

export function enumerateRoutes(): EnumeratedRoute[] {
  return walk(pagesDir)
    .filter(
      (f) =>
        /\.(astro|ts|js|mjs)$/.test(f) && !path.basename(f).startsWith('_') && !f.endsWith('.d.ts'),
    )
    .flatMap((file) => {
      const rel = path.relative(pagesDir, file);
      return methodsOf(file, readFileSync(file, 'utf8')).map((method) => ({
        route: routeOf(rel),
        method,
        file: rel,
      }));
    })
    .sort((a, b) => a.route.localeCompare(b.route) || a.method.localeCompare(b.method));
}
