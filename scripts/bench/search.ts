// Benchmark (not a test): GET /api/v1/records with typical filters on 100,000 records (or
// --records N), with autocannon on loopback: held answers at 32 connections, searches never asked
// before at 4 (answered by the in-memory index), the same cold searches through the SQL path (a
// second server with SEARCH_INDEX=off, unless --no-sql-path), and the typical searches' SQL
// straight through pg. Ends with one JSON line of figures.
// Usage: npm run bench:search [-- --records 100000 --seconds 10 --connections 32 --no-sql-path]
import autocannon from 'autocannon';
import { CompiledQuery, Kysely, PostgresDialect, type LogEvent } from 'kysely';
import pg from 'pg';
import { parseArgs } from 'node:util';
import { loadDemo } from '../../seed/demo.ts';
import { percentile, report, startBenchStack } from './stack.ts';
import type { Database } from '#lib/server/db/schema.ts';
import { createDb } from '#lib/server/db/index.ts';
import { SearchIndex } from '#lib/server/search-index.ts';

const { values } = parseArgs({
  options: {
    records: { type: 'string', default: '100000' },
    seconds: { type: 'string', default: '10' },
    connections: { type: 'string', default: '32' },
    'no-sql-path': { type: 'boolean', default: false },
  },
});
const TARGET = { p95: 25, rps: 800 };
// Searches never asked before, 4 connections: p95 at 100,000 records and at 1,000,000, throughput at 100,000.
const COLD = { p95: 25, p95Million: 60, rps: 200 };
const WANT = Number(values.records);

// What a formulator typically asks: a salt/solvent on an electrode, one method, a scale, a page.
const QUERIES = [
  '/api/v1/records?electrode=gc&method=cv-window-opening&scale=SHE&limit=50',
  '/api/v1/records?component=PC&electrode=pt&electrode=gc&sort=-anodic&limit=50',
  '/api/v1/records?component=water&scale=RHE&limit=25',
  '/api/v1/records?evidence=confirmed&evidence=recomputed&scanRateMax=10&limit=50',
  '/api/v1/records?q=acetonitrile&limit=50',
];

/**
 * Clones the published demo records until the collection holds `want` records, in one
 * transaction. Row triggers are off while it copies (a million upserts would take many minutes):
 * each clone's record_search row is the source's row under the clone's id and handle, and the
 * search generation moves once at the end, as a committed change moves it.
 */
async function grow(adminUrl: string, want: number) {
  const c = new pg.Client({ connectionString: adminUrl });
  await c.connect();
  try {
    const have = Number((await c.query('SELECT count(*) FROM records')).rows[0].count);
    if (have >= want) return have;
    const columns = async (table: string, except: string[]) =>
      (
        await c.query(
          `SELECT column_name FROM information_schema.columns WHERE table_name = $1 AND table_schema = 'public'
            AND NOT (column_name = ANY($2)) ORDER BY ordinal_position`,
          [table, except],
        )
      ).rows.map((r) => `"${r.column_name}"`);
    const versionCols = await columns('record_versions', [
      'id',
      'record_id',
      'version',
      'raw_file_ids',
      'analysis_ids',
    ]);
    const searchCols = await columns('record_search', ['record_id', 'handle', 'version']);
    const published = Number(
      (await c.query(`SELECT count(*) FROM records WHERE status = 'published'`)).rows[0].count,
    );
    const copies = Math.ceil((want - have) / published);
    await c.query('BEGIN');
    await c.query(`SET LOCAL session_replication_role = replica`);
    await c.query(`CREATE TEMP TABLE clone ON COMMIT DROP AS
                     SELECT gen_random_uuid() AS new_id, next_record_handle() AS handle, r.id AS src_id
                       FROM (SELECT r.id FROM records r CROSS JOIN generate_series(1, ${copies}) g
                              WHERE r.status = 'published' LIMIT ${want - have}) r`);
    await c.query(`INSERT INTO records (id, handle, status, owner_id, lab_id, current_version, published_version, created_at, updated_at, published_at)
                   SELECT c.new_id, c.handle, r.status, r.owner_id, r.lab_id, 1,
                          CASE WHEN r.published_version IS NOT NULL THEN 1 END, r.created_at, r.updated_at, r.published_at
                     FROM clone c JOIN records r ON r.id = c.src_id`);
    await c.query(`INSERT INTO record_versions (record_id, version, ${versionCols.join(', ')})
                   SELECT c.new_id, 1, ${versionCols.map((x) => `v.${x}`).join(', ')}
                     FROM clone c JOIN records r ON r.id = c.src_id JOIN record_versions v ON v.record_id = r.id AND v.version = r.current_version`);
    await c.query(`INSERT INTO record_search (record_id, handle, version, ${searchCols.join(', ')})
                   SELECT c.new_id, c.handle, 1, ${searchCols.map((x) => `s.${x}`).join(', ')}
                     FROM clone c JOIN record_search s ON s.record_id = c.src_id`);
    await c.query(`UPDATE search_generation SET n = n + 1, xact = txid_current()`);
    await c.query('COMMIT');
    await c.query('VACUUM ANALYZE');
    return Number((await c.query('SELECT count(*) FROM records')).rows[0].count);
  } finally {
    await c.end();
  }
}

/** The SQL one API request runs, captured from Kysely's log while the service answers it. */
async function capturedSql(appUrl: string, path: string): Promise<CompiledQuery[]> {
  const captured: CompiledQuery[] = [];
  const pool = new pg.Pool({ connectionString: appUrl, max: 2 });
  const db = new Kysely<Database>({
    dialect: new PostgresDialect({ pool }),
    log: (e: LogEvent) => void (e.level === 'query' && captured.push(e.query)),
  });
  const { searchRecordList, recordQuerySchema } = await import('#lib/server/record-search.ts');
  const url = new URL(path, 'http://x');
  const q = recordQuerySchema.parse(
    Object.fromEntries(
      [...new Set(url.searchParams.keys())].map((k) => [
        k,
        url.searchParams.getAll(k).length > 1
          ? url.searchParams.getAll(k)
          : url.searchParams.get(k),
      ]),
    ),
  );
  await searchRecordList(db, { kind: 'anonymous' }, q);
  await db.destroy();
  return captured;
}

/** Runs the captured statements with `connections` concurrent loops for `seconds`. */
async function replay(
  appUrl: string,
  statements: CompiledQuery[][],
  connections: number,
  seconds: number,
) {
  const pool = new pg.Pool({ connectionString: appUrl, max: connections });
  const times: number[] = [];
  const end = Date.now() + seconds * 1000;
  let n = 0;
  await Promise.all(
    Array.from({ length: connections }, async () => {
      while (Date.now() < end) {
        const set = statements[n++ % statements.length]!;
        const t0 = performance.now();
        for (const s of set) await pool.query(s.sql, s.parameters as unknown[]);
        times.push(performance.now() - t0);
      }
    }),
  );
  await pool.end();
  return { times, rps: times.length / seconds };
}

interface Load {
  connections: number;
  seconds: number;
  headers?: Record<string, string>;
  /** Each request's path; the typical queries in turn when absent. */
  next?: () => string;
}

/** autocannon against the API; exact percentiles from every response's own time. */
async function load(url: string, o: Load) {
  const times: number[] = [];
  const requests: autocannon.Request[] = o.next
    ? [{ method: 'GET', headers: o.headers, setupRequest: (req) => ({ ...req, path: o.next!() }) }]
    : QUERIES.map((path) => ({ method: 'GET', path, headers: o.headers }));
  const result = await new Promise<autocannon.Result>((resolve, reject) => {
    const run = autocannon(
      { url, connections: o.connections, duration: o.seconds, requests },
      (err, r) => (err ? reject(err) : resolve(r)),
    );
    run.on('response', (_client, _status, _bytes, ms) => times.push(ms));
  });
  return {
    total: result.requests.total,
    rps: result.requests.total / o.seconds,
    p50: percentile(times, 50),
    p95: percentile(times, 95),
    p99: percentile(times, 99),
    bytes: result.throughput.total / Math.max(1, result.requests.total),
    failed: result.non2xx + result.errors + result.timeouts,
  };
}

function reportLoad(label: string, r: Awaited<ReturnType<typeof load>>, targets: boolean) {
  console.log(`\n${label}: ${r.total} requests, ${(r.bytes / 1024).toFixed(1)} kB per answer`);
  report('p50', `${r.p50.toFixed(1)} ms`, '—', true);
  report(
    'p95',
    `${r.p95.toFixed(1)} ms`,
    targets ? `≤ ${TARGET.p95} ms` : '—',
    !targets || r.p95 <= TARGET.p95,
  );
  report('p99', `${r.p99.toFixed(1)} ms`, '—', true);
  report(
    'throughput',
    `${r.rps.toFixed(0)} req/s`,
    targets ? `≥ ${TARGET.rps} req/s` : '—',
    !targets || r.rps >= TARGET.rps,
  );
  report('non-2xx, errors, timeouts', String(r.failed), '0', r.failed === 0);
}

async function main() {
  const stack = await startBenchStack('edgewise_bench');
  try {
    const demo = await loadDemo({ ...stack.env });
    if (demo.loaded)
      console.log(`demo scenario loaded: ${demo.records} records, ${demo.files} raw files`);
    const grown = performance.now();
    const total = await grow(stack.adminUrl, WANT);
    console.log(
      `collection: ${total} records (made ready in ${((performance.now() - grown) / 1000).toFixed(0)} s)`,
    );

    // The index the server builds, built here too from the same database to weigh it.
    const indexDb = createDb(stack.env.DATABASE_URL!, 2);
    const heapBefore = process.memoryUsage();
    const built = performance.now();
    const index = await SearchIndex.build(indexDb);
    const buildS = (performance.now() - built) / 1000;
    const heapAfter = process.memoryUsage();
    const indexMB = index.bytes() / 1e6;
    console.log(
      `\nsearch index: ${index.size} records, built in ${buildS.toFixed(1)} s, ${indexMB.toFixed(1)} MB held (typed arrays and bitmaps; heap and native growth while building ${((heapAfter.heapUsed + heapAfter.external + heapAfter.arrayBuffers - heapBefore.heapUsed - heapBefore.external - heapBefore.arrayBuffers) / 1e6).toFixed(1)} MB)`,
    );
    report('index memory', `${indexMB.toFixed(1)} MB`, '≤ 150 MB at 10⁶ records', indexMB <= 150);
    await indexDb.destroy();

    // The first answers build the server's own index (the first search waits for it).
    for (const q of QUERIES) {
      const t0 = performance.now();
      const r = await fetch(stack.url + q, { headers: { 'accept-encoding': 'identity' } });
      if (!r.ok) throw new Error(`${q}: ${r.status} ${await r.text()}`);
      const body = await r.json();
      console.log(
        `  ${q} → ${body.total} matches, first answer ${(performance.now() - t0).toFixed(0)} ms`,
      );
    }
    const connections = Number(values.connections);
    const seconds = Number(values.seconds);

    // The typical searches again and again, as many readers browsing the same collection ask them:
    // answered from the per-generation answer cache after the first time.
    const typical = await load(stack.url, {
      connections,
      seconds,
      headers: { 'accept-encoding': 'identity' },
    });
    reportLoad(
      `Typical searches, ${connections} connections, ${seconds} s, uncompressed (as curl or a script without compression asks)`,
      typical,
      true,
    );
    reportLoad(
      `The same, gzip accepted (as browsers and most HTTP libraries ask)`,
      await load(stack.url, { connections, seconds, headers: { 'accept-encoding': 'gzip' } }),
      true,
    );

    // Searches nobody asked before: a different scan-rate bound and page each time, so neither
    // the answer nor the page is held. Fewer connections, as a first visit is rarer.
    const distinctPaths = () => {
      let n = 0;
      return () =>
        `/api/v1/records?electrode=gc&scanRateMax=${1000 - (n++ % 900) / 10}&offset=${(n % 20) * 50}&limit=50`;
    };
    const cold = await load(stack.url, {
      connections: 4,
      seconds,
      headers: { 'accept-encoding': 'identity' },
      next: distinctPaths(),
    });
    const million = total >= 1_000_000;
    console.log(
      `\nSearches not asked before (nothing held), 4 connections: ${cold.total} requests`,
    );
    report('p50', `${cold.p50.toFixed(1)} ms`, '—', true);
    report(
      'p95',
      `${cold.p95.toFixed(1)} ms`,
      million ? `≤ ${COLD.p95Million} ms at 10⁶` : `≤ ${COLD.p95} ms at 10⁵`,
      cold.p95 <= (million ? COLD.p95Million : COLD.p95),
    );
    report(
      'throughput',
      `${cold.rps.toFixed(0)} req/s`,
      million ? '—' : `≥ ${COLD.rps} req/s at 10⁵`,
      million || cold.rps >= COLD.rps,
    );
    report('non-2xx, errors, timeouts', String(cold.failed), '0', cold.failed === 0);

    let sqlCold: Awaited<ReturnType<typeof load>> | null = null;
    if (!values['no-sql-path']) {
      // The same cold searches on a second server that answers them through SQL alone.
      const sqlServer = await stack.another({ SEARCH_INDEX: 'off' });
      try {
        sqlCold = await load(sqlServer.url, {
          connections: 4,
          seconds,
          headers: { 'accept-encoding': 'identity' },
          next: distinctPaths(),
        });
      } finally {
        sqlServer.stop();
      }
      reportLoad(
        'The same searches through the SQL path (SEARCH_INDEX=off), 4 connections',
        sqlCold,
        false,
      );
      console.log(
        `ratio index / SQL path for searches not asked before: p95 ×${(cold.p95 / sqlCold.p95).toFixed(3)}, throughput ×${(cold.rps / sqlCold.rps).toFixed(1)}`,
      );
    }

    // The SQL path's statements, captured in this process with the index off.
    Object.assign(process.env, stack.env, { SEARCH_INDEX: 'off' });
    const sets = [];
    for (const q of QUERIES) sets.push(await capturedSql(stack.env.DATABASE_URL!, q));
    const direct = await replay(stack.env.DATABASE_URL!, sets, connections, seconds);
    console.log(
      `\nThe typical searches' SQL as a first (uncached) request runs it — page, total and facets — straight through pg (${sets.reduce((s, x) => s + x.length, 0) / sets.length} statements per request), ${connections} loops, ${seconds} s:`,
    );
    report('pg p50', `${percentile(direct.times, 50).toFixed(1)} ms`, '—', true);
    report('pg p95', `${percentile(direct.times, 95).toFixed(1)} ms`, '—', true);
    report('pg throughput', `${direct.rps.toFixed(0)} req/s`, '—', true);
    console.log(
      `ratio API (answers held per generation) / uncached SQL: p50 ×${(typical.p50 / percentile(direct.times, 50)).toFixed(3)}, throughput ×${(typical.rps / direct.rps).toFixed(1)}`,
    );
    const round = (x: number) => Math.round(x * 10) / 10;
    console.log(
      JSON.stringify({
        records: total,
        coldP95Ms: round(cold.p95),
        coldRps: round(cold.rps),
        cachedP95Ms: round(typical.p95),
        cachedRps: round(typical.rps),
        indexMB: round(indexMB),
        indexBuildS: round(buildS),
        ...(sqlCold ? { sqlColdP95Ms: round(sqlCold.p95), sqlColdRps: round(sqlCold.rps) } : {}),
      }),
    );
  } finally {
    await stack.stop();
  }
}

main().then(
  () => process.exit(0),
  (err) => {
    console.error(err);
    process.exit(1);
  },
);
