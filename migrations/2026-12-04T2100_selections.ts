import { sql, type Kysely } from 'kysely';

// Citable selections: a comparison's record versions frozen under a handle of their own (ES-…),
// with the numbers as they were shown. Nothing in a selection ever changes: both tables are
// append-only. Frozen in time: takes Kysely<any>, imports nothing from src/.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`CREATE SEQUENCE selection_handle_seq START 1`.execute(db);
  await db.schema
    .createTable('selections')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('handle', 'text', (c) =>
      c
        .notNull()
        .unique()
        .defaultTo(sql`'ES-' || lpad(nextval('selection_handle_seq')::text, 6, '0')`)
        .check(sql`handle ~ '^ES-[0-9]{6,}$'`),
    )
    .addColumn('title', 'text', (c) => c.notNull().check(sql`length(title) BETWEEN 1 AND 300`))
    .addColumn('description', 'text')
    .addColumn('creator_id', 'uuid', (c) => c.notNull().references('User.id').onDelete('restrict'))
    .addColumn('creator_name', 'text', (c) => c.notNull())
    .addColumn('query', 'jsonb', (c) => c.notNull())
    .addColumn('criterion', 'text')
    .addColumn('scale', 'text', (c) => c.notNull())
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema
    .createTable('selection_items')
    .addColumn('selection_id', 'uuid', (c) =>
      c.notNull().references('selections.id').onDelete('restrict'),
    )
    .addColumn('position', 'integer', (c) => c.notNull().check(sql`position >= 0`))
    .addColumn('record_id', 'uuid', (c) =>
      c.notNull().references('records.id').onDelete('restrict'),
    )
    .addColumn('version', 'integer', (c) => c.notNull().check(sql`version >= 1`))
    .addColumn('snapshot', 'jsonb', (c) => c.notNull())
    .addPrimaryKeyConstraint('selection_items_pk', ['selection_id', 'position'])
    .addUniqueConstraint('selection_items_record', ['selection_id', 'record_id'])
    .addForeignKeyConstraint(
      'selection_items_version',
      ['record_id', 'version'],
      'record_versions',
      ['record_id', 'version'],
    )
    .execute();
  for (const t of ['selections', 'selection_items']) {
    await sql`CREATE TRIGGER ${sql.raw(`${t}_append_only`)} BEFORE UPDATE OR DELETE ON ${sql.table(t)}
              FOR EACH ROW EXECUTE FUNCTION refuse_change()`.execute(db);
    await sql`CREATE TRIGGER ${sql.raw(`${t}_no_truncate`)} BEFORE TRUNCATE ON ${sql.table(t)}
              FOR EACH STATEMENT EXECUTE FUNCTION refuse_change()`.execute(db);
    await db.insertInto('append_only_tables').values({ table_name: t }).execute();
  }
}

export async function down(db: Kysely<any>): Promise<void> {
  await db
    .deleteFrom('append_only_tables')
    .where('table_name', 'in', ['selections', 'selection_items'])
    .execute();
  await db.schema.dropTable('selection_items').execute();
  await db.schema.dropTable('selections').execute();
  await sql`DROP SEQUENCE selection_handle_seq`.execute(db);
}
