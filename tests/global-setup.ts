// Starts what the integration and browser tests need: a fresh database in the project's
// PostgreSQL cluster, the S3 and SMTP fakes on free ports, and a built server of the app.
import type { ChildProcess } from 'node:child_process';
import { mkdirSync, rmSync } from 'node:fs';
import path from 'node:path';
import type { TestProject } from 'vitest/node';
import { dataDir } from '../scripts/lib/paths.ts';
import { dropDatabase, dropStaleTestDatabases } from '../scripts/lib/postgres.ts';
import { loadVocabularySeed } from '../seed/load-vocabulary.ts';
import {
  appEnv,
  buildApp,
  freePort,
  prepareDatabase,
  startApp,
  startFakes,
  type Fakes,
} from '../scripts/lib/services.ts';

declare module 'vitest' {
  export interface ProvidedContext {
    appUrl: string;
    appEnv: Record<string, string>;
    adminUrl: string;
    mailDir: string;
    pgPort: number;
    outDir: string;
  }
}

let app: ChildProcess | undefined;
let fakes: Fakes | undefined;

export default async function setup(project: TestProject) {
  const run = `${process.pid}`;
  const database = `edgewise_test_${run}`;
  const workDir = path.join(dataDir, `test-${run}`);
  mkdirSync(workDir, { recursive: true });

  const cluster = await prepareDatabase(database, { fresh: true, quiet: true });
  await loadVocabularySeed(cluster.appUrl(database));
  await dropStaleTestDatabases(cluster);
  fakes = await startFakes({
    s3Port: 0,
    smtpPort: 0,
    s3Dir: path.join(workDir, 's3'),
    mailDir: path.join(workDir, 'mail'),
    bucket: 'edgewise-raw',
  });
  const port = await freePort();
  const origin = `http://127.0.0.1:${port}`;
  const env = {
    ...appEnv({ cluster, database, fakes, origin, appEnv: 'test' }),
    // Every test request comes from 127.0.0.1, and the whole run makes more requests that send
    // e-mail than one client may in an hour; tests/integration/mail-limits.test.ts fills the
    // counter itself to reach this limit.
    MAIL_LIMIT_PER_CLIENT: '1000',
  };
  // A separate build folder, so a running `npm start` keeps its own files.
  const outDir = path.join(workDir, 'dist');
  buildApp(outDir, true);
  app = await startApp(outDir, env, port, true);

  project.provide('appUrl', origin);
  project.provide('appEnv', env);
  project.provide('adminUrl', cluster.adminUrl(database));
  project.provide('mailDir', fakes.mail.directory);
  project.provide('pgPort', cluster.port);
  project.provide('outDir', outDir);

  return async () => {
    app?.kill('SIGTERM');
    await fakes?.close();
    await dropDatabase(cluster, database).catch(() => {});
    if (!process.env.EDGEWISE_KEEP_TEST_DIR) rmSync(workDir, { recursive: true, force: true });
  };
}
