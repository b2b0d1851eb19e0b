// `npm start` after dependencies are in place: database, fakes, build, server.
import path from 'node:path';
import { parseConfig, ConfigError } from '../src/lib/server/config.ts';
import { dataDir, projectRoot } from './lib/paths.ts';
import {
  appEnv,
  buildApp,
  log,
  portAnswers,
  prepareDatabase,
  startApp,
  startFakes,
} from './lib/services.ts';
import { demoAccountLines, seedAccounts } from '../seed/accounts.ts';
import { loadVocabularySeed } from '../seed/load-vocabulary.ts';
import { loadDemo } from '../seed/demo.ts';

const APP_PORT = Number(process.env.PORT ?? 4321);
const S3_PORT = Number(process.env.EDGEWISE_S3_PORT ?? 4580);
const SMTP_PORT = Number(process.env.EDGEWISE_SMTP_PORT ?? 2526);
const DATABASE = 'edgewise';
const origin = process.env.PUBLIC_ORIGIN ?? `http://localhost:${APP_PORT}`;

async function main() {
  const started = Date.now();
  if (await portAnswers(APP_PORT)) {
    const res = await fetch(`http://127.0.0.1:${APP_PORT}/api/health`).catch(() => null);
    if (res?.ok) {
      log(`Edgewise is already running at ${origin} — nothing to do.`);
      return;
    }
    throw new Error(`port ${APP_PORT} is taken by another program; set PORT to use another`);
  }
  for (const [name, port] of [
    ['S3 fake', S3_PORT],
    ['mail fake', SMTP_PORT],
  ] as const) {
    if (await portAnswers(port))
      throw new Error(
        `${name} port ${port} is taken; stop what uses it or set EDGEWISE_${name === 'S3 fake' ? 'S3' : 'SMTP'}_PORT`,
      );
  }

  const cluster = await prepareDatabase(DATABASE);
  await loadVocabularySeed(cluster.appUrl(DATABASE));
  await seedAccounts(cluster.appUrl(DATABASE));
  const fakes = await startFakes({
    s3Port: S3_PORT,
    smtpPort: SMTP_PORT,
    s3Dir: path.join(dataDir, 's3'),
    mailDir: path.join(dataDir, 'mail'),
    bucket: 'edgewise-raw',
  });
  const env = {
    ...appEnv({ cluster, database: DATABASE, fakes, origin, appEnv: 'development' }),
    ...pick(process.env),
  };
  parseConfig(env); // fail here, with every bad variable named, rather than on the first request
  // The demo scenario, once: a database that already holds records is left as it is.
  const demo = await loadDemo(env, { log });
  if (!demo.loaded)
    log(`demo scenario not loaded: ${demo.skipped} (npm run seed -- --reset reloads it)`);

  const outDir = path.join(projectRoot, 'dist');
  buildApp(outDir);
  const app = await startApp(outDir, env, APP_PORT);

  log(`ready in ${((Date.now() - started) / 1000).toFixed(1)} s`);
  console.log(`
  Edgewise      ${origin}
  Health        ${origin}/api/health
  Captured mail ${origin}/dev/mail   (SMTP fake on 127.0.0.1:${fakes.mail.port}, files in .data/mail/)
  Raw files     S3 fake on ${fakes.s3.endpoint} (objects in .data/s3/)
  PostgreSQL    127.0.0.1:${cluster.port}, database "${DATABASE}" (npm run stop stops it)

${demoAccountLines()}

  Ctrl-C stops the app and the fakes.
`);

  const shutdown = async () => {
    app.kill('SIGTERM');
    await fakes.close();
    process.exit(0);
  };
  process.on('SIGINT', shutdown);
  process.on('SIGTERM', shutdown);
  app.on('exit', async (code) => {
    log(`app server exited (${code})`);
    await fakes.close();
    process.exit(code ?? 1);
  });
}

/** Settings a person may override from their environment (a real bucket, another mail server). */
function pick(env: NodeJS.ProcessEnv): Record<string, string> {
  const keys = [
    'S3_ENDPOINT',
    'S3_REGION',
    'S3_BUCKET',
    'S3_ACCESS_KEY_ID',
    'S3_SECRET_ACCESS_KEY',
    'SMTP_HOST',
    'SMTP_PORT',
    'MAIL_FROM',
    'TRUST_PROXY',
    'MAX_UPLOAD_BYTES',
  ];
  return Object.fromEntries(keys.filter((k) => env[k] !== undefined).map((k) => [k, env[k]!]));
}

main().catch((err) => {
  console.error(
    err instanceof ConfigError
      ? err.message
      : `[edgewise] start failed: ${err instanceof Error ? err.message : err}`,
  );
  process.exit(1);
});
