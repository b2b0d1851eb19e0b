import { sql, type Kysely } from 'kysely';

// Handles keep six digits at least and grow past them: lpad to six alone would cut the
// millionth handle back to six digits and collide with an earlier one. Frozen in time:
// Kysely<any>, nothing imported from src/.

export async function up(db: Kysely<any>): Promise<void> {
  await sql`CREATE FUNCTION next_record_handle() RETURNS text LANGUAGE sql AS $$
              SELECT 'EW-' || lpad(n::text, greatest(6, length(n::text)), '0')
                FROM (SELECT nextval('record_handle_seq') AS n) s
            $$`.execute(db);
  await sql`ALTER TABLE records ALTER COLUMN handle SET DEFAULT next_record_handle()`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`ALTER TABLE records ALTER COLUMN handle SET DEFAULT 'EW-' || lpad(nextval('record_handle_seq')::text, 6, '0')`.execute(
    db,
  );
  await sql`DROP FUNCTION next_record_handle()`.execute(db);
}
