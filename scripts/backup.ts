// `npm run backup [-- --database NAME] [--out FILE]`: pg_dump of the local database plus a
// manifest of the stored objects, in .data/backups/ by default.
import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { backup, manifestPath } from './lib/backup.ts';
import { dataDir } from './lib/paths.ts';
import { ensureCluster } from './lib/postgres.ts';
import { log, useLocalStorage } from './lib/services.ts';

const { values } = parseArgs({
  options: { database: { type: 'string', default: 'edgewise' }, out: { type: 'string' } },
});
const database = values.database!;
const stamp = new Date().toISOString().replace(/[:.]/g, '-');
const file = path.resolve(values.out ?? path.join(dataDir, 'backups', `${database}-${stamp}.dump`));
mkdirSync(path.dirname(file), { recursive: true });

const stopStorage = await useLocalStorage();
try {
  const cluster = ensureCluster(log);
  const m = await backup({ adminUrl: cluster.adminUrl(database), database, file });
  log(`database "${database}" dumped to ${file}`);
  log(`manifest of ${m.objects.length} stored objects in ${manifestPath(file)}`);
} catch (err) {
  console.error(`[edgewise] backup failed: ${err instanceof Error ? err.message : err}`);
  process.exitCode = 1;
} finally {
  await stopStorage();
}
