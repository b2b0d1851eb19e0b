import { spawnSync, type ChildProcess } from 'node:child_process';
import { createHash, randomBytes } from 'node:crypto';
import { mkdirSync, rmSync } from 'node:fs';
import { createServer, type Socket } from 'node:net';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, inject } from 'vitest';
import { startS3Fake, type S3Fake } from '../../docker-free-s3-fake/s3-fake.ts';
import { startMailFake, type MailFake } from '../../scripts/lib/mail-fake.ts';
import { dataDir, projectRoot } from '../../scripts/lib/paths.ts';
import { freePort, startApp } from '../../scripts/lib/services.ts';
import { createDb, type Db } from '#lib/server/db/index.ts';
import { cvWindowOpeningSamples, formatExport } from '#lib/analysis/index.ts';
import { readCapturedMail } from '#lib/server/mail-capture.ts';
import { content } from '../support/records.ts';

// Faults, on a stack of this file's own (a PostgreSQL cluster in its own folder, both fakes, a
// server from the same build), so stopping and killing things disturbs no other test:
// object storage stopped at each step of an upload and frozen (silent), a PUT to the upload URL
// after completion, PostgreSQL stopped and killed during concurrent submissions that clients
// repeat with their Idempotency-Keys, the mail server down while curators decide. Each part prints what it tried and
// what survived.

const work = path.join(dataDir, `faults-${process.pid}`);
const pgEnv = { ...process.env, EDGEWISE_DATA_DIR: path.join(work, 'data'), EDGEWISE_PG_PORT: '' };
const tsx = path.join(projectRoot, 'node_modules', '.bin', 'tsx');
const pgCtl = (cmd: string) => {
  const r = spawnSync(tsx, [path.join(projectRoot, 'scripts', 'pg.ts'), cmd, 'edgewise'], {
    env: pgEnv,
    encoding: 'utf8',
  });
  if (r.status !== 0) throw new Error(`pg ${cmd}: ${r.stderr}`);
  return r.stdout;
};

let s3: S3Fake;
let s3Port: number;
let mail: MailFake;
let mailPort: number;
let app: ChildProcess;
let base: string;
let admin: Db;
const tokens: Record<'contributor' | 'curator', string> = { contributor: '', curator: '' };

async function call(
  who: keyof typeof tokens,
  p: string,
  method = 'GET',
  body?: unknown,
): Promise<Response> {
  return fetch(base + p, {
    method,
    headers: {
      authorization: `Bearer ${tokens[who]}`,
      ...(body === undefined ? {} : { 'content-type': 'application/json' }),
    },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
}

async function waitHealthy(timeoutMs = 30_000) {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const r = await fetch(`${base}/api/health`).catch(() => null);
    if (r?.ok) return;
    if (Date.now() > deadline) throw new Error(`not healthy: ${r?.status} ${await r?.text()}`);
    await new Promise((res) => setTimeout(res, 200));
  }
}

beforeAll(async () => {
  mkdirSync(work, { recursive: true });
  // The cluster, its database and migrations, through the project's own migrate command.
  const m = spawnSync(tsx, [path.join(projectRoot, 'scripts', 'migrate.ts')], {
    env: pgEnv,
    encoding: 'utf8',
  });
  if (m.status !== 0) throw new Error(`migrate: ${m.stderr}`);
  const urls = JSON.parse(pgCtl('urls')) as { adminUrl: string; appUrl: string; port: number };
  // Restarts after a crash must come back on the same port (the server's DATABASE_URL names it),
  // not move on while the old one is still held: starting fails until it is free, and is retried.
  pgEnv.EDGEWISE_PG_PORT = String(urls.port);
  const { loadVocabularySeed } = await import('../../seed/load-vocabulary.ts');
  await loadVocabularySeed(urls.appUrl);
  admin = createDb(urls.adminUrl, 2);

  s3Port = await freePort();
  mailPort = await freePort();
  s3 = await startS3Fake({
    port: s3Port,
    directory: path.join(work, 's3'),
    bucket: 'edgewise-raw',
  });
  mail = await startMailFake({ port: mailPort, directory: path.join(work, 'mail') });
  const port = await freePort();
  base = `http://127.0.0.1:${port}`;
  const env = {
    ...inject('appEnv'),
    PUBLIC_ORIGIN: base,
    DATABASE_URL: urls.appUrl,
    S3_ENDPOINT: s3.endpoint,
    SMTP_PORT: String(mailPort),
    MAIL_CAPTURE_DIR: mail.directory,
  };
  app = await startApp(inject('outDir'), env, port, true);

  // A contributor and a curator with API tokens, made in this cluster.
  const { createToken } = await import('#lib/server/api-tokens.ts');
  for (const role of ['contributor', 'curator'] as const) {
    const u = await admin
      .insertInto('User')
      .values({
        email: `${role}-${randomBytes(3).toString('hex')}@faults.test`,
        name: `Fault ${role}`,
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
    tokens[role] = (
      await createToken(admin, principal, {
        name: 'faults',
        scopes: ['read', 'write'],
        expiresInDays: 1,
      })
    ).token;
  }
}, 180_000);

afterAll(async () => {
  app?.kill('SIGTERM');
  await s3?.close().catch(() => {});
  await mail?.close().catch(() => {});
  await admin?.destroy();
  pgCtl('stop');
  rmSync(work, { recursive: true, force: true });
});

const restartS3 = async () => {
  s3 = await startS3Fake({
    port: s3Port,
    directory: path.join(work, 's3'),
    bucket: 'edgewise-raw',
  });
};

describe('object storage stopped at each step of an upload', () => {
  it(
    'never attaches a missing or wrong file; complete is idempotent; 503 with Retry-After while down',
    { timeout: 120_000 },
    async () => {
      const tried: string[] = [];
      const rec = await (
        await call('contributor', '/api/v1/records', 'POST', { content: content() })
      ).json();
      const text = formatExport(cvWindowOpeningSamples({ sampleIntervalS: 0.5 }));
      const bytes = Buffer.from(text);
      const declare = async () => {
        const r = await call('contributor', '/api/v1/uploads', 'POST', {
          record: rec.handle,
          name: 'cv.csv',
          size: bytes.byteLength,
          sha256: createHash('sha256').update(bytes).digest('hex'),
          mediaType: 'text/csv',
        });
        expect(r.status).toBe(201);
        return r.json();
      };

      // 1. Storage down while declaring: presigning needs no storage round trip.
      await s3.close();
      const ticket = await declare();
      tried.push('declare with storage down → 201');

      // 2. Storage down during the PUT: the browser's upload fails; after a restart it succeeds.
      const failedPut = await fetch(ticket.url, {
        method: 'PUT',
        body: bytes,
        headers: ticket.headers,
      }).catch((e) => e as Error);
      expect(failedPut).toBeInstanceOf(Error);
      tried.push('PUT with storage down → connection refused');

      // 3. Complete with storage down: 503 + Retry-After, nothing attached.
      const down = await call('contributor', `/api/v1/uploads/${ticket.id}/complete`, 'POST');
      expect(down.status).toBe(503);
      expect(down.headers.get('retry-after')).toBeTruthy();
      expect(
        (await (await call('contributor', `/api/v1/records/${rec.handle}`)).json()).rawFiles,
      ).toEqual([]);
      tried.push('complete with storage down → 503, no file attached');

      // 4. Storage back, but the object never arrived: refused, still nothing attached.
      await restartS3();
      const missing = await call('contributor', `/api/v1/uploads/${ticket.id}/complete`, 'POST');
      expect(missing.status).toBe(409);
      tried.push('complete before the object arrived → 409');

      // 5. The PUT after the restart, then complete twice: the same file, attached once.
      expect(
        (await fetch(ticket.url, { method: 'PUT', body: bytes, headers: ticket.headers })).status,
      ).toBe(200);
      const done = await call('contributor', `/api/v1/uploads/${ticket.id}/complete`, 'POST');
      expect(done.status).toBe(200);
      const first = await done.json();
      const again = await (
        await call('contributor', `/api/v1/uploads/${ticket.id}/complete`, 'POST')
      ).json();
      expect(again.rawFile.id).toBe(first.rawFile.id);
      tried.push('PUT and complete after restart → attached; complete again → same file');

      // 6. A flipped byte: the server's SHA-256 check refuses it.
      const flipped = Buffer.from(bytes);
      flipped.writeUInt8(flipped.readUInt8(flipped.length - 3) ^ 0x01, flipped.length - 3);
      const t2 = await declare();
      await fetch(t2.url, { method: 'PUT', body: flipped, headers: t2.headers });
      const bad = await call('contributor', `/api/v1/uploads/${t2.id}/complete`, 'POST');
      expect(bad.status).toBe(422);
      tried.push('one byte flipped in transit → 422');

      const files = (await (await call('contributor', `/api/v1/records/${rec.handle}`)).json())
        .rawFiles;
      expect(files).toHaveLength(1);
      expect(files[0].sha256).toBe(createHash('sha256').update(bytes).digest('hex'));
      console.log(
        `storage faults:\n  ${tried.join('\n  ')}\n  survived: 1 verified file attached, 0 missing or wrong`,
      );
    },
  );
});

/**
 * A POST with an Idempotency-Key, repeated as a careful client would: after a dropped connection,
 * a 5xx, or a 409 that asks to wait (Retry-After), until an answer or the deadline.
 */
async function persist(
  path: string,
  body: unknown,
  key: string,
  deadline: number,
): Promise<{
  status: number | 'network';
  json: { handle: string; version: number } | null;
  tries: number;
  seen: string[];
}> {
  const seen: string[] = [];
  for (let tries = 1; ; tries++) {
    const r = await fetch(base + path, {
      method: 'POST',
      headers: {
        authorization: `Bearer ${tokens.contributor}`,
        'content-type': 'application/json',
        'idempotency-key': key,
      },
      body: JSON.stringify(body),
    }).catch(() => null);
    const retryAfter = r?.headers.get('retry-after');
    seen.push(r ? `${r.status}${retryAfter ? '+RA' : ''}` : 'network');
    const again = !r || r.status >= 500 || (r.status === 409 && retryAfter);
    if (!again) return { status: r.status, json: await r.json(), tries, seen };
    await r?.body?.cancel();
    if (Date.now() > deadline) return { status: r?.status ?? 'network', json: null, tries, seen };
    await new Promise((res) => setTimeout(res, 250 + Math.random() * 250));
  }
}

/** Starts the cluster again; after SIGKILL the old backends may need a moment to let go. */
async function startAgain() {
  for (let i = 0; ; i++) {
    try {
      pgCtl('start');
      return;
    } catch (err) {
      if (i > 40) throw err;
      await new Promise((r) => setTimeout(r, 500));
    }
  }
}

describe.each([
  { how: 'stopped immediately (pg_ctl stop -m immediate)', command: 'kill' },
  { how: 'killed (SIGKILL to the postmaster)', command: 'crash' },
])('PostgreSQL $how during 20 concurrent submissions', ({ how, command }) => {
  it(
    'the process lives, answers 503 with Retry-After meanwhile, loses no acknowledged submission, and repeats with their keys make no duplicate',
    { timeout: 240_000 },
    async () => {
      const N = 20;
      const run = randomBytes(3).toString('hex');
      const deadline = Date.now() + 120_000;
      const clients = Array.from({ length: N }, (_, i) =>
        (async () => {
          await new Promise((r) => setTimeout(r, i * 30));
          const title = `Fault ${command} ${run} ${i}`;
          const created = await persist(
            '/api/v1/records',
            { content: content({ title }) },
            `create-${run}-${i}`,
            deadline,
          );
          const submitted =
            created.status === 201
              ? await persist(
                  `/api/v1/records/${created.json!.handle}/transitions`,
                  { action: 'submit', version: created.json!.version },
                  `submit-${run}-${i}`,
                  deadline,
                )
              : null;
          return { i, title, created, submitted };
        })(),
      );
      await new Promise((r) => setTimeout(r, (N / 2) * 30));
      pgCtl(command);
      // While the database is away the server is up and says so.
      const health = await fetch(`${base}/api/health`);
      const healthBody = await health.json();
      await new Promise((r) => setTimeout(r, 1500));
      await startAgain();
      const results = await Promise.all(clients);
      await waitHealthy();

      expect(app.exitCode, 'the server process is still running').toBeNull();
      expect(app.signalCode).toBeNull();
      expect(health.status).toBe(503);
      expect(healthBody.parts.database).toBe('down');
      const seen = results.flatMap((r) => [...r.created.seen, ...(r.submitted?.seen ?? [])]);
      // Every refusal during the outage was a 503 with Retry-After (or a 409 asking to wait).
      expect(seen.filter((s) => /^5/.test(s) && s !== '503+RA')).toEqual([]);

      let duplicates = 0;
      let lost = 0;
      for (const r of results) {
        expect(r.created.status, `creation ${r.i}: ${r.created.seen.join(' ')}`).toBe(201);
        expect(r.submitted?.status, `submission ${r.i}: ${r.submitted?.seen.join(' ')}`).toBe(200);
        const rows = await admin
          .selectFrom('record_versions')
          .innerJoin('records', 'records.id', 'record_versions.record_id')
          .select(['records.handle', 'records.status'])
          .where('record_versions.title', '=', r.title)
          .where('record_versions.version', '=', 1)
          .execute();
        duplicates += Math.max(0, rows.length - 1);
        const mine = rows.find((x) => x.handle === r.created.json!.handle);
        if (!mine || mine.status !== 'submitted') lost++;
        const events = await admin
          .selectFrom('audit_events')
          .select('action')
          .where('subject_id', '=', r.created.json!.handle)
          .where('action', 'in', ['record.create', 'record.submit'])
          .execute();
        expect(events.map((e) => e.action).sort()).toEqual(['record.create', 'record.submit']);
      }
      expect({ duplicates, lost }).toEqual({ duplicates: 0, lost: 0 });
      // The same server takes new work without a restart.
      expect(
        (
          await call('contributor', '/api/v1/records', 'POST', {
            content: content({ title: `After the ${command}` }),
          })
        ).status,
      ).toBe(201);
      const repeated = results.filter((r) => r.created.tries > 1 || (r.submitted?.tries ?? 0) > 1);
      console.log(
        `database ${how}: ${N} clients, create + submit with Idempotency-Keys; answers seen ${JSON.stringify(countBy(seen))}; ` +
          `${repeated.length} clients repeated a request; ${N} creations and ${N} submissions acknowledged, ` +
          `${lost} lost, ${duplicates} duplicates; health during the outage ${health.status} (database ${healthBody.parts.database}); ` +
          `server process alive, serving again without restart`,
      );
    },
  );
});

describe('object storage frozen (connections accepted, nothing answered)', () => {
  it(
    'answers completion, download and health within 10 s, with 503 and Retry-After; serves again once it is back',
    { timeout: 120_000 },
    async () => {
      const rec = await (
        await call('contributor', '/api/v1/records', 'POST', {
          content: content({ title: 'Frozen storage' }),
        })
      ).json();
      const bytes = Buffer.from(formatExport(cvWindowOpeningSamples({ sampleIntervalS: 0.5 })));
      const declare = async () =>
        (
          await call('contributor', '/api/v1/uploads', 'POST', {
            record: rec.handle,
            name: 'cv.csv',
            size: bytes.byteLength,
            sha256: createHash('sha256').update(bytes).digest('hex'),
            mediaType: 'text/csv',
          })
        ).json();
      const first = await declare();
      await fetch(first.url, { method: 'PUT', body: bytes, headers: first.headers });
      const attached = await (
        await call('contributor', `/api/v1/uploads/${first.id}/complete`, 'POST')
      ).json();
      const second = await declare();
      await fetch(second.url, { method: 'PUT', body: bytes, headers: second.headers });

      // Freeze: the port accepts connections and never says a word.
      await s3.close();
      const held: Socket[] = [];
      const frozen = createServer((socket) => void held.push(socket));
      await new Promise<void>((r) => frozen.listen(s3Port, '127.0.0.1', r));
      const timed = async (what: string, p: string, method = 'GET') => {
        const t0 = Date.now();
        const r = await call('contributor', p, method);
        const seconds = (Date.now() - t0) / 1000;
        return { what, status: r.status, retryAfter: r.headers.get('retry-after'), seconds };
      };
      const calls = await Promise.all([
        timed('complete', `/api/v1/uploads/${second.id}/complete`, 'POST'),
        timed('download', `/api/v1/raw-files/${attached.rawFile.id}`),
        timed('health', '/api/health'),
      ]);
      for (const socket of held) socket.destroy();
      await new Promise((r) => frozen.close(r));
      await restartS3();

      // A hang detector, not a speed figure: a frozen store answers nothing for minutes.
      for (const c of calls) {
        expect(c.status, c.what).toBe(503);
        expect(c.seconds, c.what).toBeLessThan(10);
      }
      expect(calls.filter((c) => c.what !== 'health' && !c.retryAfter)).toEqual([]);
      expect(
        (await call('contributor', `/api/v1/uploads/${second.id}/complete`, 'POST')).status,
      ).toBe(200);
      expect((await call('contributor', `/api/v1/raw-files/${attached.rawFile.id}`)).status).toBe(
        200,
      );
      console.log(
        `frozen storage: ${calls.map((c) => `${c.what} ${c.status} in ${c.seconds.toFixed(1)} s`).join(', ')}; ` +
          `complete and download work again once storage answers`,
      );
    },
  );
});

describe('a PUT to the upload URL after completion', () => {
  it('cannot change the bytes the record points at', { timeout: 60_000 }, async () => {
    const rec = await (
      await call('contributor', '/api/v1/records', 'POST', {
        content: content({ title: 'Swap attempt' }),
      })
    ).json();
    const bytes = Buffer.from(formatExport(cvWindowOpeningSamples({ sampleIntervalS: 0.5 })));
    const sha = createHash('sha256').update(bytes).digest('hex');
    const ticket = await (
      await call('contributor', '/api/v1/uploads', 'POST', {
        record: rec.handle,
        name: 'cv.csv',
        size: bytes.byteLength,
        sha256: sha,
        mediaType: 'text/csv',
      })
    ).json();
    expect(
      (await fetch(ticket.url, { method: 'PUT', body: bytes, headers: ticket.headers })).status,
    ).toBe(200);
    const done = await (
      await call('contributor', `/api/v1/uploads/${ticket.id}/complete`, 'POST')
    ).json();
    // The URL is still valid: other bytes are accepted by storage...
    const other = Buffer.from('time/s,E/V,I/A\n0,0,0\n1,1,1\n');
    const swap = await fetch(ticket.url, { method: 'PUT', body: other, headers: ticket.headers });
    expect(swap.status).toBe(200);
    // ...but they land on the staging key, not on the bytes the record points at.
    const served = await call('contributor', `/api/v1/raw-files/${done.rawFile.id}`);
    expect(served.status).toBe(200);
    const servedBytes = Buffer.from(await served.arrayBuffer());
    const servedSha = createHash('sha256').update(servedBytes).digest('hex');
    expect({ bytes: servedBytes.byteLength, sha256: servedSha }).toEqual({
      bytes: bytes.byteLength,
      sha256: done.rawFile.sha256,
    });
    expect(done.rawFile.sha256).toBe(sha);
    const again = await (
      await call('contributor', `/api/v1/uploads/${ticket.id}/complete`, 'POST')
    ).json();
    expect(again.rawFile.sha256).toBe(sha);
    console.log(
      `PUT after completion: storage took ${other.byteLength} other bytes at the upload URL; ` +
        `the record still serves ${servedBytes.byteLength} bytes with the recorded SHA-256`,
    );
  });
});

describe('mail server down while curators decide', () => {
  it(
    'loses no message: queued while down, delivered when it is back',
    { timeout: 120_000 },
    async () => {
      const handles: string[] = [];
      for (let i = 0; i < 3; i++) {
        const rec = await (
          await call('contributor', '/api/v1/records', 'POST', {
            content: content({ title: `Mail fault ${i}` }),
          })
        ).json();
        const sub = await (
          await call('contributor', `/api/v1/records/${rec.handle}/transitions`, 'POST', {
            action: 'submit',
            version: rec.version,
          })
        ).json();
        handles.push(rec.handle);
        void sub;
      }
      await mail.close();
      const before = new Date();
      for (const h of handles) {
        const rec = await (await call('curator', `/api/v1/records/${h}`)).json();
        const r = await call('curator', `/api/v1/records/${h}/transitions`, 'POST', {
          action: 'publish',
          version: rec.version,
        });
        expect(r.status).toBe(200);
      }
      await new Promise((r) => setTimeout(r, 1500));
      const held = await admin
        .selectFrom('mail_outbox')
        .select(['id', 'status', 'subject'])
        .where('created_at', '>=', before)
        .execute();
      expect(held.length).toBeGreaterThanOrEqual(handles.length);
      expect(held.filter((m) => m.status === 'sent')).toEqual([]);

      mail = await startMailFake({ port: mailPort, directory: path.join(work, 'mail') });
      // The retry pause is over (time passes faster in a test); the server's own dispatcher delivers.
      await admin
        .updateTable('mail_outbox')
        .set({ next_attempt_at: new Date(Date.now() - 1000) })
        .where('status', '!=', 'sent')
        .execute();
      const deadline = Date.now() + 20_000;
      let sent = 0;
      while (Date.now() < deadline) {
        sent = (
          await admin
            .selectFrom('mail_outbox')
            .select('id')
            .where('created_at', '>=', before)
            .where('status', '=', 'sent')
            .execute()
        ).length;
        if (sent === held.length) break;
        await new Promise((r) => setTimeout(r, 250));
      }
      expect(sent).toBe(held.length);
      const captured = (await readCapturedMail(mail.directory)).filter(
        (m) => m.date >= new Date(before.getTime() - 1000),
      );
      expect(captured.length).toBeGreaterThanOrEqual(held.length);
      console.log(
        `mail faults: ${handles.length} decisions with the mail server down → ${held.length} messages held, ${sent} delivered after it came back, 0 lost`,
      );
    },
  );
});

function countBy(xs: string[]): Record<string, number> {
  const out: Record<string, number> = {};
  for (const x of xs) out[x] = (out[x] ?? 0) + 1;
  return out;
}
