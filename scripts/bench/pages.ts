// Benchmark (not a test): server render time of the main pages on the built server, and the gzip
// size of the JavaScript each page loads for its islands.
// Usage: npm run bench:pages [-- --requests 200 --path /windows]
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { gzipSync } from 'node:zlib';
import { dataDir } from '../lib/paths.ts';
import { percentile, report, startBenchStack } from './stack.ts';

const { values } = parseArgs({
  options: {
    requests: { type: 'string', default: '200' },
    path: { type: 'string', multiple: true },
  },
});
const N = Number(values.requests);
const RENDER_TARGET_MS = 50;
const ISLAND_TARGET_KB = 150;

/** JavaScript a page loads for its islands: module scripts and island components, with their static imports. */
function pageScripts(html: string): string[] {
  const urls = new Set<string>();
  for (const m of html.matchAll(/(?:component-url|renderer-url|src)="(\/_astro\/[^"]+\.js)"/g))
    urls.add(m[1]!);
  return [...urls];
}

function gzipClosure(entries: string[], clientDir: string): { files: number; bytes: number } {
  const seen = new Set<string>();
  const queue = entries.map((u) => path.join(clientDir, u));
  let bytes = 0;
  while (queue.length) {
    const file = queue.pop()!;
    if (seen.has(file)) continue;
    seen.add(file);
    const text = readFileSync(file, 'utf8');
    bytes += gzipSync(text, { level: 9 }).byteLength;
    for (const m of text.matchAll(/(?:import|from)\s*["'](\.{1,2}\/[^"']+\.js)["']/g))
      queue.push(path.resolve(path.dirname(file), m[1]!));
  }
  return { files: seen.size, bytes };
}

async function main() {
  const stack = await startBenchStack();
  const clientDir = path.join(dataDir, 'bench', 'dist', 'client');
  const pages = values.path ?? ['/', '/windows', '/tools/scales'];
  try {
    // A record page, when the collection has one.
    if (!values.path) {
      const list = await fetch(`${stack.url}/api/v1/records?limit=1`)
        .then((r) => (r.ok ? r.json() : null))
        .catch(() => null);
      const handle = list?.items?.[0]?.handle;
      if (handle) pages.push(`/windows/${handle}`);
    }
    console.log(
      `Pages on the built server, ${N} sequential requests each (time to the full body):`,
    );
    for (const p of pages) {
      const first = await fetch(stack.url + p);
      if (!first.ok) {
        console.log(`  ${p}: ${first.status}, skipped`);
        continue;
      }
      const html = await first.text();
      for (let i = 0; i < 20; i++) await (await fetch(stack.url + p)).text();
      const times: number[] = [];
      for (let i = 0; i < N; i++) {
        const t0 = performance.now();
        await (await fetch(stack.url + p)).text();
        times.push(performance.now() - t0);
      }
      const p50 = percentile(times, 50);
      report(
        `render ${p} (p50; p95 ${percentile(times, 95).toFixed(1)} ms)`,
        `${p50.toFixed(1)} ms`,
        `≤ ${RENDER_TARGET_MS} ms`,
        p50 <= RENDER_TARGET_MS,
      );
      const js = gzipClosure(pageScripts(html), clientDir);
      report(
        `island JavaScript of ${p} (${js.files} files)`,
        `${(js.bytes / 1024).toFixed(1)} kB gzip`,
        p === '/windows' ? `≤ ${ISLAND_TARGET_KB} kB` : 'none',
        p !== '/windows' || js.bytes / 1024 <= ISLAND_TARGET_KB,
      );
    }
  } finally {
    await stack.stop();
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
