// Benchmark (not a test): server render time of the main pages on the built server, the gzip
// size of the JavaScript each page loads for its islands, a record page and its API answer under
// 32 connections, what goes out compressed, and the longest main-thread task in Chromium at 4×
// CPU slowdown on a record whose raw file has 10⁶ samples, and what the overlay of several such
// records fetches. Ends with one JSON line of figures.
// Usage: npm run bench:pages [-- --requests 200 --seconds 10 --path /windows --samples 1000000
//   --overlay-records 2 --overlay-only]
import { createHash, randomBytes } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import autocannon from 'autocannon';
import http from 'node:http';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { gzipSync } from 'node:zlib';
import { chromium, type Page } from 'playwright-core';
import { cvWindowOpeningSamples, formatExport } from '#lib/analysis/index.ts';
import { createDb } from '#lib/server/db/index.ts';
import { dataDir } from '../lib/paths.ts';
import { percentile, report, startBenchStack, type BenchStack } from './stack.ts';

const { values } = parseArgs({
  options: {
    requests: { type: 'string', default: '200' },
    seconds: { type: 'string', default: '10' },
    path: { type: 'string', multiple: true },
    samples: { type: 'string', default: '1000000' },
    'overlay-records': { type: 'string', default: '2' },
    'overlay-only': { type: 'boolean', default: false },
  },
});
const N = Number(values.requests);
const RENDER_TARGET_MS = 50;
const ISLAND_TARGET_KB = 150;
const RECORD_RPS_TARGET = 1_500;
const LONG_TASK_TARGET_MS = 200;
const CPU_SLOWDOWN = 4;

/** autocannon on one path; requests per second and p95 from every response's own time. */
async function hammer(
  url: string,
  connections: number,
  seconds: number,
  headers: Record<string, string> = {},
) {
  const times: number[] = [];
  const result = await new Promise<autocannon.Result>((resolve, reject) => {
    const run = autocannon({ url, connections, duration: seconds, headers }, (err, r) =>
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
    // A record page: the collection's first record, or (in a new bench database) the record
    // with a big raw file made for the browser measurement below, made first.
    const samples = Number(values.samples);
    let big: string | undefined;
    const figures: Record<string, number | string> = {};
    if (!values['overlay-only']) {
      if (!values.path) {
        const list = await fetch(`${stack.url}/api/v1/records?limit=1`)
          .then((r) => (r.ok ? r.json() : null))
          .catch(() => null);
        const handle: string | undefined =
          list?.items?.[0]?.handle ?? (big = await recordWithBigFile(stack, samples));
        pages.push(`/windows/${handle}`);
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

      const recordPage = pages.find((p) => p.startsWith('/windows/'));
      if (recordPage) {
        const seconds = Number(values.seconds);
        const handle = recordPage.slice('/windows/'.length);
        console.log(`\nA record, 32 connections, ${seconds} s each (anonymous reader):`);
        // Plain, as before; and the page as browsers ask for it (brotli accepted).
        const runs = [
          ['record page', recordPage, 'recordPage', {}],
          ['record page, br', recordPage, 'recordPageBr', { 'accept-encoding': 'br, gzip' }],
          ['record API', `/api/v1/records/${handle}`, 'recordApi', {}],
        ] as const;
        for (const [what, p, name, headers] of runs) {
          const r = await hammer(stack.url + p, 32, seconds, headers);
          report(
            `${what} ${p} (p95 ${r.p95.toFixed(1)} ms, ${r.failed} failed)`,
            `${r.rps.toFixed(0)} req/s`,
            `≥ ${RECORD_RPS_TARGET} req/s`,
            r.rps >= RECORD_RPS_TARGET && r.failed === 0,
          );
          figures[`${name}Rps`] = Math.round(r.rps);
          figures[`${name}P95Ms`] = Math.round(r.p95 * 10) / 10;
        }
      }

      // What goes out compressed when the client accepts it, and how assets are cached.
      console.log('\nCompression (accept-encoding: br, gzip) and caching:');
      const home = await (await fetch(stack.url + '/')).text();
      // The largest script the home page loads (one under 1 kB is sent as it is).
      const script = pageScripts(home)
        .map((u) => ({ u, bytes: readFileSync(path.join(clientDir, u)).byteLength }))
        .sort((a, b) => b.bytes - a.bytes)[0]?.u;
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

      // A record whose raw file has 10⁶ samples, in Chromium with the CPU slowed down.
      big ??= await recordWithBigFile(stack, samples);
      const m = await mainThreadOnRecord(`${stack.url}/windows/${big}`, CPU_SLOWDOWN);
      console.log(
        `\nThe record page of ${big} in Chromium at ${CPU_SLOWDOWN}× CPU slowdown (long tasks: over 50 ms):`,
      );
      report('curve drawn after', `${(m.drawnMs / 1000).toFixed(1)} s`, '—', true);
      report(
        `longest main-thread task, load and draw (${m.tasksOnLoad} long)`,
        `${m.longestOnLoad.toFixed(0)} ms`,
        `≤ ${LONG_TASK_TARGET_MS} ms`,
        m.longestOnLoad <= LONG_TASK_TARGET_MS,
      );
      report(
        'raw file downloaded to draw',
        m.rawOnLoad ? `yes (${m.rawOnLoad})` : 'no',
        'no',
        m.rawOnLoad === 0,
      );
      report('bytes the page fetched (decoded)', `${(m.loadBytes / 1e6).toFixed(2)} MB`, '—', true);
      report(
        `longest task drawing every sample (${(m.everyMs / 1000).toFixed(1)} s)`,
        `${m.longestOnEvery.toFixed(0)} ms`,
        `≤ ${LONG_TASK_TARGET_MS} ms`,
        m.longestOnEvery <= LONG_TASK_TARGET_MS,
      );
      figures.longestTaskMs = Math.round(m.longestOnLoad);
      figures.longestTaskEverySampleMs = Math.round(m.longestOnEvery);
      figures.pageMB = Math.round(m.loadBytes / 1e4) / 100;
    }

    // The overlay of several records whose raw files have `samples` samples each.
    const overlaid = [big ?? (await recordWithBigFile(stack, samples))];
    while (overlaid.length < Number(values['overlay-records']))
      overlaid.push(await recordWithBigFile(stack, samples));
    const o = await overlayInBrowser(
      `${stack.url}/windows/overlay?records=${overlaid.join(',')}`,
      CPU_SLOWDOWN,
    );
    console.log(
      `\nThe overlay of ${overlaid.join(', ')} in Chromium at ${CPU_SLOWDOWN}× CPU slowdown:`,
    );
    report('curves drawn after', `${(o.drawnMs / 1000).toFixed(1)} s`, '—', true);
    report(
      'bytes the page fetched: decoded (over the wire)',
      `${(o.bytes / 1e6).toFixed(2)} MB (${(o.wire / 1e6).toFixed(2)} MB)`,
      '—',
      true,
    );
    report(
      'raw files downloaded to draw',
      o.rawDownloads ? `yes (${o.rawDownloads})` : 'no',
      'no',
      o.rawDownloads === 0,
    );
    report(
      `longest main-thread task (${o.longTasks} long)`,
      `${o.longest.toFixed(0)} ms`,
      `≤ ${LONG_TASK_TARGET_MS} ms`,
      o.longest <= LONG_TASK_TARGET_MS,
    );
    figures.rawSamples = samples;
    figures.overlayRecords = overlaid.length;
    figures.overlayMB = Math.round(o.bytes / 1e4) / 100;
    figures.overlayWireMB = Math.round(o.wire / 1e4) / 100;
    figures.overlayRawDownloads = o.rawDownloads;
    figures.overlayLongestTaskMs = Math.round(o.longest);
    figures.overlayDrawnS = Math.round(o.drawnMs / 100) / 10;
    console.log(JSON.stringify(figures));
  } finally {
    await stack.stop();
  }
}

/**
 * A published record with a raw file of `rows` samples, made through the API as a contributor
 * and a curator do (declare, PUT to the presigned URL, complete, submit, publish); its handle.
 */
async function recordWithBigFile(stack: BenchStack, rows: number): Promise<string> {
  const db = createDb(stack.adminUrl, 2);
  try {
    const { createToken } = await import('#lib/server/api-tokens.ts');
    const person = async (role: 'contributor' | 'curator') => {
      const u = await db
        .insertInto('User')
        .values({
          email: `bench-${role}-${randomBytes(3).toString('hex')}@bench.test`,
          name: `Bench ${role}`,
          role,
          emailVerified: new Date(),
        })
        .returning('id')
        .executeTakeFirstOrThrow();
      const principal = {
        kind: 'user' as const,
        id: u.id,
        email: '',
        name: null,
        role,
        labs: [],
        via: 'session' as const,
        scopes: ['read', 'write'] as ('read' | 'write')[],
      };
      const { token } = await createToken(db, principal, {
        name: 'bench',
        scopes: ['read', 'write'],
        expiresInDays: 1,
      });
      return async (p: string, method = 'GET', body?: unknown) => {
        const res = await fetch(stack.url + p, {
          method,
          headers: {
            authorization: `Bearer ${token}`,
            ...(body ? { 'content-type': 'application/json' } : {}),
          },
          body: body ? JSON.stringify(body) : undefined,
        });
        if (!res.ok) throw new Error(`${method} ${p}: ${res.status} ${await res.text()}`);
        return res.json();
      };
    };
    const contributor = await person('contributor');
    const curator = await person('curator');
    // Window opening 0.6…1.2 V, two cycles per vertex, sampled so the file has ≈ `rows` rows.
    const vertices = [0.6, 0.7, 0.8, 0.9, 1.0, 1.1, 1.2];
    const sweepV = 2 * 2 * vertices.reduce((a, b) => a + b, 0);
    const text = formatExport(
      cvWindowOpeningSamples({
        verticesV: vertices,
        cyclesPerVertex: 2,
        scanRateVPerS: 0.005,
        sampleIntervalS: sweepV / rows / 0.005,
        noise: { currentA: 2e-7, seed: 7 },
      }),
    );
    const bytes = Buffer.from(text);
    const { content } = await import('../../tests/support/record-content.ts');
    const rec = await contributor('/api/v1/records', 'POST', {
      content: content({ title: `A record with a ${rows.toLocaleString('en')}-sample file` }),
    });
    const ticket = await contributor('/api/v1/uploads', 'POST', {
      record: rec.handle,
      name: 'big-cv.csv',
      size: bytes.byteLength,
      sha256: createHash('sha256').update(bytes).digest('hex'),
      mediaType: 'text/csv',
    });
    const put = await fetch(ticket.url, { method: 'PUT', body: bytes, headers: ticket.headers });
    if (!put.ok) throw new Error(`PUT ${put.status}`);
    const done = await contributor(`/api/v1/uploads/${ticket.id}/complete`, 'POST');
    await contributor(`/api/v1/records/${rec.handle}/transitions`, 'POST', {
      action: 'submit',
      version: done.record.version,
    });
    await curator(`/api/v1/review/records/${rec.handle}/decision`, 'POST', {
      decision: 'publish',
      version: done.record.version,
    });
    console.log(
      `record ${rec.handle}: raw file of ${(text.split('\n').length - 2).toLocaleString('en')} samples, ${(bytes.byteLength / 1e6).toFixed(1)} MB`,
    );
    return rec.handle;
  } finally {
    await db.destroy();
  }
}

/** The path of a whole raw file's download (not its thinned drawing copy). */
const WHOLE_RAW_FILE = /\/api\/v1\/raw-files\/[0-9a-f-]{36}$/;

/**
 * Runs `use` on a page of Debian's Chromium (a profile of its own, removed after) with the CPU
 * slowed `rate` times (CDP Emulation.setCPUThrottlingRate) and the main thread's long tasks
 * (PerformanceObserver "longtask": over 50 ms) collected in `window.longTasks`.
 */
async function inThrottledChromium<T>(rate: number, use: (page: Page) => Promise<T>): Promise<T> {
  const profile = mkdtempSync(path.join(tmpdir(), 'edgewise-bench-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--no-first-run'],
    headless: true,
    viewport: { width: 1280, height: 900 },
  });
  try {
    const page = await context.newPage();
    await page.addInitScript(() => {
      const w = window as unknown as { longTasks: number[] };
      w.longTasks = [];
      new PerformanceObserver((list) => {
        for (const e of list.getEntries()) w.longTasks.push(e.duration);
      }).observe({ type: 'longtask', buffered: true });
    });
    const cdp = await context.newCDPSession(page);
    await cdp.send('Emulation.setCPUThrottlingRate', { rate });
    return await use(page);
  } finally {
    await context.close();
    rmSync(profile, { recursive: true, force: true });
  }
}

/**
 * Opens a record page (inThrottledChromium) and collects the main thread's long tasks while the
 * page loads and draws its raw curve, then while it draws every sample of the file after a click.
 * Also the bytes the page fetched.
 */
async function mainThreadOnRecord(url: string, rate: number) {
  return inThrottledChromium(rate, async (page) => {
    let fetched = 0;
    const rawDownloads: string[] = [];
    page.on('response', async (res) => {
      if (WHOLE_RAW_FILE.test(new URL(res.url()).pathname)) rawDownloads.push(res.url());
      const size = await res
        .body()
        .then((b) => b.byteLength)
        .catch(() => 0);
      fetched += size;
    });
    const longTasks = () =>
      page.evaluate(() => (window as unknown as { longTasks: number[] }).longTasks.splice(0));
    const t0 = performance.now();
    await page.goto(url, { waitUntil: 'load' });
    await page.getByTestId('curve-sampling').waitFor({ timeout: 120_000 });
    const drawnMs = performance.now() - t0;
    await page.waitForTimeout(1_000);
    const onLoad = await longTasks();
    const loadBytes = fetched;
    const rawOnLoad = rawDownloads.length;
    // The whole file, read in the worker and drawn from all its samples.
    const t1 = performance.now();
    await page.getByRole('button', { name: /Draw every sample/ }).click();
    await page
      .getByTestId('curve-sampling')
      .filter({ hasText: 'Drawn from all' })
      .waitFor({ timeout: 300_000 });
    const everyMs = performance.now() - t1;
    await page.waitForTimeout(1_000);
    const onEvery = await longTasks();
    return {
      drawnMs,
      everyMs,
      longestOnLoad: Math.max(0, ...onLoad),
      longestOnEvery: Math.max(0, ...onEvery),
      tasksOnLoad: onLoad.length,
      loadBytes,
      rawOnLoad,
    };
  });
}

/**
 * Opens the overlay page (inThrottledChromium), waits until its curves are drawn, and counts the
 * bytes it fetched (decoded and as sent), the whole raw files among them and the long tasks.
 */
async function overlayInBrowser(url: string, rate: number) {
  return inThrottledChromium(rate, async (page) => {
    let rawDownloads = 0;
    page.on('response', (res) => {
      if (WHOLE_RAW_FILE.test(new URL(res.url()).pathname)) rawDownloads++;
    });
    const t0 = performance.now();
    await page.goto(url, { waitUntil: 'load' });
    await page
      .locator('[data-testid="overlay-chart"] svg[role="img"]')
      .first()
      .waitFor({ timeout: 600_000 });
    const drawnMs = performance.now() - t0;
    await page.waitForTimeout(1_000);
    const tasks = await page.evaluate(
      () => (window as unknown as { longTasks: number[] }).longTasks,
    );
    // What the page and its requests carried, from the browser's own resource timing (the
    // protocol's copy of a response body is dropped past a few MB, so it cannot be summed).
    const { bytes, wire } = await page.evaluate(() => {
      const entries = [
        ...performance.getEntriesByType('navigation'),
        ...performance.getEntriesByType('resource'),
      ] as PerformanceResourceTiming[];
      return {
        bytes: entries.reduce((a, e) => a + e.decodedBodySize, 0),
        wire: entries.reduce((a, e) => a + e.transferSize, 0),
      };
    });
    return {
      drawnMs,
      bytes,
      wire,
      rawDownloads,
      longest: Math.max(0, ...tasks),
      longTasks: tasks.length,
    };
  });
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
