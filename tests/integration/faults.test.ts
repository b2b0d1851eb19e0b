import { spawnSync, type ChildProcess } from 'node:child_process';
import { createHash, randomBytes } from 'node:crypto';
import { mkdirSync, rmSync } from 'node:fs';
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
// object storage stopped at each step of an upload, PostgreSQL killed during concurrent
// submissions, the mail server down while curators decide. Each part prints what it tried and
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
  const urls = JSON.parse(pgCtl('urls')) as { adminUrl: string; appUrl: string };
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

describe('PostgreSQL killed during concurrent submissions', () => {
  it(
    'keeps every acknowledged submission with its version and audit event; the server recovers by itself',
    { timeout: 180_000 },
    async () => {
      const N = 24;
      const attempts = Array.from({ length: N }, (_, i) =>
        (async () => {
          await new Promise((r) => setTimeout(r, i * 40));
          const created = await call('contributor', '/api/v1/records', 'POST', {
            content: content({ title: `Fault run ${i}` }),
          }).catch(() => null);
          if (!created || created.status !== 201)
            return {
              i,
              created: created?.status ?? 'network',
              submitted: null as number | string | null,
              handle: null as string | null,
            };
          const rec = await created.json();
          const sub = await call(
            'contributor',
            `/api/v1/records/${rec.handle}/transitions`,
            'POST',
            { action: 'submit', version: rec.version },
          ).catch(() => null);
          return {
            i,
            created: 201,
            submitted: sub?.status ?? 'network',
            handle: rec.handle as string,
          };
        })(),
      );
      await new Promise((r) => setTimeout(r, (N / 2) * 40));
      pgCtl('kill');
      await new Promise((r) => setTimeout(r, 1500));
      pgCtl('start');
      const results = await Promise.all(attempts);
      await waitHealthy();

      const statuses = results.map((r) => `${r.created}/${r.submitted ?? '-'}`);
      expect(statuses.filter((s) => /\b500\b/.test(s))).toEqual([]);
      const acknowledged = results.filter((r) => r.created === 201);
      let checked = 0;
      for (const r of acknowledged) {
        const row = await admin
          .selectFrom('records')
          .select(['status', 'current_version'])
          .where('handle', '=', r.handle!)
          .executeTakeFirst();
        expect(row, `${r.handle} was acknowledged`).toBeDefined();
        const create = await admin
          .selectFrom('audit_events')
          .select('id')
          .where('subject_id', '=', r.handle!)
          .where('action', '=', 'record.create')
          .execute();
        expect(create).toHaveLength(1);
        if (r.submitted === 200) {
          expect(row!.status).toBe('submitted');
          const submit = await admin
            .selectFrom('audit_events')
            .select('id')
            .where('subject_id', '=', r.handle!)
            .where('action', '=', 'record.submit')
            .execute();
          expect(submit).toHaveLength(1);
        }
        checked++;
      }
      // After recovery, the same server takes new work without a restart.
      expect(
        (
          await call('contributor', '/api/v1/records', 'POST', {
            content: content({ title: 'After the crash' }),
          })
        ).status,
      ).toBe(201);
      console.log(
        `database kill: ${N} concurrent create+submit, statuses ${JSON.stringify(countBy(statuses))}; ` +
          `${acknowledged.length} acknowledged creations and ${results.filter((r) => r.submitted === 200).length} submissions all present with version and audit; server recovered without restart`,
      );
      expect(checked).toBe(acknowledged.length);
    },
  );
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
