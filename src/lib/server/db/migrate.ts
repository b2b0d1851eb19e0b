import { promises as fs } from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import {
  Migrator,
  type Kysely,
  type Migration,
  type MigrationProvider,
  type MigrationResultSet,
} from 'kysely';

/** Loads every `*.ts` file of a folder as a migration, ordered by name (ISO-timestamp prefix). */
class FolderMigrationProvider implements MigrationProvider {
  constructor(private readonly folder: string) {}

  async getMigrations(): Promise<Record<string, Migration>> {
    const files = (await fs.readdir(this.folder))
      .filter((f) => /\.(ts|js|mjs)$/.test(f) && !f.endsWith('.d.ts'))
      .sort();
    const out: Record<string, Migration> = {};
    for (const file of files) {
      const mod = (await import(pathToFileURL(path.join(this.folder, file)).href)) as Migration;
      out[file.replace(/\.(ts|js|mjs)$/, '')] = mod;
    }
    return out;
  }
}

/** Runs all pending migrations; throws with the failing migration's name and error. */
export async function migrateToLatest(
  db: Kysely<any>,
  folder: string,
): Promise<MigrationResultSet['results']> {
  const migrator = new Migrator({ db, provider: new FolderMigrationProvider(folder) });
  const { error, results } = await migrator.migrateToLatest();
  if (error) {
    const failed = results?.find((r) => r.status === 'Error');
    const message = error instanceof Error ? error.message : String(error);
    throw new Error(`migration ${failed?.migrationName ?? '(unknown)'} failed: ${message}`);
  }
  return results;
}
