// `npm run migrate`: runs pending migrations on the local database (or DATABASE_ADMIN_URL).
import { createDb } from '../src/lib/server/db/index.ts';
import { migrateToLatest } from '../src/lib/server/db/migrate.ts';
import { log, migrationsDir, prepareDatabase } from './lib/services.ts';

async function main() {
  const url = process.env.DATABASE_ADMIN_URL;
  if (!url) {
    await prepareDatabase(process.env.EDGEWISE_DATABASE ?? 'edgewise');
    return;
  }
  const db = createDb(url, 1);
  try {
    for (const r of (await migrateToLatest(db, migrationsDir)) ?? [])
      log(`migration ${r.migrationName}: ${r.status}`);
  } finally {
    await db.destroy();
  }
}

main().catch((err) => {
  console.error(`[edgewise] ${err instanceof Error ? err.message : err}`);
  process.exit(1);
});
