// `npm run restore -- FILE [--database NAME]`: restores a backup into a new, empty database of
// the local cluster (created when this machine has none yet), then checks every stored object
// the manifest names.
import path from 'node:path';
import { parseArgs } from 'node:util';
import pg from 'pg';
import { restore } from './lib/backup.ts';
import { ensureCluster, ensureDatabase } from './lib/postgres.ts';
import { log, useLocalStorage } from './lib/services.ts';

const { values, positionals } = parseArgs({
  allowPositionals: true,
  options: { database: { type: 'string', default: 'edgewise' } },
});
if (positionals.length !== 1) {
  console.error('usage: npm run restore -- FILE [--database NAME]');
  process.exit(2);
}
const file = path.resolve(positionals[0]!);
const database = values.database!;

const stopStorage = await useLocalStorage();
try {
  const cluster = ensureCluster(log);
  await ensureDatabase(cluster, database);
  const client = new pg.Client({ connectionString: cluster.adminUrl(database) });
  await client.connect();
  const tables = await client.query(
    `SELECT count(*)::int AS n FROM information_schema.tables WHERE table_schema = 'public'`,
  );
  await client.end();
  if (tables.rows[0].n > 0) {
    throw new Error(
      `database "${database}" is not empty; restore into a new one with --database NAME, or reset local data first (see DEVELOPERS.md)`,
    );
  }
  const report = await restore({ adminUrl: cluster.adminUrl(database), file });
  log(`restored ${file} into database "${database}"`);
  log(
    `stored objects checked: ${report.objectsChecked}, missing: ${report.missing.length}, changed: ${report.changed.length}`,
  );
  for (const k of report.missing) log(`  missing: ${k}`);
  for (const k of report.changed) log(`  changed: ${k}`);
  if (report.missing.length + report.changed.length > 0) process.exitCode = 1;
} catch (err) {
  console.error(`[edgewise] restore failed: ${err instanceof Error ? err.message : err}`);
  process.exitCode = 1;
} finally {
  await stopStorage();
}
