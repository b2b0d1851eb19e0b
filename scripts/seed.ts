// `npm run seed` loads the demo scenario into the local database when it holds no records;
// `npm run seed -- --reset` drops and recreates the database first (migrations, vocabulary,
// demo accounts, then the scenario). Uses the running S3 fake of `npm start`, or starts one.
import path from 'node:path';
import { dataDir } from './lib/paths.ts';
import { log, portAnswers, prepareDatabase, startFakes, type Fakes } from './lib/services.ts';
import { localSecret } from './lib/secrets.ts';
import { seedAccounts } from '../seed/accounts.ts';
import { loadVocabularySeed } from '../seed/load-vocabulary.ts';
import { loadDemo } from '../seed/demo.ts';

const DATABASE = 'edgewise';
const S3_PORT = Number(process.env.EDGEWISE_S3_PORT ?? 4580);
const SMTP_PORT = Number(process.env.EDGEWISE_SMTP_PORT ?? 2526);

async function main() {
  const reset = process.argv.includes('--reset');
  const cluster = await prepareDatabase(DATABASE, { fresh: reset });
  if (reset) log(`database "${DATABASE}" recreated`);
  const url = cluster.appUrl(DATABASE);
  await loadVocabularySeed(url);
  await seedAccounts(url);
  let fakes: Fakes | undefined;
  if (!(await portAnswers(S3_PORT))) {
    fakes = await startFakes({
      s3Port: S3_PORT,
      smtpPort: SMTP_PORT,
      s3Dir: path.join(dataDir, 's3'),
      mailDir: path.join(dataDir, 'mail'),
      bucket: 'edgewise-raw',
    });
  }
  try {
    const demo = await loadDemo(
      {
        APP_ENV: 'development',
        DATABASE_URL: url,
        AUTH_SECRET: localSecret('auth-secret'),
        S3_ENDPOINT: `http://127.0.0.1:${S3_PORT}`,
        S3_BUCKET: 'edgewise-raw',
      },
      { log },
    );
    if (!demo.loaded) log(`demo scenario not loaded: ${demo.skipped}; use --reset to start over`);
  } finally {
    await fakes?.close();
  }
}

main().then(
  // The analysis worker pool would keep the process alive until it idles out.
  () => process.exit(0),
  (err) => {
    console.error(`[edgewise] seed failed: ${err instanceof Error ? err.stack : err}`);
    process.exit(1);
  },
);
