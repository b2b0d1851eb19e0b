import { sql, type Kysely } from 'kysely';

// Limits on requests that make the server send e-mail (sign-up, password reset, sign-in link):
// one row per such request keyed by client address, and one per message sent keyed by its kind
// and recipient; both counted over a window. Frozen in time: takes Kysely<any>, imports nothing
// from src/.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('mail_requests')
    .addColumn('id', 'bigserial', (c) => c.primaryKey())
    .addColumn('key', 'text', (c) => c.notNull())
    .addColumn('at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
    .execute();
  await db.schema
    .createIndex('mail_requests_key_at')
    .on('mail_requests')
    .columns(['key', 'at'])
    .execute();
  // The clean-up job deletes by age alone.
  await db.schema.createIndex('mail_requests_at').on('mail_requests').column('at').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('mail_requests').execute();
}
