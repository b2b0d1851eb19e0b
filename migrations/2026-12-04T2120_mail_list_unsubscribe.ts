import type { Kysely } from 'kysely';

// A queued e-mail may carry a signed stop link, sent as its List-Unsubscribe header with the
// one-click form (RFC 8058), so mail programs can offer their own stop button. Frozen in time:
// takes Kysely<any>, imports nothing from src/.
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('mail_outbox').addColumn('unsubscribe_url', 'text').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('mail_outbox').dropColumn('unsubscribe_url').execute();
}
