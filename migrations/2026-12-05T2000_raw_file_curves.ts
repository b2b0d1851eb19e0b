import { sql, type Kysely } from 'kysely';

// A thinned copy of each raw file's curve for drawing: the lowest and highest current of each of
// a few thousand runs of samples, so every peak is kept. Made once when the file is verified; a
// file verified before this table existed gets its copy the first time it is drawn. A record page
// draws from it and never downloads a whole file just to draw. Frozen in time: Kysely<any>,
// nothing imported from src/.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('raw_file_curves')
    .addColumn('raw_file_id', 'uuid', (c) =>
      c.primaryKey().references('raw_files.id').onDelete('cascade'),
    )
    // Samples in the file, and the thinned potentials (V) and currents (A) as float8 little-endian.
    .addColumn('samples', 'integer', (c) => c.notNull().check(sql`samples >= 0`))
    .addColumn('potential', 'bytea', (c) => c.notNull())
    .addColumn('current', 'bytea', (c) => c.notNull())
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addCheckConstraint(
      'raw_file_curves_same_length',
      sql`length(potential) = length(current) AND length(potential) % 8 = 0`,
    )
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('raw_file_curves').execute();
}
