import { spawnSync } from 'node:child_process';
import { rmSync } from 'node:fs';
import path from 'node:path';
import { sql } from 'kysely';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { dataDir } from '../../scripts/lib/paths.ts';
import { ensureCluster, pgBinDir } from '../../scripts/lib/postgres.ts';
import { freePort } from '../../scripts/lib/services.ts';
import { appDb, closeAppDb } from '../auth-helpers.ts';
import { makeRecord, tag } from '../support/records.ts';
import { createDb, createReplicaReads, type Db, type ReplicaReads } from '#lib/server/db/index.ts';
import { recordQuerySchema, searchRecordList } from '#lib/server/record-search.ts';
import { ANONYMOUS } from '#lib/shared/principal.ts';

// A real streaming replica of the project's own cluster on loopback (pg_basebackup, hot standby):
// searches read through it, it is killed, and searches go on against the primary.

const asRoot = process.getuid?.() === 0;
const dir = path.join(dataDir, `replica-${process.pid}`);
const token = tag('repl');

function pgRun(bin: string, args: string[], env: Record<string, string> = {}) {
  const exe = path.join(pgBinDir(), bin);
  const r = asRoot
    ? spawnSync(
        'runuser',
        [
          '-u',
          'postgres',
          '--',
          'env',
          ...Object.entries(env).map(([k, v]) => `${k}=${v}`),
          exe,
          ...args,
        ],
        { encoding: 'utf8' },
      )
    : spawnSync(exe, args, { encoding: 'utf8', env: { ...process.env, ...env } });
  if (r.status !== 0) throw new Error(`${bin} failed:\n${r.stdout}\n${r.stderr}`);
  return r.stdout;
}

let reads: ReplicaReads;
let direct: Db;
let replicaAdmin: string;
let primaryUrl: string;
let replicaUrl: string;
let handle: string;

beforeAll(async () => {
  const info = ensureCluster();
  const admin = new URL(info.adminUrl('postgres'));
  const port = await freePort();
  rmSync(dir, { recursive: true, force: true });
  if (asRoot) spawnSync('install', ['-d', '-o', 'postgres', '-g', 'postgres', '-m', '700', dir]);
  pgRun(
    'pg_basebackup',
    [
      '-h',
      '127.0.0.1',
      '-p',
      String(info.port),
      '-U',
      'postgres',
      '-D',
      dir,
      '-R',
      '-X',
      'stream',
      '-c',
      'fast',
    ],
    {
      PGPASSWORD: decodeURIComponent(admin.password),
    },
  );
  pgRun('pg_ctl', [
    'start',
    '-w',
    '-t',
    '120',
    '-D',
    dir,
    '-l',
    path.join(dir, 'replica.log'),
    '-o',
    `-c listen_addresses=127.0.0.1 -p ${port} -c unix_socket_directories=${dir} -c hot_standby=on -c max_connections=200`,
  ]);
  primaryUrl = process.env.DATABASE_URL!;
  replicaUrl = Object.assign(new URL(primaryUrl), { port: String(port) }).toString();
  replicaAdmin = Object.assign(new URL(admin), { port: String(port) }).toString();
  direct = createDb(replicaUrl, 2);
  reads = createReplicaReads(appDb(), primaryUrl, [replicaUrl], 4);
  handle = (await makeRecord({ status: 'published', over: { title: `replicated ${token}` } }))
    .record.handle;
  // The replica replays the primary's changes: wait until the new record is there.
  const deadline = Date.now() + 60_000;
  for (;;) {
    const r = await sql<{
      n: string;
    }>`SELECT count(*) AS n FROM record_search WHERE handle = ${handle}`.execute(direct);
    if (r.rows[0]!.n === '1') break;
    if (Date.now() > deadline)
      throw new Error('the replica did not replay the new record within 60 s');
    await new Promise((r) => setTimeout(r, 200));
  }
}, 300_000);

afterAll(async () => {
  spawnSync(
    asRoot ? 'runuser' : path.join(pgBinDir(), 'pg_ctl'),
    asRoot
      ? [
          '-u',
          'postgres',
          '--',
          path.join(pgBinDir(), 'pg_ctl'),
          'stop',
          '-m',
          'immediate',
          '-D',
          dir,
        ]
      : ['stop', '-m', 'immediate', '-D', dir],
  );
  await direct?.destroy();
  await reads?.destroy();
  rmSync(dir, { recursive: true, force: true });
  await closeAppDb();
});

/** Pauses or resumes the replica's replay of the primary's changes (a superuser's function). */
async function replay(action: 'pause' | 'resume') {
  const c = createDb(replicaAdmin, 1);
  try {
    await sql.raw(`SELECT pg_wal_replay_${action}()`).execute(c);
  } finally {
    await c.destroy();
  }
}

const statusOf = async (d: Db) =>
  (await sql<{ status: string }>`SELECT status FROM records WHERE handle = ${handle}`.execute(d))
    .rows[0]!.status;

const inRecovery = async (d: Db) =>
  (await sql<{ r: boolean }>`SELECT pg_is_in_recovery() AS r`.execute(d)).rows[0]!.r;

describe('reads on a streaming replica', () => {
  it('never holds what a replica further behind read under a newer generation', async () => {
    // Two replicas a change apart: the streaming one with its replay paused, and the primary
    // standing for one that keeps up. Each request reads one of them; answers are held per
    // generation, so rows read on the one behind must never be held under the newer generation.
    const pair = createReplicaReads(appDb(), primaryUrl, [replicaUrl, primaryUrl], 4);
    const search = (d: Db, limit: number) =>
      searchRecordList(d, ANONYMOUS, recordQuerySchema.parse({ q: token, limit: String(limit) }));
    // Every statement of one read instance (one request) goes to the same server, and the
    // instances take turns.
    const seen = new Set<boolean>();
    for (let i = 0; i < 4; i++) {
      const d = pair.next();
      const answers = await Promise.all([1, 2, 3, 4].map(() => inRecovery(d)));
      expect(new Set(answers).size).toBe(1);
      seen.add(answers[0]!);
    }
    expect([...seen].sort()).toEqual([false, true]);
    // Asked again for the same request (a held page reads the generation, then the page reads
    // the record), the same instance; another request takes the next.
    const request = new Request('http://localhost/windows');
    expect(pair.forRequest(request)).toBe(pair.forRequest(request));
    expect(pair.forRequest(new Request('http://localhost/windows'))).not.toBe(
      pair.forRequest(request),
    );
    const before = await statusOf(direct);
    const after = 'flagged';
    expect(before).toBe('published');
    await replay('pause');
    try {
      // The record flagged, its search row with it, in one transaction as the service writes
      // them: the collection's generation moves.
      await appDb()
        .transaction()
        .execute(async (trx) => {
          await sql`UPDATE records SET status = ${after} WHERE handle = ${handle}`.execute(trx);
          await sql`UPDATE record_search SET status = ${after} WHERE handle = ${handle}`.execute(
            trx,
          );
        });
      for (let i = 0; i < 16; i++) {
        const r = await search(pair.next(), 20 + i);
        expect([before, after]).toContain(r.items[0]?.status);
      }
    } finally {
      await replay('resume');
    }
    const deadline = Date.now() + 60_000;
    while ((await statusOf(direct)) !== after) {
      if (Date.now() > deadline) throw new Error('the replica did not replay the change in 60 s');
      await new Promise((r) => setTimeout(r, 200));
    }
    // Both sides are at the newer generation now: every answer shows the change, the same
    // searches as above included (what they held under the newer generation is served again).
    for (let i = 0; i < 16; i++)
      expect((await search(pair.next(), 20 + i)).items.map((x) => x.status)).toEqual([after]);
    await pair.destroy();
  });

  it('searches through the replica, then through the primary once the replica is killed', async () => {
    expect(await inRecovery(direct)).toBe(true);
    expect(await inRecovery(reads.next())).toBe(true);
    const search = (limit: number) =>
      searchRecordList(
        reads.next(),
        ANONYMOUS,
        recordQuerySchema.parse({ q: token, limit: String(limit) }),
      );
    const before = await search(10);
    expect(before.total).toBe(1);
    expect(before.items.map((i) => i.handle)).toEqual([handle]);

    pgRun('pg_ctl', ['stop', '-m', 'immediate', '-D', dir]);
    // Every search after the crash is answered (by the primary), none fails.
    for (let i = 0; i < 20; i++) {
      const r = await search(11 + i);
      expect(r.total).toBe(1);
      expect(r.items.map((x) => x.handle)).toEqual([handle]);
    }
    expect(await inRecovery(reads.next())).toBe(false);
  });
});
