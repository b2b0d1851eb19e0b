import { sql, type Kysely } from 'kysely';

// Raw files are stored twice over their life: the browser PUTs to a staging key
// (`uploads/<upload id>`, the only kind of key a presigned URL names), and the verified bytes are
// written to a key named by their SHA-256 (`raw/sha256/<hex>`), which is what a raw file row
// points at. Identical files (on two records, or twice on one) share that object, so the key is
// no longer unique among raw files. Rows made before keep their `raw/<id>` keys. Frozen in time: takes Kysely<any>,
// imports nothing from src/.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`ALTER TABLE uploads DROP CONSTRAINT uploads_object_key_check`.execute(db);
  await sql`ALTER TABLE uploads ADD CONSTRAINT uploads_object_key_check
    CHECK (object_key ~ '^uploads/[0-9a-f-]{36}$' OR object_key ~ '^raw/[0-9a-f-]{36}$')`.execute(
    db,
  );
  await sql`ALTER TABLE raw_files DROP CONSTRAINT raw_files_object_key_check`.execute(db);
  await sql`ALTER TABLE raw_files ADD CONSTRAINT raw_files_object_key_check
    CHECK (object_key ~ '^raw/sha256/[0-9a-f]{64}$' OR object_key ~ '^raw/[0-9a-f-]{36}$')`.execute(
    db,
  );
  await sql`ALTER TABLE raw_files DROP CONSTRAINT raw_files_object_key_key`.execute(db);
  await sql`CREATE INDEX raw_files_object_key ON raw_files (object_key)`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`DROP INDEX raw_files_object_key`.execute(db);
  await sql`ALTER TABLE uploads DROP CONSTRAINT uploads_object_key_check`.execute(db);
  await sql`ALTER TABLE uploads ADD CONSTRAINT uploads_object_key_check
    CHECK (object_key ~ '^raw/[0-9a-f-]{36}$') NOT VALID`.execute(db);
  await sql`ALTER TABLE raw_files DROP CONSTRAINT raw_files_object_key_check`.execute(db);
  await sql`ALTER TABLE raw_files ADD CONSTRAINT raw_files_object_key_check
    CHECK (object_key ~ '^raw/[0-9a-f-]{36}$') NOT VALID`.execute(db);
}
