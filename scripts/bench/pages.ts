// Benchmark (not a test): server render time of the main pages on the built server, the gzip
// size of the JavaScript each page loads for its islands, a record page and its API answer under
// 32 connections, and what goes out compressed. Ends with one JSON line of figures.
// Usage: npm run bench:pages [-- --requests 200 --seconds 10 --path /windows]
import { readFileSync } from 'node:fs';
import autocannon from 'autocannon';
import http from 'node:http';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { gzipSync } from 'node:zlib';
import { dataDir } from '../lib/paths.ts';
import { percentile, report, startBenchStack } from './stack.ts';

const { values } = parseArgs({
  options: {
    requests: { type: 'string', default: '200' },
    seconds: { type: 'string', default: '10' },
    path: { type: 'string', multiple: true },
  },
});
const N = Number(values.requests);
const RENDER_TARGET_MS = 50;
const ISLAND_TARGET_KB = 150;
const RECORD_RPS_TARGET = 1_500;

/** autocannon on one path; requests per second and p95 from every response's own time. */
async function hammer(url: string, connections: number, seconds: number) {
  const times: number[] = [];
  const result = await new Promise<autocannon.Result>((resolve, reject) => {
    const run = autocannon({ url, connections, duration: seconds }, (err, r) =>
      err ? reject(err) : resolve(r),
    );
    run.on('response', (_c, _s, _b, ms) => times.push(ms));
  });
  return {
    rps: result.requests.total / seconds,
    p95: percentile(times, 95),
    failed: result.non2xx + result.errors + result.timeouts,
  };
}

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

    const figures: Record<string, number | string> = {};
    const recordPage = pages.find((p) => p.startsWith('/windows/'));
    if (recordPage) {
      const seconds = Number(values.seconds);
      const handle = recordPage.slice('/windows/'.length);
      console.log(`\nA record, 32 connections, ${seconds} s each (anonymous reader):`);
      for (const [what, p] of [
        ['record page', recordPage],
        ['record API', `/api/v1/records/${handle}`],
      ] as const) {
        const r = await hammer(stack.url + p, 32, seconds);
        report(
          `${what} ${p} (p95 ${r.p95.toFixed(1)} ms, ${r.failed} failed)`,
          `${r.rps.toFixed(0)} req/s`,
          `≥ ${RECORD_RPS_TARGET} req/s`,
          r.rps >= RECORD_RPS_TARGET && r.failed === 0,
        );
        figures[what === 'record page' ? 'recordPageRps' : 'recordApiRps'] = Math.round(r.rps);
        figures[what === 'record page' ? 'recordPageP95Ms' : 'recordApiP95Ms'] =
          Math.round(r.p95 * 10) / 10;
      }
    }

    // What goes out compressed when the client accepts it, and how assets are cached.
    console.log('\nCompression (accept-encoding: br, gzip) and caching:');
    const home = await (await fetch(stack.url + '/')).text();
    const script = pageScripts(home)[0];
    const probes = [
      ['home page', '/'],
      ['explorer page', '/windows'],
      ...(recordPage ? [['record page', recordPage]] : []),
      ['search API', '/api/v1/records?limit=50'],
      ...(script ? [['script', script]] : []),
    ];
    for (const [what, p] of probes) {
      const plain = await fetch(stack.url + p!, { headers: { 'accept-encoding': 'identity' } });
      const plainBytes = (await plain.arrayBuffer()).byteLength;
      // Node's fetch decodes bodies: the encoded size comes from a raw request.
      const enc = await rawSize(stack.url + p!, 'br, gzip');
      report(
        `${what} ${p!.length > 40 ? p!.slice(0, 40) + '…' : p}`,
        `${enc.encoding || 'none'}, ${(enc.bytes / 1024).toFixed(1)} of ${(plainBytes / 1024).toFixed(1)} kB`,
        'br or gzip',
        enc.encoding === 'br' || enc.encoding === 'gzip',
      );
      if (what === 'script') {
        const cache = plain.headers.get('cache-control') ?? '';
        report('hashed asset cache-control', cache, 'immutable', cache.includes('immutable'));
      }
    }
    console.log(JSON.stringify(figures));
  } finally {
    await stack.stop();
  }
}

/** Status, content-encoding and byte count of an answer as it travels (not decoded). */
function rawSize(url: string, acceptEncoding: string) {
  return new Promise<{ encoding: string; bytes: number }>((resolve, reject) => {
    const req = http.get(url, { headers: { 'accept-encoding': acceptEncoding } }, (res) => {
      let bytes = 0;
      res.on('data', (d: Buffer) => (bytes += d.byteLength));
      res.on('end', () =>
        resolve({ encoding: String(res.headers['content-encoding'] ?? ''), bytes }),
      );
    });
    req.on('error', reject);
  });
}

main().then(
  () => process.exit(0),
  (err) => {
    console.error(err);
    process.exit(1);
  },
);
