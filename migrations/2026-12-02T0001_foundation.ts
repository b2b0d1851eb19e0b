import { sql, type Kysely } from 'kysely';

// Frozen in time: this file takes Kysely<any> and imports nothing from src/.
export async function up(db: Kysely<any>): Promise<void> {
  // Tables whose rows are never changed or removed once written. The setup script revokes
  // UPDATE/DELETE on them from the app's role, and a trigger refuses them for every role.
  await db.schema
    .createTable('append_only_tables')
    .addColumn('table_name', 'text', (c) => c.primaryKey())
    .execute();

  await sql`
    CREATE FUNCTION refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      RAISE EXCEPTION 'rows of % are append-only', TG_TABLE_NAME USING ERRCODE = 'insufficient_privilege';
    END $$`.execute(db);

  // Auth.js tables (the Kysely adapter's names: quoted, camelCase), plus Edgewise's own columns.
  await db.schema
    .createTable('User')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('name', 'text')
    .addColumn('email', 'text', (c) => c.notNull().unique())
    .addColumn('emailVerified', 'timestamptz')
    .addColumn('image', 'text')
    .addColumn('role', 'text', (c) =>
      c
        .notNull()
        .defaultTo('reader')
        .check(sql`role IN ('reader', 'contributor', 'curator', 'admin')`),
    )
    .addColumn('affiliation', 'text')
    .addColumn('orcid', 'text', (c) =>
      c.check(sql`orcid ~ '^[0-9]{4}-[0-9]{4}-[0-9]{4}-[0-9]{3}[0-9X]$'`),
    )
    .addColumn('session_version', 'integer', (c) => c.notNull().defaultTo(1))
    .addColumn('disabled_at', 'timestamptz')
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await sql`CREATE UNIQUE INDEX user_email_lower ON "User" (lower(email))`.execute(db);

  await db.schema
    .createTable('Account')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('userId', 'uuid', (c) => c.notNull().references('User.id').onDelete('cascade'))
    .addColumn('type', 'text', (c) => c.notNull())
    .addColumn('provider', 'text', (c) => c.notNull())
    .addColumn('providerAccountId', 'text', (c) => c.notNull())
    .addColumn('refresh_token', 'text')
    .addColumn('access_token', 'text')
    .addColumn('expires_at', 'bigint')
    .addColumn('token_type', 'text')
    .addColumn('scope', 'text')
    .addColumn('id_token', 'text')
    .addColumn('session_state', 'text')
    .addUniqueConstraint('account_provider_unique', ['provider', 'providerAccountId'])
    .execute();

  await db.schema
    .createTable('Session')
    .addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
    .addColumn('userId', 'uuid', (c) => c.notNull().references('User.id').onDelete('cascade'))
    .addColumn('sessionToken', 'text', (c) => c.notNull().unique())
    .addColumn('expires', 'timestamptz', (c) => c.notNull())
    .execute();

  await db.schema
    .createTable('VerificationToken')
    .addColumn('identifier', 'text', (c) => c.notNull())
    .addColumn('token', 'text', (c) => c.notNull().unique())
    .addColumn('expires', 'timestamptz', (c) => c.notNull())
    .addPrimaryKeyConstraint('verification_token_pk', ['identifier', 'token'])
    .execute();

  // Who did what to which object, when; never edited.
  await db.schema
    .createTable('audit_events')
    .addColumn('id', 'bigserial', (c) => c.primaryKey())
    .addColumn('at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .addColumn('actor_id', 'uuid', (c) => c.references('User.id').onDelete('restrict'))
    .addColumn('action', 'text', (c) => c.notNull().check(sql`action ~ '^[a-z][a-z0-9_.-]*$'`))
    .addColumn('subject_type', 'text', (c) => c.notNull())
    .addColumn('subject_id', 'text', (c) => c.notNull())
    .addColumn('details', 'jsonb', (c) => c.notNull().defaultTo(sql`'{}'::jsonb`))
    .execute();
  await db.schema
    .createIndex('audit_events_subject')
    .on('audit_events')
    .columns(['subject_type', 'subject_id', 'at'])
    .execute();
  await db.schema
    .createIndex('audit_events_actor')
    .on('audit_events')
    .columns(['actor_id', 'at'])
    .execute();
  await sql`CREATE TRIGGER audit_events_append_only BEFORE UPDATE OR DELETE ON audit_events
            FOR EACH ROW EXECUTE FUNCTION refuse_change()`.execute(db);
  await sql`CREATE TRIGGER audit_events_no_truncate BEFORE TRUNCATE ON audit_events
            FOR EACH STATEMENT EXECUTE FUNCTION refuse_change()`.execute(db);
  await db.insertInto('append_only_tables').values({ table_name: 'audit_events' }).execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('audit_events').execute();
  await db.schema.dropTable('VerificationToken').execute();
  await db.schema.dropTable('Session').execute();
  await db.schema.dropTable('Account').execute();
  await db.schema.dropTable('User').execute();
  await sql`DROP FUNCTION refuse_change()`.execute(db);
  await db.schema.dropTable('append_only_tables').execute();
}
