import { sql, type Kysely } from 'kysely';

// Creating requests may carry an `Idempotency-Key`: one row per account and key holds what the
// first request was (a fingerprint of method, path, content type and body), whether its change
// committed (set inside the change's own transaction), and the answer it got, which a repeat
// receives instead of a second change. Rows older than a day are removed by the clean-up job.
// Frozen in time: takes Kysely<any>, imports nothing from src/.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('idempotency_keys')
    .addColumn('user_id', 'uuid', (c) => c.notNull().references('User.id').onDelete('cascade'))
    .addColumn('key', 'text', (c) => c.notNull().check(sql`length(key) BETWEEN 1 AND 255`))
    .addColumn('fingerprint', 'text', (c) => c.notNull())
    .addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    // While a request holds its key, a repeat waits (409 with Retry-After) instead of running.
    .addColumn('lease_until', 'timestamptz', (c) => c.notNull())
    .addColumn('committed', 'boolean', (c) => c.notNull().defaultTo(false))
    .addColumn('status', 'integer')
    .addColumn('headers', 'jsonb')
    .addColumn('body', 'bytea')
    .addPrimaryKeyConstraint('idempotency_keys_pkey', ['user_id', 'key'])
    .execute();
  await db.schema
    .createIndex('idempotency_keys_created_at')
    .on('idempotency_keys')
    .column('created_at')
    .execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('idempotency_keys').execute();
}
