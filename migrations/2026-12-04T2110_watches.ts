import { sql, type Kysely } from 'kysely';

// Watches: a signed-in person's saved comparison, mailed at most daily when its published records
// change. `record_events` is the record lifecycle's own log of what readers may care about
// (published, a new version published, flagged, withdrawn), append-only; each watch keeps how far
// it has mailed and how far its owner has looked. Frozen in time: takes Kysely<any>, imports
// nothing from src/.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('record_events')
    .addColumn('id', 'bigserial', (c) => c.primaryKey())
    .addColumn('record_id', 'uuid', (c) =>
      c.notNull().references('records.id').onDelete('restrict'),
    )
    .addColumn('handle', 'text', (c) => c.notNull())
    .addColumn('version', 'integer', (c) => c.notNull().check(sql`version >= 1`))
    .addColumn('kind', 'text', (c) =>
      c.notNull().check(sql`kind IN ('published', 'new-version', 'flagged', 'withdrawn')`),
    )
    .addColumn('at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await sql`CREATE TRIGGER record_events_append_only BEFORE UPDATE OR DELETE ON record_events
            FOR EACH ROW EXECUTE FUNCTION refuse_change()`.execute(db);
  await sql`CREATE TRIGGER record_events_no_truncate BEFORE TRUNCATE ON record_events
            FOR EACH STATEMENT EXECUTE FUNCTION refuse_change()`.execute(db);
  await db.insertInto('append_only_tables').values({ table_name: 'record_events' }).execute();

  await db.schema
    .createTable('watches')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('user_id', 'uuid', (c) => c.notNull().references('User.id').onDelete('cascade'))
    .addColumn('name', 'text', (c) => c.notNull().check(sql`length(name) BETWEEN 1 AND 200`))
    .addColumn('query', 'text', (c) => c.notNull())
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    // Events up to these ids have been mailed about / looked at.
    .addColumn('mailed_through', 'bigint', (c) => c.notNull().defaultTo(0))
    .addColumn('seen_through', 'bigint', (c) => c.notNull().defaultTo(0))
    .addColumn('last_mailed_at', 'timestamptz')
    .addColumn('unsubscribed_at', 'timestamptz')
    .execute();
  await db.schema.createIndex('watches_user').on('watches').column('user_id').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('watches').execute();
  await db.deleteFrom('append_only_tables').where('table_name', '=', 'record_events').execute();
  await db.schema.dropTable('record_events').execute();
}
