// Local services shared by `npm start` and the test setup: the PostgreSQL cluster and a
// database, the S3 fake, the SMTP fake, and a built server of the app.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { appendFileSync } from 'node:fs';
import path from 'node:path';
import { startS3Fake, type S3Fake } from '../../docker-free-s3-fake/s3-fake.ts';

/** Where browsers PUT raw files before they are verified (STAGING_PREFIX in src/lib/server/raw-objects.ts). */
const STAGING_FOLDER = 'uploads/';
import { createDb } from '#lib/server/db/index.ts';
import { migrateToLatest } from '#lib/server/db/migrate.ts';
import { startMailFake, type MailFake } from './mail-fake.ts';
import { dataDir, projectRoot } from './paths.ts';
import { ensureCluster, ensureDatabase, grantAppRole, type ClusterInfo } from './postgres.ts';
import { localSecret } from './secrets.ts';

export const log = (msg: string) => console.log(`[edgewise] ${msg}`);
export const migrationsDir = path.join(projectRoot, 'migrations');

/** Cluster up, database present (fresh when asked), migrations run, app role granted. */
export async function prepareDatabase(
  database: string,
  opts: { fresh?: boolean; quiet?: boolean } = {},
) {
  const cluster = ensureCluster(opts.quiet ? undefined : log);
  await ensureDatabase(cluster, database, { fresh: opts.fresh });
  const admin = createDb(cluster.adminUrl(database), 2);
  try {
    const results = await migrateToLatest(admin, migrationsDir);
    for (const r of results ?? [])
      if (!opts.quiet) log(`migration ${r.migrationName}: ${r.status}`);
  } finally {
    await admin.destroy();
  }
  await grantAppRole(cluster, database);
  return cluster;
}

export interface Fakes {
  s3: S3Fake;
  mail: MailFake;
  close(): Promise<void>;
}

export async function startFakes(opts: {
  s3Port: number;
  smtpPort: number;
  s3Dir: string;
  mailDir: string;
  bucket: string;
}): Promise<Fakes> {
  const s3 = await startS3Fake({
    port: opts.s3Port,
    directory: opts.s3Dir,
    bucket: opts.bucket,
    keepPrefixes: [STAGING_FOLDER],
  });
  const mail = await startMailFake({ port: opts.smtpPort, directory: opts.mailDir });
  return { s3, mail, close: async () => void (await Promise.all([s3.close(), mail.close()])) };
}

/** Environment for the app server, from the parts started above. */
export function appEnv(p: {
  cluster: ClusterInfo;
  database: string;
  fakes: Fakes;
  origin: string;
  appEnv: 'development' | 'test';
}): Record<string, string> {
  return {
    APP_ENV: p.appEnv,
    PUBLIC_ORIGIN: p.origin,
    DATABASE_URL: p.cluster.appUrl(p.database),
    AUTH_SECRET: localSecret('auth-secret'),
    S3_ENDPOINT: p.fakes.s3.endpoint,
    S3_BUCKET: 'edgewise-raw',
    SMTP_HOST: '127.0.0.1',
    SMTP_PORT: String(p.fakes.mail.port),
    MAIL_CAPTURE_DIR: p.fakes.mail.directory,
  };
}

/** `astro build` into outDir. */
export function buildApp(outDir: string, quiet = false): void {
  const started = Date.now();
  const r = spawnSync(path.join(projectRoot, 'node_modules', '.bin', 'astro'), ['build'], {
    cwd: projectRoot,
    env: {
      ...process.env,
      NODE_ENV: 'production',
      EDGEWISE_OUT_DIR: outDir,
      ASTRO_TELEMETRY_DISABLED: '1',
    },
    stdio: quiet ? 'pipe' : 'inherit',
    encoding: 'utf8',
  });
  if (r.status !== 0) throw new Error(`astro build failed\n${r.stdout ?? ''}${r.stderr ?? ''}`);
  if (!quiet) log(`built in ${((Date.now() - started) / 1000).toFixed(1)} s`);
}

/** Starts the built server and resolves once /api/health answers 200. */
export async function startApp(
  outDir: string,
  env: Record<string, string>,
  port: number,
  quiet = false,
): Promise<ChildProcess> {
  const child = spawn(process.execPath, [path.join(outDir, 'app-server.mjs')], {
    cwd: projectRoot,
    env: {
      ...process.env,
      ...env,
      HOST: '127.0.0.1',
      PORT: String(port),
      NODE_ENV: 'production',
      ASTRO_TELEMETRY_DISABLED: '1',
      AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true',
    },
    stdio: quiet ? ['ignore', 'pipe', 'pipe'] : ['ignore', 'inherit', 'inherit'],
  });
  let output = '';
  const logFile = path.join(outDir, '..', 'server.log');
  const keep = (d: Buffer) => {
    output = (output + d).slice(-20_000);
    appendFileSync(logFile, d);
  };
  child.stdout?.on('data', keep);
  child.stderr?.on('data', keep);
  const deadline = Date.now() + 30_000;
  let last = '';
  while (Date.now() < deadline) {
    if (child.exitCode !== null)
      throw new Error(`app server exited with ${child.exitCode}\n${output}`);
    try {
      const res = await fetch(`http://127.0.0.1:${port}/api/health`);
      last = `${res.status} ${await res.text()}`;
      if (res.ok) return child;
    } catch (err) {
      last = String(err);
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  child.kill();
  throw new Error(`app server did not become healthy: ${last}\n${output}`);
}

/** True when something already answers on that port of the loopback address. */
export async function portAnswers(port: number): Promise<boolean> {
  const net = await import('node:net');
  return new Promise((resolve) => {
    const socket = net.connect({ host: '127.0.0.1', port });
    socket.once('connect', () => {
      socket.destroy();
      resolve(true);
    });
    socket.once('error', () => resolve(false));
  });
}

/** A free port on 127.0.0.1. */
export async function freePort(): Promise<number> {
  const net = await import('node:net');
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.once('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const addr = srv.address();
      const port = typeof addr === 'object' && addr ? addr.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

/**
 * Points this process's storage settings at the local S3 fake: the one `npm start` runs, or a
 * temporary one over the same folder. Returns a function that stops what it started.
 */
export async function useLocalStorage(defaultPort = 4580): Promise<() => Promise<void>> {
  process.env.DATABASE_URL ??= 'postgres://unused@127.0.0.1/unused';
  process.env.AUTH_SECRET ??= 'x'.repeat(32);
  if (process.env.S3_ENDPOINT) return async () => {};
  if (await portAnswers(defaultPort)) {
    process.env.S3_ENDPOINT = `http://127.0.0.1:${defaultPort}`;
    return async () => {};
  }
  const s3 = await startS3Fake({
    port: 0,
    directory: path.join(dataDir, 's3'),
    bucket: 'edgewise-raw',
    keepPrefixes: [STAGING_FOLDER],
  });
  process.env.S3_ENDPOINT = s3.endpoint;
  return () => s3.close();
}
