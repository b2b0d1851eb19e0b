import { sql, type Kysely } from 'kysely';

// Record answers are held per generation too: a change to a record's head or versions, a
// decision, a raw file or an analysis moves the generation like a change to the searchable rows
// does. Frozen in time: Kysely<any>, nothing
// imported from src/.

const TABLES = ['records', 'record_versions', 'reviews', 'raw_files', 'analyses'];

export async function up(db: Kysely<any>): Promise<void> {
  for (const t of TABLES) {
    await sql`CREATE CONSTRAINT TRIGGER ${sql.raw(`${t}_generation`)} AFTER INSERT OR UPDATE OR DELETE ON ${sql.table(t)}
              DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION bump_search_generation()`.execute(
      db,
    );
  }
}

export async function down(db: Kysely<any>): Promise<void> {
  for (const t of TABLES)
    await sql`DROP TRIGGER ${sql.raw(`${t}_generation`)} ON ${sql.table(t)}`.execute(db);
}
