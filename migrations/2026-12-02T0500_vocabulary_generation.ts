import { sql, type Kysely } from 'kysely';

// Vocabulary edits (names, synonyms, merges, reference values) change what a search finds and how
// its limits convert, so they move the search generation too and cached answers are dropped.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`CREATE CONSTRAINT TRIGGER vocabulary_terms_generation AFTER INSERT OR UPDATE OR DELETE ON vocabulary_terms
            DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION bump_search_generation()`.execute(
    db,
  );
  await sql`CREATE TRIGGER vocabulary_terms_generation_truncate AFTER TRUNCATE ON vocabulary_terms
            FOR EACH STATEMENT EXECUTE FUNCTION bump_search_generation()`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`DROP TRIGGER vocabulary_terms_generation_truncate ON vocabulary_terms`.execute(db);
  await sql`DROP TRIGGER vocabulary_terms_generation ON vocabulary_terms`.execute(db);
}
